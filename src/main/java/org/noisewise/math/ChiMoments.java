package org.noisewise.math;

import org.apache.commons.math3.special.Gamma;

/**
 * Moments of the magnitude of an L-channel root-sum-of-squares combination, in units of the
 * per-channel (real or imaginary) noise standard deviation sigma.
 *
 * <p>With {@code theta = A / sigma}, the magnitude {@code M / sigma} is noncentral chi with
 * {@code 2L} degrees of freedom (Constantinides, Atalar and McVeigh 1997, MRM 38:852). Its mean is
 * {@code beta_L * 1F1(-1/2; L; -theta^2/2)} with {@code beta_L = sqrt(2) Gamma(L+1/2) / Gamma(L)};
 * the hypergeometric factor is evaluated as the Poisson mixture
 * {@code 1F1(-1/2; L; -z) = sum_j Pois(j; z) * [Gamma(L+j+1/2)/Gamma(L+j)] / [Gamma(L+1/2)/Gamma(L)]},
 * which never overflows. For {@code L = 1} the Rice mean has the closed form
 * {@code sqrt(pi/8) [(2+theta^2) I0e(theta^2/4) + theta^2 I1e(theta^2/4)]} (references.md, section 2).
 */
public final class ChiMoments {

    private ChiMoments() {
    }

    /** {@code beta_L = sqrt(2) Gamma(L + 1/2) / Gamma(L)}: the mean of sigma * chi(2L) over sigma. */
    public static double beta(int channels) {
        requireChannels(channels);
        return Math.sqrt(2.0) * Math.exp(Gamma.logGamma(channels + 0.5) - Gamma.logGamma(channels));
    }

    /** SD of the central chi(2L) magnitude over sigma: {@code sqrt(2L - beta_L^2)}. */
    public static double centralSd(int channels) {
        double b = beta(channels);
        return Math.sqrt(2.0 * channels - b * b);
    }

    /** Raw moment {@code E[(M/sigma)^k]} of the central chi(2L): {@code 2^(k/2) Gamma(L+k/2)/Gamma(L)}. */
    public static double centralRawMoment(int channels, double k) {
        requireChannels(channels);
        return Math.exp(0.5 * k * Math.log(2.0) + Gamma.logGamma(channels + 0.5 * k)
                - Gamma.logGamma(channels));
    }

    /** Mean of {@code M / sigma} for {@code L} channels and {@code theta = A / sigma}. */
    public static double mean(int channels, double theta) {
        requireChannels(channels);
        requireTheta(theta);
        if (channels == 1) {
            return riceMean(theta);
        }
        double z = 0.5 * theta * theta;
        return PoissonMixture.sum(z, j -> Math.sqrt(2.0)
                * Math.exp(Gamma.logGamma(channels + j + 0.5) - Gamma.logGamma(channels + j)));
    }

    /** Variance of {@code M / sigma}: {@code theta^2 + 2L - mean^2}, Koay and Basser's xi_L(theta). */
    public static double variance(int channels, double theta) {
        double m = mean(channels, theta);
        return Math.max(0.0, theta * theta + 2.0 * channels - m * m);
    }

    /** The Rice mean over sigma, overflow-safe closed form with scaled Bessel functions. */
    public static double riceMean(double theta) {
        requireTheta(theta);
        double t2 = theta * theta;
        double x = 0.25 * t2;
        return Math.sqrt(Math.PI / 8.0)
                * ((2.0 + t2) * ScaledBessel.i0e(x) + t2 * ScaledBessel.i1e(x));
    }

    static void requireChannels(int channels) {
        if (channels < 1) {
            throw new IllegalArgumentException("channel count must be >= 1, was " + channels);
        }
    }

    private static void requireTheta(double theta) {
        if (!(theta >= 0) || Double.isInfinite(theta)) {
            throw new IllegalArgumentException("A/sigma must be finite and >= 0, was " + theta);
        }
    }
}
