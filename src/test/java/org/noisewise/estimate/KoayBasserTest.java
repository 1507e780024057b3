package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.noisewise.math.ChiMoments;

class KoayBasserTest {

    /** references.md section 2, inversion checks [math]: r = 2.4848915052 -> theta = 2; r = 1.9960018605 -> theta = 1. */
    @Test
    void publishedInversionChecks() {
        assertEquals(2.0, KoayBasser.theta(2.4848915052, 1), 1e-8);
        assertEquals(1.0, KoayBasser.theta(1.9960018605, 1), 1e-8);
    }

    /** The pure-noise bound sqrt(pi/(4-pi)) = 1.9130584 (references.md section 2): at or below it theta = 0. */
    @Test
    void lowerBound() {
        assertEquals(1.9130584, KoayBasser.lowerBound(1), 1e-7);
        assertEquals(0.0, KoayBasser.theta(1.9, 1), 0.0);
        assertEquals(0.0, KoayBasser.theta(1.9130583, 1), 0.0);
        assertEquals(3.9428694, KoayBasser.lowerBound(4), 1e-6); // references.md section 3, mean/SD for L = 4
    }

    /** references.md section 3: L = 4, theta = 2 gives mean 3.36818 and variance 0.65537 (from memory, checked by Monte Carlo). */
    @Test
    void fourChannelInversion() {
        double r = 3.36818 / Math.sqrt(0.65537);
        assertEquals(2.0, KoayBasser.theta(r, 4), 2e-4);
    }

    /** Exact moments in, exact parameters out, for one and several channels (closed form round trip). */
    @ParameterizedTest
    @CsvSource({"1, 0.3", "1, 1", "1, 2", "1, 7.5", "2, 1.5", "4, 2", "8, 3", "16, 0.8"})
    void roundTrip(int channels, double theta) {
        double sigma = 3.7;
        double mean = sigma * ChiMoments.mean(channels, theta);
        double sd = sigma * Math.sqrt(ChiMoments.variance(channels, theta));
        CorrectedSnr c = CorrectedSnr.meanAndSd(mean, 0.01, sd, 0.01, channels);
        assertEquals(theta, c.snr(), 1e-7);
        assertEquals(sigma, c.sigma(), 1e-7);
        assertEquals(theta * sigma, c.amplitude(), 1e-6);
        assertTrue(c.snrCi95().contains(theta) && c.sigmaCi95().contains(sigma));
    }

    /** A non-positive mean (issue 15.8) is no error: the region is consistent with no signal (SNR 0). */
    @Test
    void nonPositiveMeanMeansNoSignal() {
        CorrectedSnr c = CorrectedSnr.meanAndSd(-3.0, 0.5, 2.0, 0.05, 1);
        assertEquals(0.0, c.snr(), 0.0);
        assertTrue(c.warnings().stream().anyMatch(w -> w.code().equals("near_noise_floor")), c.warnings().toString());
    }
}
