package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Issue 20.2: signed (real-valued) data are measured with the Gaussian model, never with magnitude
 * corrections. Truth: Gaussian values of known mean and SD, so A = mean, sigma = SD and SNR = mean / SD
 * exactly (closed form); seeded trials count how often the 95% intervals hold the truth.
 */
class SignedDataTest {

    private static float[][] frames(SplittableRandom rng, int k, int n, double mean, double sd) {
        float[][] f = new float[k][n];
        for (int t = 0; t < k; t++) {
            for (int i = 0; i < n; i++) {
                f[t][i] = (float) (mean + sd * rng.nextGaussian());
            }
        }
        return f;
    }

    @Test
    void repeatedAndDifferenceUseTheGaussianModelAndCoverTheTruth() throws InputException {
        int w = 32;
        Region r = Region.rectangle("signal", 4, 4, 20, 20, w, w);
        for (double mean : new double[] {-5, 5}) {
            double sd = 3;
            double truth = mean / sd;
            SplittableRandom rng = new SplittableRandom(20 + (long) mean);
            int trials = 600;
            int snrIn = 0;
            int sigmaIn = 0;
            int diffIn = 0;
            for (int t = 0; t < trials; t++) {
                float[][] f = frames(rng, 10, w * w, mean, sd);
                RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, w, w, null);
                RepeatedSnrResult res = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), r, 1);
                assertTrue(res.warnings().stream().anyMatch(x -> x.code().equals("signed_data")), res.warnings()
                        .toString());
                CorrectedSnr c = res.figures();
                snrIn += c.snrCi95().contains(truth) ? 1 : 0;
                sigmaIn += c.sigmaCi95().contains(sd) ? 1 : 0;
                DifferenceSnrResult d = DifferenceSnr.analyze(f[0], f[1], w, r, 1);
                diffIn += d.figures().snrCi95().contains(truth) ? 1 : 0;
                if (t == 0) {
                    // no magnitude correction: sigma is the data's SD, not inflated by the Rician factor
                    assertEquals(sd, c.sigma(), 0.1 * sd);
                    assertEquals(c.snr(), c.magnitudeSnr(), 0.0);
                }
            }
            // band 93-97% at 600 trials (about 2.2 binomial SDs, common practice for coverage checks)
            for (int[] cnt : new int[][] {{snrIn}, {sigmaIn}, {diffIn}}) {
                double c = (double) cnt[0] / trials;
                assertTrue(c >= 0.93 && c <= 0.97, "mean " + mean + ": coverage " + c);
            }
        }
    }

    @Test
    void methodsOnTheMagnitudeModelRefuseSignedData() {
        float[] plane = new float[64 * 64];
        SplittableRandom rng = new SplittableRandom(3);
        for (int i = 0; i < plane.length; i++) {
            plane[i] = (float) (3 * rng.nextGaussian());
        }
        InputException e = assertThrows(InputException.class, () -> Region.pooledMagnitudes(plane,
                java.util.List.of(Region.rectangle("bg", 0, 0, 20, 20, 64, 64))));
        assertTrue(e.getMessage().contains("not a magnitude image"), e.getMessage());
        // a magnitude image has none: rounding to integers keeps magnitudes at or above zero
        assertTrue(!SignedValues.signed(SignedValues.negatives(new double[] {0, 0, 1, 2}), 4));
        // one negative pixel in a thousand is tolerated (a damaged value), two are not
        double[] v = new double[2000];
        v[0] = -1;
        assertTrue(!SignedValues.signed(SignedValues.negatives(v), v.length));
        v[1] = -1;
        v[2] = -1;
        assertTrue(SignedValues.signed(SignedValues.negatives(v), v.length));
    }
}
