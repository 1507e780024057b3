package org.noisewise.series;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The drift interval's order statistics are found by selection: they must be exactly what a sort gives. */
class SeriesNoiseTest {

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
            assertEquals(sorted[k], SeriesNoise.select(work, 0, n - 1, k), "n " + n + " k " + k);
            for (int i = 0; i < n; i++) {
                if (i < k) {
                    assertTrue(work[i] <= work[k], "left of k");
                } else if (i > k) {
                    assertTrue(work[i] >= work[k], "right of k");
                }
            }
        }
        // the three quantiles the drift interval takes, in the order it selects them
        double[] d = new double[SeriesNoise.DRAWS];
        for (int i = 0; i < d.length; i++) {
            d[i] = Math.abs(rng.nextGaussian());
        }
        double[] sorted = d.clone();
        Arrays.sort(sorted);
        int k95 = (int) Math.ceil(0.95 * (d.length - 1));
        int k975 = (int) Math.ceil(0.975 * (d.length - 1));
        int k025 = (int) Math.floor(0.025 * (d.length - 1));
        assertEquals(sorted[k95], SeriesNoise.select(d, 0, d.length - 1, k95));
        assertEquals(sorted[k975], SeriesNoise.select(d, k95 + 1, d.length - 1, k975));
        assertEquals(sorted[k025], SeriesNoise.select(d, 0, k95 - 1, k025));
    }
}
