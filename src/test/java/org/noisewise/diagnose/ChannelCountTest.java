package org.noisewise.diagnose;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.noisewise.testing.NoiseFields;

/**
 * The channel count of stored integers (issue 20.1): chi(2L) background rounded to whole steps, as
 * 8- and 16-bit images store it. The moment estimate misreads the rounded small values; the
 * interval-censored maximum likelihood (model: the chi(2L) CDF, closed form through the regularised
 * gamma function) must recover L and sigma and its 95% interval must contain the true L.
 */
class ChannelCountTest {

    private static double[] stored(SplittableRandom rng, int n, double sigma, int channels) {
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = Math.rint(NoiseFields.magnitude(rng, 0, sigma, channels));
        }
        return v;
    }

    @Test
    void roundedBackgroundGivesTheTrueChannelCount() {
        for (int l : new int[] {1, 4, 8}) {
            for (double sigma : new double[] {1.0, 2.0, 5.0}) {
                SplittableRandom rng = new SplittableRandom(31L * l + (long) (10 * sigma));
                double[] v = stored(rng, 200_000, sigma, l);
                ChannelCount.Estimate e = ChannelCount.estimate(v, 1.0, 1.0, 0.0);
                // 200,000 pixels: L to about 1%, sigma to about 0.3%; the moment estimate is off by 10-40% at 1 step
                assertEquals(l, e.channels(), 0.03 * l, "L " + l + " sigma " + sigma);
                assertEquals(sigma, e.sigma(), 0.01 * sigma, "sigma, L " + l + " sigma " + sigma);
                if (sigma == 1.0 && l == 1) {
                    ChannelCount.Estimate m = ChannelCount.estimate(v, 1.0);
                    assertTrue(Math.abs(m.channels() - 1) > 0.1, "the continuous moment estimate is fooled: " + m);
                }
            }
        }
    }

    /** 400 seeded trials of 2,304 pixels (four 24x24 corners): the 95% interval holds the true L 93-97%. */
    @Test
    void intervalCoversTheTrueChannelCount() {
        for (int l : new int[] {1, 8}) {
            SplittableRandom rng = new SplittableRandom(2020 + l);
            int trials = 400;
            int covered = 0;
            for (int t = 0; t < trials; t++) {
                ChannelCount.Estimate e = ChannelCount.estimate(stored(rng, 2304, 1.5, l), 1.0, 1.0, 0.0);
                covered += e.covers(l) ? 1 : 0;
            }
            double c = (double) covered / trials;
            // band: 95% +- 2.2 binomial SDs at 400 trials (common practice for coverage checks)
            assertTrue(c >= 0.925 && c <= 0.975, "L " + l + ": coverage " + c);
        }
    }
}
