package org.noisewise.diagnose;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.special.Gamma;

/**
 * The effective number of channels L of a root-sum-of-squares background, estimated jointly with
 * sigma. Background {@code M^2 / (2 sigma^2)} is Gamma(L, 1) (central chi-square with 2L degrees of
 * freedom, halved), so L is the maximum-likelihood gamma shape of {@code Y = M^2}:
 * {@code ln L - psi(L) = ln(mean Y) - mean(ln Y)}, and {@code sigma^2 = mean(Y) / (2L)}. Its
 * interval uses the Fisher information, {@code Var(L) = L / (n (L psi'(L) - 1))}, with the effective
 * pixel count when pixels are correlated. Correlated channels, parallel imaging, filtering and
 * combinations other than sum of squares give non-integer or shrunken L.
 */
public final class ChannelCount {

    private static final double Z975 = org.noisewise.estimate.Levels.Z95;

    private ChannelCount() {
    }

    /** The estimate. {@code pixels} counts the non-zero pixels used. */
    public record Estimate(double channels, double low, double high, double sigma, int pixels) {
        /** The nearest whole channel count, at least 1. */
        public int rounded() {
            return (int) Math.max(1, Math.round(channels));
        }

        public boolean covers(double l) {
            return l >= low && l <= high;
        }
    }

    /**
     * @param background     background magnitudes; exact zeros are left out (they carry no information
     *                       on the shape and mark masking, which other checks report)
     * @param effectiveRatio effective / actual pixel count, in (0, 1]
     * @return the estimate, or {@code null} when fewer than 10 non-zero pixels remain or they are all equal
     */
    public static Estimate estimate(double[] background, double effectiveRatio) {
        int n = 0;
        double sumY = 0;
        double sumLogY = 0;
        for (double m : background) {
            if (m > 0) {
                double y = m * m;
                sumY += y;
                sumLogY += Math.log(y);
                n++;
            }
        }
        if (n < 10) {
            return null;
        }
        double meanY = sumY / n;
        double s = Math.log(meanY) - sumLogY / n;
        if (!(s > 1e-12)) {
            return null;
        }
        double lo = 1e-3;
        double hi = 1e7;
        double l = new BrentSolver(1e-12, 1e-10).solve(500, k -> Math.log(k) - Gamma.digamma(k) - s, lo, hi);
        double nEff = Math.max(2.0, n * Math.min(1.0, effectiveRatio));
        double info = l * Gamma.trigamma(l) - 1.0;
        double se = Math.sqrt(l / (nEff * Math.max(info, 1e-300)));
        double sigma = Math.sqrt(meanY / (2.0 * l));
        return new Estimate(l, Math.max(0.0, l - Z975 * se), l + Z975 * se, sigma, n);
    }
}
