package org.noisewise.math;

import java.util.function.IntToDoubleFunction;
import org.apache.commons.math3.distribution.PoissonDistribution;

/**
 * Sums {@code sum_j Pois(j; mu) * term(j)}, the Poisson mixture through which every moment, density
 * and distribution function of the noncentral chi family is written (noncentral chi-square as a
 * Poisson-weighted sum of central chi-squares; Johnson, Kotz and Balakrishnan, Continuous Univariate
 * Distributions vol. 2, ch. 29). The sum starts at the Poisson mode and walks both ways until the
 * weights are negligible, so it is stable for any {@code mu}. Weights come from Commons Math's
 * {@code PoissonDistribution.logProbability} (Loader's saddle-point method), which keeps full
 * relative accuracy even for a Poisson mean of tens of thousands.
 */
public final class PoissonMixture {

    private static final double NEGLIGIBLE = 1e-20;

    private PoissonMixture() {
    }

    /**
     * @param mu   Poisson mean, {@code >= 0}
     * @param term the quantity to average, evaluated at non-negative integers; must be bounded by a
     *             polynomial in {@code j}
     * @return the mixture sum
     */
    public static double sum(double mu, IntToDoubleFunction term) {
        if (!(mu >= 0) || Double.isInfinite(mu)) {
            throw new IllegalArgumentException("Poisson mean must be finite and >= 0, was " + mu);
        }
        if (mu == 0) {
            return term.applyAsDouble(0);
        }
        int mode = (int) Math.floor(mu);
        PoissonDistribution pois = new PoissonDistribution(null, mu, PoissonDistribution.DEFAULT_EPSILON,
                PoissonDistribution.DEFAULT_MAX_ITERATIONS);
        double total = 0;
        for (int j = mode; ; j++) {
            double w = Math.exp(pois.logProbability(j));
            total += w * term.applyAsDouble(j);
            if (w < NEGLIGIBLE && j > mu) {
                break;
            }
        }
        for (int j = mode - 1; j >= 0; j--) {
            double w = Math.exp(pois.logProbability(j));
            total += w * term.applyAsDouble(j);
            if (w < NEGLIGIBLE) {
                break;
            }
        }
        return total;
    }

}
