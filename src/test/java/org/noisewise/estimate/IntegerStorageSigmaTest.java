package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.noisewise.testing.NoiseFields;

/**
 * Values stored as integers: rounding adds {@code step^2 / 12} to every variance (exact formula: the
 * variance of a uniform rounding error over one step; Sheppard's correction, W. F. Sheppard 1898, from
 * memory), which
 * the difference and repeated methods' corrected sigma removes. Seeded simulation at sigma = 1.5
 * storage steps, where the rounding variance is 3.7% of the noise variance (1.8% in sigma).
 */
class IntegerStorageSigmaTest {

    static final int W = 64;
    static final double SIGMA = 1.5;
    static final double A = 30;

    @Test
    void sheppardFormula() {
        assertEquals(Math.sqrt(4.0 - 1.0 / 12.0), SampleStats.sheppard(2.0, 1.0), 1e-15);
        assertEquals(2.0, SampleStats.sheppard(2.0, 0.0), 0.0, "continuous values are left alone");
        assertEquals(0.3, SampleStats.sheppard(0.3, 1.0), 0.0, "rounding as coarse as the noise: left alone");
    }

    private static float[] plane(SplittableRandom rng) {
        float[] p = new float[W * W];
        for (int i = 0; i < p.length; i++) {
            p[i] = Math.round(NoiseFields.magnitude(rng, A, SIGMA, 1));
        }
        return p;
    }

    @Test
    void differenceAndRepeatedSigmaUnbiasedUnderRounding() throws InputException {
        Region r = Region.rectangle("signal", 0, 0, W, W, W, W);
        SplittableRandom rng = new SplittableRandom(20261203L);
        double diffCorrected = 0;
        double diffPlain = 0;
        double repCorrected = 0;
        double repPlain = 0;
        int trials = 200;
        for (int t = 0; t < trials; t++) {
            float[] a = plane(rng);
            float[] b = plane(rng);
            diffCorrected += DifferenceSnr.analyze(a, b, W, r, 1, 1.0).sigma();
            diffPlain += DifferenceSnr.analyze(a, b, W, r, 1, 0.0).sigma();
            float[][] f = {a, b, plane(rng), plane(rng)};
            RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, W, W, null);
            repCorrected += RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), r, 1, 1.0).sigma();
            repPlain += RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), r, 1, 0.0).sigma();
        }
        // 200 trials of 4,096 pixels: the mean sigma's standard error is about 0.1%
        assertEquals(SIGMA, diffCorrected / trials, 0.004 * SIGMA, "difference, corrected");
        assertEquals(SIGMA, repCorrected / trials, 0.004 * SIGMA, "repeated, corrected");
        double inflated = Math.sqrt(1 + 1.0 / (12 * SIGMA * SIGMA));
        assertEquals(SIGMA * inflated, diffPlain / trials, 0.004 * SIGMA, "without the step: inflated by rounding");
        assertTrue(repPlain / trials > SIGMA * 1.01, "without the step the repeated sigma is high: " + repPlain / trials);
    }
}
