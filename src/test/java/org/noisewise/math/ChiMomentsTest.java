package org.noisewise.math;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class ChiMomentsTest {

    /** references.md section 2, Rice moments for sigma = 1 [math]. */
    @ParameterizedTest
    @CsvSource({
        "0,   1.2533141, 0.6551364, 0.4292037",
        "0.5, 1.3304473, 0.6927553, 0.4799099",
        "1,   1.5485725, 0.7758372, 0.6019233",
        "2,   2.2723834, 0.9144799, 0.8362736",
        "3,   3.1725773, 0.9668264, 0.9347534",
        "5,   5.1010696, 0.9894890, 0.9790885",
        "10,  10.050127, 0.9974711, 0.9949486"})
    void riceMomentsMatchTable(double theta, double mean, double sd, double xi) {
        assertEquals(mean, ChiMoments.mean(1, theta), 6e-7);
        assertEquals(xi, ChiMoments.variance(1, theta), 6e-7);
        assertEquals(sd, Math.sqrt(ChiMoments.variance(1, theta)), 6e-7);
    }

    /** The Poisson-mixture form (any L) and the Bessel closed form (L = 1) agree. */
    @ParameterizedTest
    @CsvSource({"0", "0.1", "0.7", "2", "4.5", "12", "40", "300"})
    void mixtureAgreesWithBesselForm(double theta) {
        double z = 0.5 * theta * theta;
        double mixture = PoissonMixture.sum(z, j -> Math.sqrt(2.0) * Math.exp(
                org.apache.commons.math3.special.Gamma.logGamma(1 + j + 0.5)
                        - org.apache.commons.math3.special.Gamma.logGamma(1 + j)));
        // the log-gamma ratio loses a few digits at a Poisson mean of 45,000 (theta = 300)
        assertEquals(1.0, mixture / ChiMoments.riceMean(theta), theta > 100 ? 1e-11 : 1e-13);
    }

    /** references.md section 3, central chi(2L) moments for sigma = 1 [math]. */
    @ParameterizedTest
    @CsvSource({
        "1,  1.2533141, 0.6551364",
        "2,  1.8799712, 0.6824282",
        "4,  2.7416247, 0.6953374",
        "8,  3.9380256, 0.7013945",
        "16, 5.6128394, 0.7042968",
        "32, 7.9688122, 0.7057137"})
    void centralChiMomentsMatchTable(int channels, double mean, double sd) {
        assertEquals(mean, ChiMoments.beta(channels), 6e-7);
        assertEquals(mean, ChiMoments.mean(channels, 0), 6e-7);
        assertEquals(sd, ChiMoments.centralSd(channels), 6e-7);
        // RMS = sqrt(2L) exactly (references.md section 3)
        assertEquals(Math.sqrt(2.0 * channels), Math.sqrt(ChiMoments.centralRawMoment(channels, 2)), 1e-12);
    }

    /** references.md section 3: L = 4, theta = 2 gives mean 3.36818 and variance 0.65537 [memory, checked by Monte Carlo]. */
    @Test
    void fourChannelNoncentralMoments() {
        assertEquals(3.36818, ChiMoments.mean(4, 2), 1e-5);
        assertEquals(0.65537, ChiMoments.variance(4, 2), 1e-5);
    }

    /** Rayleigh mean/SD = sqrt(pi/(4-pi)) = 1.9130583803 (references.md section 1) [math]. */
    @Test
    void rayleighMeanOverSd() {
        assertEquals(1.9130583803, ChiMoments.beta(1) / ChiMoments.centralSd(1), 1e-10);
        assertEquals(Math.sqrt(Math.PI / 2), ChiMoments.beta(1), 1e-15);
        assertEquals(Math.sqrt(2 - Math.PI / 2), ChiMoments.centralSd(1), 1e-15);
    }

    /** High SNR: the mean tends to sqrt(A^2 + (2L-1) sigma^2) (second-order expansion, closed form). */
    @Test
    void highSnrLimit() {
        for (int l : new int[] {1, 3, 8}) {
            double theta = 200;
            assertEquals(Math.sqrt(theta * theta + 2 * l - 1), ChiMoments.mean(l, theta), 1e-4);
        }
    }

    /**
     * The recurrence mixture (no exponentials, normalised by the sum of Poisson weights) agrees with an
     * independent evaluation of the same series through Commons Math's Poisson log-probabilities and
     * log-gamma, and for L = 1 with the Bessel closed form.
     */
    @ParameterizedTest
    @CsvSource({"1, 0.3", "1, 7", "2, 0.05", "2, 3", "4, 2", "4, 15", "8, 1", "8, 25", "32, 4", "32, 40"})
    void recurrenceMixtureAgreesWithIndependentSum(int channels, double theta) {
        double z = 0.5 * theta * theta;
        double independent = PoissonMixture.sum(z, j -> Math.sqrt(2.0) * Math.exp(
                org.apache.commons.math3.special.Gamma.logGamma(channels + j + 0.5)
                        - org.apache.commons.math3.special.Gamma.logGamma(channels + j)));
        assertEquals(1.0, ChiMoments.mixtureMean(channels, z) / independent, 1e-12);
        if (channels == 1) {
            assertEquals(1.0, ChiMoments.mixtureMean(1, z) / ChiMoments.riceMean(theta), 1e-13);
        }
    }

    /** Kummer's asymptotic series and the mixture agree where one hands over to the other (closed forms). */
    @ParameterizedTest
    @CsvSource({"2", "4", "8", "16", "32"})
    void asymptoticSeriesMeetsTheMixture(int channels) {
        for (double f : new double[] {0.5, 1.0, 2.0}) {
            double z = f * ChiMoments.asymptoticFrom(channels);
            double theta = Math.sqrt(2 * z);
            assertEquals(1.0, ChiMoments.asymptoticMean(channels, theta) / ChiMoments.mixtureMean(channels, z), 2e-14,
                    "L=" + channels + " z=" + z);
        }
    }

    /** The derivative matches a central difference of the mean, and is 0 at theta = 0 (closed form). */
    @ParameterizedTest
    @CsvSource({"1", "3", "8", "32"})
    void derivativeMatchesDifferences(int channels) {
        assertEquals(0.0, ChiMoments.meanDerivative(channels, 0), 0.0);
        for (double t : new double[] {0.05, 0.8, 3, 12, 60, 400}) {
            double h = 1e-5 * Math.max(1, t);
            double diff = (ChiMoments.mean(channels, t + h) - ChiMoments.mean(channels, t - h)) / (2 * h);
            assertEquals(diff, ChiMoments.meanDerivative(channels, t), 1e-7 * Math.max(1, diff), "L=" + channels
                    + " theta=" + t);
        }
        // near 0 the mean is beta_L + beta_L theta^2 / (4L): derivative beta_L theta / (2L) (series, closed form)
        double t = 1e-4;
        assertEquals(ChiMoments.beta(channels) * t / (2 * channels), ChiMoments.meanDerivative(channels, t), 1e-12);
    }

    /** ln Gamma(x + 1/2) - ln Gamma(x): direct differences for small x, Stirling's series (closed form) for large. */
    @Test
    void halfRatioOfGammas() {
        for (double x : new double[] {1, 2.5, 10, 40}) {
            assertEquals(org.apache.commons.math3.special.Gamma.logGamma(x + 0.5)
                    - org.apache.commons.math3.special.Gamma.logGamma(x), ChiMoments.logHalfRatio(x), 1e-13);
        }
        for (double x : new double[] {1e4, 1e6, 1e9}) {
            double stirling = 0.5 * Math.log(x) - 1 / (8 * x) + 1 / (192 * x * x * x);
            assertEquals(stirling, ChiMoments.logHalfRatio(x), 1e-13 * Math.abs(stirling));
        }
    }
}
