package org.noisewise.math;

import org.apache.commons.math3.special.Beta;
import org.apache.commons.math3.special.Gamma;

/**
 * Moments of the magnitude of an L-channel root-sum-of-squares combination, in units of the
 * per-channel (real or imaginary) noise standard deviation sigma.
 *
 * <p>With {@code theta = A / sigma}, the magnitude {@code M / sigma} is noncentral chi with
 * {@code 2L} degrees of freedom (Constantinides, Atalar and McVeigh 1997, MRM 38:852). Its mean is
 * {@code beta_L * 1F1(-1/2; L; -theta^2/2)} with {@code beta_L = sqrt(2) Gamma(L+1/2) / Gamma(L)}.
 * It is evaluated three ways, each where it is exact to rounding:
 * <ul>
 *   <li>{@code L = 1}: the closed form {@code sqrt(pi/8) [(2+theta^2) I0e(theta^2/4) +
 *       theta^2 I1e(theta^2/4)]} (references.md, section 2);</li>
 *   <li>{@code z = theta^2/2} below {@code 1000 + 2 L^2}: the Poisson mixture
 *       {@code sum_j Pois(j; z) c_j}, {@code c_j = sqrt(2) Gamma(L+j+1/2)/Gamma(L+j)}, summed from
 *       the Poisson mode outwards by the recurrences {@code p_(j+1) = p_j z/(j+1)} and
 *       {@code c_(j+1) = c_j (L+j+1/2)/(L+j)} and normalised by {@code sum p_j}, so no term
 *       overflows and no exponential is needed;</li>
 *   <li>above it: Kummer's asymptotic series {@code theta sum_n (-1/2)_n (1/2-L)_n / n! (2/theta^2)^n}
 *       (Abramowitz and Stegun 13.5.1), whose terms there fall below rounding within a few dozen.</li>
 * </ul>
 * The derivative uses {@code d/dtheta sum_j Pois(j; z) c_j = theta sum_j Pois(j; z) c_j / (2(L+j))}.
 */
public final class ChiMoments {

    private static final double SQRT2 = Math.sqrt(2.0);
    private static final double LOG_GAMMA_HALF = 0.5 * Math.log(Math.PI);

    private ChiMoments() {
    }

    /** {@code beta_L = sqrt(2) Gamma(L + 1/2) / Gamma(L)}: the mean of sigma * chi(2L) over sigma. */
    public static double beta(int channels) {
        requireChannels(channels);
        return SQRT2 * Math.exp(logHalfRatio(channels));
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
        if (z >= asymptoticFrom(channels)) {
            return asymptotic(channels, theta, false);
        }
        return mixture(channels, z, false);
    }

    /** {@code d mean / d theta}: zero at {@code theta = 0}, tending to 1 at high SNR. */
    public static double meanDerivative(int channels, double theta) {
        requireChannels(channels);
        requireTheta(theta);
        double z = 0.5 * theta * theta;
        if (z >= asymptoticFrom(channels)) {
            return asymptotic(channels, theta, true);
        }
        return theta * mixture(channels, z, true);
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

    /**
     * The Poisson-mixture mean (any L, exposed so tests can compare it with the other two forms).
     *
     * @param z {@code theta^2 / 2}
     */
    static double mixtureMean(int channels, double z) {
        return mixture(channels, z, false);
    }

    /** Kummer's asymptotic mean (exposed for tests). */
    static double asymptoticMean(int channels, double theta) {
        return asymptotic(channels, theta, false);
    }

    /** Where the asymptotic series takes over from the mixture, in {@code z = theta^2/2}. */
    static double asymptoticFrom(int channels) {
        return 1000.0 + 2.0 * channels * (double) channels;
    }

    /** {@code ln Gamma(x + 1/2) - ln Gamma(x)}, without the cancellation of two large logGammas. */
    static double logHalfRatio(double x) {
        return LOG_GAMMA_HALF - Beta.logBeta(x, 0.5);
    }

    /**
     * {@code sum_j p_j c_j / sum_j p_j}, or with {@code derivative} {@code sum_j p_j c_j / (2 (L + j)) / sum_j p_j}.
     */
    private static double mixture(int channels, double z, boolean derivative) {
        int mode = (int) Math.floor(z);
        double c0 = SQRT2 * Math.exp(logHalfRatio(channels + (double) mode));
        double sumP = 1.0;
        double sum = derivative ? c0 / (2.0 * (channels + mode)) : c0;
        double p = 1.0;
        double c = c0;
        for (int j = mode; ; j++) {
            p *= z / (j + 1.0);
            c *= (channels + j + 0.5) / (channels + j);
            if (p < 1e-18 * sumP) {
                break;
            }
            sumP += p;
            sum += p * (derivative ? c / (2.0 * (channels + j + 1)) : c);
        }
        p = 1.0;
        c = c0;
        for (int j = mode; j > 0; j--) {
            p *= j / z;
            c *= (channels + j - 1.0) / (channels + j - 0.5);
            sumP += p;
            sum += p * (derivative ? c / (2.0 * (channels + j - 1)) : c);
            if (p < 1e-18 * sumP) {
                break;
            }
        }
        return sum / sumP;
    }

    /** The asymptotic series for the mean, or for its derivative. */
    private static double asymptotic(int channels, double theta, boolean derivative) {
        double u = 2.0 / (theta * theta);
        double term = 1.0;
        double sum = 1.0;
        double previous = Double.MAX_VALUE;
        for (int n = 0; n < 200; n++) {
            term *= (n - 0.5) * (n + 0.5 - channels) / (n + 1.0) * u;
            double size = Math.abs(term);
            if (size >= previous) {
                break;
            }
            sum += derivative ? term * (1.0 - 2.0 * (n + 1)) : term;
            previous = size;
            if (size < 1e-17) {
                break;
            }
        }
        return derivative ? sum : theta * sum;
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
