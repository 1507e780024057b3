package org.noisewise.estimate;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.math.ChiMoments;
import org.noisewise.math.MeanInverse;

/**
 * The headline figures of every method: the signal amplitude {@code A}, the per-channel noise SD
 * {@code sigma} and the SNR {@code A / sigma}, each corrected for the bias of magnitude statistics and
 * each with a 95% interval, beside the plain magnitude ratio for comparison.
 *
 * <p>A magnitude region's mean is {@code sigma mean_L(A/sigma)} (Rice for one channel, noncentral chi
 * with {@code 2L} degrees of freedom for a root sum of squares of L channels; Gudbjartsson and Patz
 * 1995, Constantinides et al. 1997), above {@code A} by about {@code (2L - 1) sigma^2 / 2A}; its SD is
 * {@code sigma sqrt(xi_L(A/sigma))}, below {@code sigma} at low SNR. Two situations:
 * <ul>
 *   <li>{@link #knownSigma}: sigma was measured elsewhere (background regions). {@code A/sigma} solves
 *       {@code mean_L(A/sigma) = m/sigma}. The magnitude ratio {@code r = m/sigma} has a log-normal
 *       95% interval from the standard error of {@code m} and the sigma interval; as the inversion is
 *       monotone, the SNR interval is the inversion of that interval's ends.</li>
 *   <li>{@link #meanAndSd}: the mean and SD were measured on the same magnitudes (difference and
 *       repeated-acquisition methods). Koay and Basser's (2006, J Magn Reson 179:317) inversion of
 *       {@code r = m/s} gives {@code A/sigma}, then {@code sigma = s / sqrt(xi_L)}; the SNR interval again
 *       maps the ends of {@code r}'s interval, and the sigma interval follows by the delta method
 *       through the inversion, {@code Var(log sigma) = q'^2 Var(log m) + (1 - q')^2 Var(log s)} with
 *       {@code q(x) = -log sqrt(xi_L(theta(e^x)))}.</li>
 * </ul>
 * The amplitude interval moves {@code m} by the spread of every input expressed in units of {@code m}
 * and inverts the ends, so it stops at 0 where the amplitude cannot be told from the noise floor.
 */
