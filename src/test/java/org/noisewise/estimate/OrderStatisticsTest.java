package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

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
}
