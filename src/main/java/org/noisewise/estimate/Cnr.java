package org.noisewise.estimate;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.math.ChiMoments;
import org.noisewise.math.MeanInverse;

/**
 * The contrast-to-noise ratio of two regions, {@code CNR = (A_signal - A_contrast) / sigma}, each
 * amplitude corrected for the magnitude bias by the inversion the headline SNR uses (the Rice or
 * noncentral-chi mean, L-aware: {@code A = sigma theta} with {@code mean_L(theta) = m / sigma}), so
 * {@code CNR = theta_s - theta_c}. The plain {@code (m_s - m_c) / sigma} is biased low whenever the
 * darker region sits at low SNR, where its magnitude mean is pushed up (closed form from the moments:
 * for L = 8, amplitudes 10 and 2 sigma, 6.32 against 8).
 *
 * <p>95% interval, on the scale of the ratios {@code r = m / sigma} whose log-errors are near Gaussian:
 * the contrast ratio's error (its mean's and sigma's together) runs over its 95% range through the
 * inversion, which is steep near the floor, with the signal ratio moving along with it through the
 * shared sigma; the signal's independent rest is added in quadrature. Where the contrast amplitude may
 * be 0 (its interval reaches the floor) that edge is a bound on the parameter, not a spread, and the
 * two parts add linearly: conservative there, never short ({@code near_noise_floor} says so).
 */