public record CorrectedSnr(double amplitude, Interval amplitudeCi95, double sigma, Interval sigmaCi95, double snr,
                           Interval snrCi95, double magnitudeSnr, Interval magnitudeSnrCi95, int channels,
                           List<Warning> warnings) {

    private static final double Z975 = Levels.Z95;
    private static final Interval NONE = new Interval(Double.NaN, Double.NaN);

    public CorrectedSnr {
        warnings = List.copyOf(warnings);
    }

    /**
     * Amplitude and SNR from a region mean when sigma is known from elsewhere.
     *
     * @param mean     region mean of the magnitudes
     * @param seMean   its standard error (with the effective pixel count); NaN when it cannot be estimated
     * @param sigma    the per-channel noise SD
     * @param sigmaCi  its 95% interval
     * @param channels L
     */
    public static CorrectedSnr knownSigma(double mean, double seMean, double sigma, Interval sigmaCi, int channels) {
        MeanInverse inv = MeanInverse.of(channels);
        double r = mean / sigma;
        double seLogSigma = logSe(sigmaCi);
        Interval rCi = SnrMath.snrInterval(mean, seMean, sigma, sigmaCi);
        double theta = inv.theta(Math.max(r, 0.0));
        Interval thetaCi = map(rCi, inv);
        double amplitude = theta * sigma;
        Interval aCi = NONE;
        if (Double.isFinite(seMean) && Double.isFinite(seLogSigma)) {
            // sigma's spread shifts A as a change (theta mean' - mean) sigma_dev of m would
            double shift = theta * ChiMoments.meanDerivative(channels, theta) - ChiMoments.mean(channels, theta);
            double sdEq = Math.sqrt(seMean * seMean + Math.pow(shift * sigma * seLogSigma, 2));
            aCi = new Interval(sigma * inv.theta(Math.max(0.0, (mean - Z975 * sdEq) / sigma)),
                    sigma * inv.theta(Math.max(0.0, (mean + Z975 * sdEq) / sigma)));
        }
        List<Warning> w = new ArrayList<>();
        addWarnings(w, theta, r, thetaCi, channels, seMean);
        return new CorrectedSnr(amplitude, aCi, sigma, sigmaCi, theta, thetaCi, r, rCi, channels, w);
    }

    /**
     * Koay-Basser correction of a region mean and SD measured on the same magnitudes.
     *
     * @param mean     magnitude mean
     * @param seMean   its standard error
     * @param sd       magnitude SD (e.g. {@code SD(I1 - I2)/sqrt 2}, or the pooled temporal SD)
     * @param seLogSd  standard error of {@code log sd}
     * @param channels L
     */
    public static CorrectedSnr meanAndSd(double mean, double seMean, double sd, double seLogSd, int channels) {
        if (!(sd > 0)) {
            throw new IllegalArgumentException("the SD must be positive, was " + sd);
        }
        double r = mean / sd;
        double seLogMean = mean > 0 ? seMean / mean : Double.NaN;
        double seLogR = Math.sqrt(seLogMean * seLogMean + seLogSd * seLogSd);
        Interval rCi = mean > 0 && Double.isFinite(seLogR)
                ? new Interval(r * Math.exp(-Z975 * seLogR), r * Math.exp(Z975 * seLogR)) : NONE;
        double theta = mean > 0 ? KoayBasser.theta(r, channels) : 0.0;
        Interval thetaCi = Double.isFinite(rCi.low())
                ? new Interval(KoayBasser.theta(rCi.low(), channels), KoayBasser.theta(rCi.high(), channels)) : NONE;
        double xi = ChiMoments.variance(channels, theta);
        double sigma = sd / Math.sqrt(xi);
        Interval sigmaCi = NONE;
        if (Double.isFinite(seLogSd)) {
            double q = mean > 0 ? logSigmaSlope(r, channels) : 0.0;
            double seLogSigma = Math.sqrt(Math.pow(q * (Double.isFinite(seLogMean) ? seLogMean : 0.0), 2)
                    + Math.pow((1 - q) * seLogSd, 2));
            sigmaCi = new Interval(sigma * Math.exp(-Z975 * seLogSigma), sigma * Math.exp(Z975 * seLogSigma));
        }
        double amplitude = theta * sigma;
        Interval aCi = NONE;
        if (mean > 0 && Double.isFinite(seMean) && Double.isFinite(seLogSd)) {
            double h = 1e-5 * mean;
            double dm = (amplitude(mean + h, sd, channels) - amplitude(mean - h, sd, channels)) / (2 * h);
            double ds = (amplitude(mean, sd * (1 + 1e-5), channels) - amplitude(mean, sd * (1 - 1e-5), channels))
                    / (2e-5 * sd);
            double ratio = dm > 0 && Double.isFinite(ds) ? ds / dm : -r;
            double sdEq = Math.sqrt(seMean * seMean + Math.pow(ratio * sd * seLogSd, 2));
            aCi = new Interval(amplitude(Math.max(0.0, mean - Z975 * sdEq), sd, channels),
                    amplitude(mean + Z975 * sdEq, sd, channels));
        }
        List<Warning> w = new ArrayList<>();
        addWarnings(w, theta, r, thetaCi, channels, seMean);
        return new CorrectedSnr(amplitude, aCi, sigma, sigmaCi, theta, thetaCi, r, rCi, channels, w);
    }

    /**
     * The Gaussian model for signed (not magnitude) data: the amplitude is the mean, sigma the SD and
     * the SNR their ratio, uncorrected; normal intervals (the SNR's by the delta method, so a negative
     * mean gives a negative SNR with an ordered interval).
     */
    public static CorrectedSnr gaussian(double mean, double seMean, double sd, double seLogSd) {
        if (!(sd > 0)) {
            throw new IllegalArgumentException("the SD must be positive, was " + sd);
        }
        double snr = mean / sd;
        Interval aCi = Double.isFinite(seMean) ? new Interval(mean - Z975 * seMean, mean + Z975 * seMean) : NONE;
        Interval sCi = Double.isFinite(seLogSd) ? new Interval(sd * Math.exp(-Z975 * seLogSd), sd * Math.exp(Z975
                * seLogSd)) : NONE;
        double se = Math.sqrt(Math.pow(seMean / sd, 2) + Math.pow(snr * seLogSd, 2));
        Interval rCi = Double.isFinite(se) ? new Interval(snr - Z975 * se, snr + Z975 * se) : NONE;
        List<Warning> w = new ArrayList<>();
        if (!Double.isFinite(seMean)) {
            w.add(new Warning("no_interval", "no 95% interval: the signal region is too small to estimate the spread of "
                    + "its mean (a single pixel); draw a region of at least 100 pixels"));
        }
        return new CorrectedSnr(mean, aCi, sd, sCi, snr, rCi, snr, rCi, 0, w);
    }

    /** Koay-Basser amplitude of a mean and SD (0 below the pure-noise ratio). */
    private static double amplitude(double mean, double sd, int channels) {
        if (!(mean > 0)) {
            return 0.0;
        }
        double theta = KoayBasser.theta(mean / sd, channels);
        return theta * sd / Math.sqrt(ChiMoments.variance(channels, theta));
    }

    /** {@code d log sigma / d log r} at fixed {@code s}: {@code q'(log r)}, by a central difference. */
    private static double logSigmaSlope(double r, int channels) {
        double h = 1e-4;
        return (logXi(r * Math.exp(-h), channels) - logXi(r * Math.exp(h), channels)) / (4 * h);
    }

    private static double logXi(double r, int channels) {
        return Math.log(ChiMoments.variance(channels, KoayBasser.theta(r, channels)));
    }

    /** Standard error of the log of a quantity from its (log-symmetric) 95% interval. */
    public static double logSe(Interval ci) {
        return (Math.log(ci.high()) - Math.log(ci.low())) / (2 * Z975);
    }

    private static Interval map(Interval rCi, MeanInverse inv) {
        if (!Double.isFinite(rCi.low()) || !Double.isFinite(rCi.high())) {
            return NONE;
        }
        return new Interval(inv.theta(Math.max(0.0, rCi.low())), inv.theta(Math.max(0.0, rCi.high())));
    }

    private static void addWarnings(List<Warning> w, double theta, double r, Interval thetaCi, int channels,
                                    double seMean) {
        Warning low = SnrMath.lowSnrWarning(theta, r, channels);
        if (low != null) {
            w.add(low);
        }
        double floor = ChiMoments.beta(channels);
        if (theta < 2 * floor || (Double.isFinite(thetaCi.low()) && thetaCi.low() <= 0)) {
            w.add(new Warning("near_noise_floor", String.format(Locale.ROOT,
                    "the signal amplitude (%.3g sigma) is within about twice the mean of pure noise (%.3g sigma for %d "
                            + "channel%s): it can hardly be told from the noise floor, so the SNR%s is uncertain%s; "
                            + "measure at higher SNR (larger voxels, more averages) or with more pixels",
                    theta, floor, channels, channels == 1 ? "" : "s",
                    Double.isFinite(thetaCi.low()) && thetaCi.low() <= 0 ? "'s lower bound is 0 and the SNR" : "",
                    theta <= 0 ? " (the region is consistent with no signal at all)" : "")));
        }
        if (!Double.isFinite(seMean)) {
            w.add(new Warning("no_interval", "no 95% interval: the signal region is too small to estimate the spread of "
                    + "its mean (a single pixel); draw a region of at least 100 pixels"));
        }
    }
}
