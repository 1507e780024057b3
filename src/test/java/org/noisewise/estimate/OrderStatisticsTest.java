package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Selection without sorting must give exactly what sorting the whole sample gives (Arrays.sort, the definition). */
class OrderStatisticsTest {

    private static void agreesWithSort(double[] v, int... ranks) {
        double[] sorted = v.clone();
        Arrays.sort(sorted);
        double[] copy = v.clone();
        double[] got = OrderStatistics.select(v, ranks);
        for (int i = 0; i < ranks.length; i++) {
            assertEquals(Double.doubleToLongBits(sorted[ranks[i]]), Double.doubleToLongBits(got[i]), "rank " + ranks[i]);
        }
        assertArrayEquals(copy, v, "the sample is not changed");
        double median = v.length % 2 == 1 ? sorted[v.length / 2] : 0.5 * (sorted[v.length / 2 - 1] + sorted[v.length / 2]);
        assertEquals(median, OrderStatistics.median(v), 0.0);
    }

    @Test
    void rayleighLikeLargeSample() {
        SplittableRandom rng = new SplittableRandom(11);
        double[] v = new double[300_001];
        for (int i = 0; i < v.length; i++) {
            v[i] = 20 * Math.hypot(rng.nextGaussian(), rng.nextGaussian());
        }
        agreesWithSort(v, 0, 1, 150_000, 149_999, 150_001, 7, 299_999, 31_234, 31_234);
    }

    @Test
    void tiesWholeNumbersZerosAndNegatives() {
        SplittableRandom rng = new SplittableRandom(12);
        double[] v = new double[200_000];
        for (int i = 0; i < v.length; i++) {
            v[i] = i % 7 == 0 ? 0.0 : i % 11 == 0 ? -0.0 : Math.round(30 * rng.nextGaussian());
        }
        agreesWithSort(v, 0, 99_999, 100_000, 5_000, 199_999, 123_456);
        double[] same = new double[100_000];
        Arrays.fill(same, 3.5);
        agreesWithSort(same, 0, 49_999, 50_000, 99_999);
    }

    @Test
    void smallSamplesAndBadRanks() {
        agreesWithSort(new double[] {3, 1, 2}, 0, 1, 2);
        agreesWithSort(new double[] {4, 1, 3, 2}, 1, 2);
        assertThrows(IllegalArgumentException.class, () -> OrderStatistics.select(new double[] {1, 2}, 2));
    }

    /** In-place selection (the drift interval, the automatic air): exactly what a sort gives, ties included. */
    @Test
    void selectionGivesTheSortedValueAtEveryIndex() {
        SplittableRandom rng = new SplittableRandom(5);
        for (int trial = 0; trial < 200; trial++) {
            int n = 1 + rng.nextInt(700);
            double[] a = new double[n];
            for (int i = 0; i < n; i++) {
                // every third trial draws from few values, so ties are common
                a[i] = trial % 3 == 0 ? rng.nextInt(5) : rng.nextGaussian();
            }
            double[] sorted = a.clone();
            Arrays.sort(sorted);
            int k = rng.nextInt(n);
            double[] work = a.clone();
            assertEquals(sorted[k], OrderStatistics.selectInPlace(work, 0, n - 1, k), "n " + n + " k " + k);
            for (int i = 0; i < n; i++) {
                if (i < k) {
                    assertTrue(work[i] <= work[k], "left of k");
                } else if (i > k) {
                    assertTrue(work[i] >= work[k], "right of k");
                }
            }
        }
        // the three quantiles the stability drift interval takes (600 draws), in the order it selects them
        double[] d = new double[600];
        for (int i = 0; i < d.length; i++) {
            d[i] = Math.abs(rng.nextGaussian());
        }
        double[] sorted = d.clone();
        Arrays.sort(sorted);
        int k95 = (int) Math.ceil(0.95 * (d.length - 1));
        int k975 = (int) Math.ceil(0.975 * (d.length - 1));
        int k025 = (int) Math.floor(0.025 * (d.length - 1));
        assertEquals(sorted[k95], OrderStatistics.selectInPlace(d, 0, d.length - 1, k95));
        assertEquals(sorted[k975], OrderStatistics.selectInPlace(d, k95 + 1, d.length - 1, k975));
        assertEquals(sorted[k025], OrderStatistics.selectInPlace(d, 0, k95 - 1, k025));
    }
}
