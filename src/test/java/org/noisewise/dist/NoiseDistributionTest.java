package org.noisewise.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.apache.commons.math3.distribution.NakagamiDistribution;
import org.apache.commons.math3.distribution.WeibullDistribution;
import org.apache.commons.math3.random.Well19937c;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class NoiseDistributionTest {

    /** Rayleigh(sigma) = Commons Math WeibullDistribution(2, sigma*sqrt 2) (references.md section 8). */
    @Test
    void riceWithZeroAmplitudeIsCommonsMathRayleigh() {
        double sigma = 3.0;
        RiceDistribution rice = new RiceDistribution(0, sigma);
        NoncentralChiDistribution chi = new NoncentralChiDistribution(1, 0, sigma);
        WeibullDistribution rayleigh = new WeibullDistribution(2, sigma * Math.sqrt(2));
        for (double x = 0.05; x < 20; x += 0.37) {
            assertEquals(rayleigh.density(x), rice.density(x), 1e-14);
            assertEquals(rayleigh.density(x), chi.density(x), 1e-14);
            assertEquals(rayleigh.cumulativeProbability(x), rice.cumulativeProbability(x), 1e-13);
        }
        assertEquals(rayleigh.getNumericalMean(), rice.getNumericalMean(), 1e-12);
        assertEquals(rayleigh.getNumericalVariance(), rice.getNumericalVariance(), 1e-12);
    }

    /** sigma*chi(2L) = Commons Math NakagamiDistribution(L, 2L sigma^2) (references.md section 8). */
    @ParameterizedTest
    @CsvSource({"1", "2", "4", "8", "16"})
    void centralChiIsCommonsMathNakagami(int channels) {
        double sigma = 2.5;
        NoncentralChiDistribution chi = new NoncentralChiDistribution(channels, 0, sigma);
        NakagamiDistribution nak = new NakagamiDistribution(channels, 2.0 * channels * sigma * sigma);
        for (double x = 0.1; x < 30; x += 0.53) {
            assertEquals(nak.density(x), chi.density(x), 1e-12 + 1e-10 * nak.density(x));
            assertEquals(nak.cumulativeProbability(x), chi.cumulativeProbability(x), 1e-12);
        }
        assertEquals(nak.getNumericalMean(), chi.getNumericalMean(), 1e-10);
        assertEquals(nak.getNumericalVariance(), chi.getNumericalVariance(), 1e-9);
    }

    /** The Bessel-form Rice density and the Poisson-mixture density are the same function. */
    @ParameterizedTest
    @CsvSource({"0.5", "1", "2", "5", "20"})
    void riceBesselDensityEqualsMixtureDensity(double theta) {
        RiceDistribution rice = new RiceDistribution(theta, 1);
        NoncentralChiDistribution mix = new NoncentralChiDistribution(1, theta, 1);
        for (double x = 0.01; x < theta + 8; x += 0.11) {
            assertEquals(mix.density(x), rice.density(x), 1e-13 + 1e-11 * rice.density(x));
        }
    }

    /** Density integrates to 1 and its first moment is the closed-form mean (references.md tables). */
    @ParameterizedTest
    @CsvSource({"1, 0", "1, 2", "1, 10", "4, 2", "8, 3"})
    void densityIsNormalisedAndMatchesMoments(int channels, double theta) {
        NoncentralChiDistribution d = new NoncentralChiDistribution(channels, theta, 1);
        IterativeLegendreGaussIntegrator integ = new IterativeLegendreGaussIntegrator(32, 1e-13, 1e-13);
        double upper = theta + 4 * Math.sqrt(channels) + 12;
        double mass = integ.integrate(100000, d::density, 0, upper);
        double mean = integ.integrate(100000, x -> x * d.density(x), 0, upper);
        double second = integ.integrate(100000, x -> x * x * d.density(x), 0, upper);
        assertEquals(1.0, mass, 1e-10);
        assertEquals(d.getNumericalMean(), mean, 1e-9);
        // E[M^2] = A^2 + 2 L sigma^2 exactly (references.md section 2)
        assertEquals(theta * theta + 2.0 * channels, second, 1e-8);
        assertEquals(d.getNumericalVariance(), second - mean * mean, 1e-8);
    }

    /** Rayleigh quantiles: median sqrt(2 ln 2) = 1.1774100225, 95th percentile 2.4477468307 (references.md section 1). */
    @Test
    void rayleighQuantiles() {
        NoncentralChiDistribution d = new NoncentralChiDistribution(1, 0, 1);
        assertEquals(1.1774100225, d.inverseCumulativeProbability(0.5), 1e-8);
        assertEquals(2.4477468307, d.inverseCumulativeProbability(0.95), 1e-8);
    }

    /** references.md section 2, Rice table at theta = 2 (mean 2.2723834, SD 0.9144799) [math]. */
    @Test
    void riceMomentsAtThetaTwo() {
        RiceDistribution d = new RiceDistribution(2, 1);
        assertEquals(2.2723834, d.getNumericalMean(), 1e-7);
        assertEquals(0.9144799, Math.sqrt(d.getNumericalVariance()), 1e-7);
    }

    /** Simulated channels follow the model: seeded Kolmogorov-Smirnov check with Commons Math. */
    @ParameterizedTest
    @CsvSource({"1, 0", "1, 2", "4, 2", "8, 0"})
    void samplesFollowTheModel(int channels, double theta) {
        double sigma = 1.7;
        NoncentralChiDistribution d = new NoncentralChiDistribution(new Well19937c(42), channels, theta * sigma, sigma);
        double[] x = d.sample(4000);
        double p = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(d, x);
        assertTrue(p > 0.01, "KS p = " + p);
        // and a wrong model is rejected: same amplitude, sigma 10% high
        double pWrong = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(
                new NoncentralChiDistribution(channels, theta * sigma, 1.1 * sigma), x);
        assertTrue(pWrong < 1e-3, "wrong model not rejected, p = " + pWrong);
    }

    @Test
    void rejectsBadParameters() {
        assertThrows(IllegalArgumentException.class, () -> new NoncentralChiDistribution(0, 1, 1));
        assertThrows(IllegalArgumentException.class, () -> new NoncentralChiDistribution(1, -1, 1));
        assertThrows(IllegalArgumentException.class, () -> new NoncentralChiDistribution(1, 1, 0));
        assertThrows(IllegalArgumentException.class, () -> new RiceDistribution(1, Double.NaN));
    }
}
