package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;
import org.noisewise.sample.Phantoms;

class DifferenceSnrTest {

    private static Region all(int n) {
        return new Region("signal", IntStream.range(0, n).toArray());
    }

    private static float[] rice(SplittableRandom rng, int n, double a, double sigma, int channels) {
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            v[i] = (float) Phantoms.magnitude(rng, a / Math.sqrt(channels), sigma, channels);
        }
        return v;
    }

    /** Exact formula: sigma = SD(d)/sqrt(2) with divisor n-1; S = mean of image 1 (catches n vs n-1, missing sqrt 2). */
    @Test
    void formulaOnFourPixels() throws InputException {
        float[] a = {10, 12, 11, 15};
        float[] b = {9, 13, 11, 12};
        // d = 1, -1, 0, 3: mean 0.75, sum of squared deviations 8.75, SD = sqrt(8.75/3)
        DifferenceSnrResult r = DifferenceSnr.analyze(a, b, a.length, all(4), 1);
        assertEquals(Math.sqrt(8.75 / 3) / Math.sqrt(2), r.sigmaMagnitude(), 1e-12);
        assertEquals(12.0, r.signal().mean(), 1e-12);
        assertEquals(11.625, r.averageMean(), 1e-12);
        assertEquals(0.75, r.meanDifference(), 1e-12);
        // NEMA MS 1 form: SNR = sqrt(2) * S / SD(difference)
        assertEquals(Math.sqrt(2) * 12.0 / Math.sqrt(8.75 / 3), r.magnitudeSnr(), 1e-12);
        // the corrected figures are Koay and Basser's inversion of the average image's mean over the magnitude SD
        double theta = KoayBasser.theta(11.625 / r.sigmaMagnitude(), 1);
        assertEquals(theta, r.snr(), 1e-12);
        assertEquals(r.sigmaMagnitude() / Math.sqrt(org.noisewise.math.ChiMoments.variance(1, theta)), r.sigma(), 1e-12);
    }

    /** Issue acceptance: at >= 10,000 pixels the difference sigma is within 3% of the truth (several seeds). */
    @Test
    void withinThreePercentAtTenThousandPixels() throws InputException {
        for (long seed = 1; seed <= 20; seed++) {
            SplittableRandom rng = new SplittableRandom(seed);
            double sigma = 5.0;
            float[] a = rice(rng, 10000, 100, sigma, 1);
            float[] b = rice(rng, 10000, 100, sigma, 1);
            DifferenceSnrResult r = DifferenceSnr.analyze(a, b, a.length, all(10000), 1);
            assertEquals(sigma, r.sigma(), 0.03 * sigma, "seed " + seed);
            assertTrue(r.warnings().isEmpty(), r.warnings().toString());
        }
    }

    /** The chi-square interval covers the truth in about 95% of trials; mean sigma unbiased to 0.5%. */
    @Test
    void intervalCoverage() throws InputException {
        SplittableRandom rng = new SplittableRandom(99);
        int trials = 1000;
        int covered = 0;
        double sum = 0;
        for (int t = 0; t < trials; t++) {
            float[] a = rice(rng, 400, 80, 4, 1);
            float[] b = rice(rng, 400, 80, 4, 1);
            DifferenceSnrResult r = DifferenceSnr.analyze(a, b, a.length, all(400), 1);
            covered += r.sigmaCi95().contains(4.0) ? 1 : 0;
            sum += r.sigma();
        }
        double coverage = covered / (double) trials;
        assertTrue(coverage >= 0.93 && coverage <= 0.97, "coverage " + coverage);
        assertEquals(4.0, sum / trials, 0.005 * 4.0 + 0.01); // E[s] is c4 * sigma, 0.9994 at n = 400
    }

    /** A 1% drift between acquisitions is flagged; none without it. */
    @Test
    void driftAndSmallRegionWarnings() throws InputException {
        SplittableRandom rng = new SplittableRandom(5);
        float[] a = rice(rng, 2500, 200, 4, 1);
        float[] b = rice(rng, 2500, 200, 4, 1);
        assertTrue(DifferenceSnr.analyze(a, b, a.length, all(2500), 1).warnings().isEmpty());
        float[] drifted = b.clone();
        for (int i = 0; i < drifted.length; i++) {
            drifted[i] *= 0.99f;
        }
        DifferenceSnrResult r = DifferenceSnr.analyze(a, drifted, a.length, all(2500), 1);
        assertEquals("drift", r.warnings().get(0).code());
        DifferenceSnrResult small = DifferenceSnr.analyze(a, b, a.length, all(50), 1);
        assertTrue(small.warnings().stream().anyMatch(w -> w.code().equals("few_pixels")));
        float[] lowA = rice(rng, 2500, 6, 4, 1);
        float[] lowB = rice(rng, 2500, 6, 4, 1);
        assertTrue(DifferenceSnr.analyze(lowA, lowB, lowA.length, all(2500), 1).warnings().stream()
                .anyMatch(w -> w.code().equals("low_snr") && w.message().contains("corrected")));
    }

    @Test
    void badInput() {
        float[] a = new float[100];
        assertThrows(InputException.class, () -> DifferenceSnr.analyze(a, new float[99], a.length, all(50), 1));
        assertThrows(InputException.class, () -> DifferenceSnr.analyze(a, a.clone(), a.length, all(50), 1));
        assertThrows(InputException.class, () -> DifferenceSnr.analyze(a, a, a.length, null, 1));
    }
}
