package org.noisewise.estimate;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.noisewise.math.ChiMoments;

/**
 * Koay and Basser's correction of magnitude bias (Koay and Basser 2006, J Magn Reson 179:317),
 * for one channel and for L-channel root-sum-of-squares data.
 *
 * <p>From the sample mean {@code m} and SD {@code s} of magnitudes of one underlying amplitude,
 * with {@code r = m / s}, solve {@code theta = sqrt(xi_L(theta) (1 + r^2) - 2L)} for the true
 * {@code theta = A / sigma}, where {@code xi_L(theta) = 2L + theta^2 - [mean of M/sigma]^2} is the
 * variance of {@code M / sigma}. Then {@code sigma = s / sqrt(xi_L)} and
 * {@code A = sqrt(m^2 + (xi_L - 2L) sigma^2)}. When {@code r} is at or below the pure-noise ratio
 * {@code beta_L / sqrt(2L - beta_L^2)} (1.9130584 for L = 1) the data are consistent with no signal
 * and {@code theta = 0}. {@link CorrectedSnr#meanAndSd} applies it to region statistics. The fixed point is found with a bracketing (Brent) solver: plain
 * fixed-point iteration needs over a hundred steps near the lower bound.
 */
public final class KoayBasser {

    private KoayBasser() {
    }

    /** The lower bound of {@code r = mean / SD}: the ratio for pure noise. */
    public static double lowerBound(int channels) {
        return ChiMoments.beta(channels) / ChiMoments.centralSd(channels);
    }

    /** {@code theta} such that the magnitude mean/SD ratio equals {@code r}. */
    public static double theta(double r, int channels) {
        if (!(r > lowerBound(channels))) {
            return 0.0;
        }
        // r(theta) = mean(theta) / sqrt(xi(theta)) increases from the bound to theta; the root of
        // g(theta) = sqrt(xi (1 + r^2) - 2L) - theta is bracketed by [0, r].
        BrentSolver solver = new BrentSolver(1e-13, 1e-12);
        double hi = r;
        while (g(hi, r, channels) > 0) {
            hi *= 2;
        }
        return solver.solve(500, t -> g(t, r, channels), 0.0, hi);
    }

    private static double g(double theta, double r, int channels) {
        double xi = ChiMoments.variance(channels, theta);
        return Math.sqrt(Math.max(0.0, xi * (1 + r * r) - 2.0 * channels)) - theta;
    }
}
