package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;
import org.apache.commons.math3.complex.Complex;
import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;
import org.junit.jupiter.api.Test;

/**
 * A fact of the trade (common practice): a 128x128 k-space of ones plus complex Gaussian noise with
 * sigma = 1, inverse-transformed with a unitary 2-D FFT (Commons Math, rows then columns), gives a
 * centre magnitude near 128 and a background whose mean is near 1.25 and SD near 0.65 — the
 * Rayleigh numbers sqrt(pi/2) and sqrt(2 - pi/2) of references.md section 1, which the background
 * estimators then turn back into sigma = 1.
 */
class FftNoiseFactTest {

    @Test
    void reconstructedBackgroundIsRayleigh() {
        int n = 128;
        SplittableRandom rng = new SplittableRandom(128);
        Complex[][] k = new Complex[n][n];
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                k[y][x] = new Complex(1 + rng.nextGaussian(), rng.nextGaussian());
            }
        }
        FastFourierTransformer fft = new FastFourierTransformer(DftNormalization.UNITARY);
        for (int y = 0; y < n; y++) {
            k[y] = fft.transform(k[y], TransformType.INVERSE);
        }
        for (int x = 0; x < n; x++) {
            Complex[] col = new Complex[n];
            for (int y = 0; y < n; y++) {
                col[y] = k[y][x];
            }
            col = fft.transform(col, TransformType.INVERSE);
            for (int y = 0; y < n; y++) {
                k[y][x] = col[y];
            }
        }
        double centre = k[0][0].abs();
        assertEquals(128.0, centre, 4.0);
        double[] bg = new double[n * n - 1];
        int m = 0;
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                if (x != 0 || y != 0) {
                    bg[m++] = k[y][x].abs();
                }
            }
        }
        SampleStats s = SampleStats.of(bg);
        assertEquals(1.25, s.mean(), 0.02);
        assertEquals(0.65, s.sd(), 0.015);
        assertEquals(1.0, BackgroundSigma.estimate(bg, 1).get(SigmaEstimator.ML).sigma(), 0.015);
    }
}