public record Cnr(double cnr, Interval ci95, double contrastAmplitude, Interval contrastAmplitudeCi95,
                  double contrastMean, double magnitudeCnr, List<Warning> warnings) {

    private static final double Z = Levels.Z95;
    /** Steps of X each side of 0. */
    private static final int GRID = 20;
    private static final Interval NONE = new Interval(Double.NaN, Double.NaN);

    public Cnr {
        warnings = List.copyOf(warnings);
    }

    /**
     * @param meanS    the signal region's magnitude mean
     * @param seS      its standard error (NaN for one pixel)
     * @param meanC    the contrast region's magnitude mean
     * @param seC      its standard error
     * @param sigma    the per-channel noise SD both regions share
     * @param sigmaCi  its 95% interval
     * @param channels L
     * @param contrast the contrast region's name, for warnings
     */
    public static Cnr of(double meanS, double seS, double meanC, double seC, double sigma, Interval sigmaCi,
                         int channels, String contrast) {
        MeanInverse inv = MeanInverse.of(channels);
        double ts = theta(inv, meanS, sigma);
        double tc = theta(inv, meanC, sigma);
        double cnr = ts - tc;
        double plain = (meanS - meanC) / sigma;
        double amplitude = tc * sigma;
        Interval ci = NONE;
        double seLogSigma = CorrectedSnr.logSe(sigmaCi);
        Interval amplitudeCi = NONE;
        if (Double.isFinite(seS) && Double.isFinite(seC) && Double.isFinite(seLogSigma) && meanS > 0 && meanC > 0) {
            ci = interval(inv, meanS / sigma, seS / meanS, meanC / sigma, seC / meanC, seLogSigma, cnr);
            amplitudeCi = amplitudeInterval(inv, sigma, meanC / sigma, seC / meanC, seLogSigma, amplitude);
        }
        List<Warning> w = new ArrayList<>();
        double floor = ChiMoments.beta(channels);
        if (Double.isFinite(amplitudeCi.low()) && amplitudeCi.low() <= 0) {
            w.add(new Warning("near_noise_floor", String.format(Locale.ROOT, "the contrast region '%s' (amplitude "
                    + "%.3g sigma) cannot be told apart from the noise floor: its amplitude's 95%% interval reaches 0 "
                    + "(pure noise of %d channel%s averages %.3g sigma), so the CNR's interval reaches up to the signal's "
                    + "own amplitude and is conservative", contrast, tc, channels, channels == 1 ? "" : "s", floor)));
        }
        if (!Double.isFinite(seS) || !Double.isFinite(seC)) {
            w.add(new Warning("no_interval", "no CNR interval: a region is too small to estimate the spread of its "
                    + "mean (a single pixel); draw regions of at least 100 pixels"));
        }
        return new Cnr(cnr, ci, amplitude, amplitudeCi, meanC, plain, w);
    }

    /** Regions whose corrected SNR is at least this give sigma to the pool (the magnitude is near Gaussian there). */
    public static final double POOL_SNR = 3.0;

    /**
     * Sigma for the CNR of the difference and repeated methods, pooled over the two regions as those
     * methods measure it (each region's own corrected sigma): the inverse-variance mean on the log scale
     * of the regions whose corrected SNR is at least {@link #POOL_SNR} (both when neither is), with its
     * interval. Nearer the noise floor a region's sigma rests on the magnitude model's steepest part and
     * its interval on a Gaussian approximation that no longer holds, so such a region gives its amplitude
     * to the CNR but not its sigma.
     *
     * @return {sigma, 95% low, 95% high}
     */
    public static double[] pooledSigma(CorrectedSnr a, CorrectedSnr b) {
        boolean useA = a.snr() >= POOL_SNR;
        boolean useB = b.snr() >= POOL_SNR;
        if (useA && !useB) {
            return new double[] {a.sigma(), a.sigmaCi95().low(), a.sigmaCi95().high()};
        }
        if (useB && !useA) {
            return new double[] {b.sigma(), b.sigmaCi95().low(), b.sigmaCi95().high()};
        }
        return pooledSigma(a.sigma(), a.sigmaCi95(), b.sigma(), b.sigmaCi95());
    }

    /** The inverse-variance mean of two sigma estimates on the log scale, with its interval. */
    public static double[] pooledSigma(double sigmaA, Interval ciA, double sigmaB, Interval ciB) {
        double sa = CorrectedSnr.logSe(ciA);
        double sb = CorrectedSnr.logSe(ciB);
        if (!Double.isFinite(sa) || !Double.isFinite(sb) || !(sa > 0) || !(sb > 0)) {
            return new double[] {sigmaA, ciA.low(), ciA.high()};
        }
        double wa = 1 / (sa * sa);
        double wb = 1 / (sb * sb);
        double log = (wa * Math.log(sigmaA) + wb * Math.log(sigmaB)) / (wa + wb);
        double se = 1 / Math.sqrt(wa + wb);
        return new double[] {Math.exp(log), Math.exp(log - Z * se), Math.exp(log + Z * se)};
    }

    /**
     * The interval on the log-ratio scale. The contrast ratio's error {@code X = e_c - e_sigma} (its mean's
     * and sigma's, variance {@code u_c^2 + u_sigma^2}) is taken whole through the steep inversion near the
     * floor, the signal ratio's error split into its part along {@code X} (sigma is shared:
     * {@code cov = u_sigma^2}) and an independent rest; the CNR at {@code X = +-1.96 sd} (the signal moving
     * with it) and the rest's move are added in quadrature on each side.
     */
    private static Interval interval(MeanInverse inv, double rs, double us, double rc, double uc, double usig,
                                     double cnr) {
        double varX = uc * uc + usig * usig;
        double sdX = Math.sqrt(varX);
        double slope = varX > 0 ? usig * usig / varX : 0.0;
        double sdRest = Math.sqrt(Math.max(0.0, us * us + usig * usig - slope * slope * varX));
        double up = 0;
        double down = 0;
        double restUp = 0;
        double restDown = 0;
        boolean floorUp = false;
        boolean floorDown = false;
        // the CNR is not monotone in X (both amplitudes move with sigma), so X runs over its whole 95% range
        for (int k = -GRID; k <= GRID; k++) {
            double x = k * Z * sdX / GRID;
            int side = Integer.signum(k);
            double ts = inv.theta(rs * Math.exp(slope * x));
            double tc = inv.theta(rc * Math.exp(x));
            double at = ts - tc;
            up = Math.max(up, at - cnr);
            down = Math.max(down, cnr - at);
            double tsUp = inv.theta(rs * Math.exp(slope * x + Z * sdRest));
            double tsDown = inv.theta(rs * Math.exp(slope * x - Z * sdRest));
            restUp = Math.max(restUp, tsUp - ts);
            restDown = Math.max(restDown, ts - tsDown);
            // a bound at the floor (amplitude 0) is the edge of what the amplitude may be, not a spread
            floorUp |= side < 0 && tc == 0.0;
            floorDown |= tsDown == 0.0 || side < 0 && ts == 0.0;
        }
        return new Interval(cnr - (floorDown ? down + restDown : Math.hypot(down, restDown)),
                cnr + (floorUp ? up + restUp : Math.hypot(up, restUp)));
    }

    /**
     * The contrast amplitude's interval, {@code A = sigma theta(m / sigma)}, on the same scale: the ratio's
     * log-error {@code X} runs over its 95% range through the inversion with sigma's part along it
     * ({@code cov(e_sigma, X) = -u_sigma^2}), sigma's independent rest added in quadrature. At the floor
     * the low end is 0.
     */
    private static Interval amplitudeInterval(MeanInverse inv, double sigma, double r, double um, double usig,
                                              double amplitude) {
        double varX = um * um + usig * usig;
        double sdX = Math.sqrt(varX);
        double slope = varX > 0 ? -usig * usig / varX : 0.0;
        double sdRest = Math.sqrt(Math.max(0.0, usig * usig - slope * slope * varX));
        double up = 0;
        double down = 0;
        boolean floor = false;
        for (int k = -GRID; k <= GRID; k++) {
            double x = k * Z * sdX / GRID;
            double a = sigma * Math.exp(-slope * x) * inv.theta(r * Math.exp(-x));
            up = Math.max(up, a - amplitude);
            down = Math.max(down, amplitude - a);
            floor |= a == 0.0;
        }
        double restUp = amplitude * (Math.exp(Z * sdRest) - 1);
        double restDown = amplitude * (1 - Math.exp(-Z * sdRest));
        return new Interval(floor ? 0.0 : Math.max(0.0, amplitude - Math.hypot(down, restDown)),
                amplitude + Math.hypot(up, restUp));
    }

    private static double theta(MeanInverse inv, double mean, double sigma) {
        return inv.theta(Math.max(0.0, mean / sigma));
    }

    private static double cnrAt(MeanInverse inv, double meanS, double meanC, double sigma) {
        return theta(inv, meanS, sigma) - theta(inv, meanC, sigma);
    }
}
