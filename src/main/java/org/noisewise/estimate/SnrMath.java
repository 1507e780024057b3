package org.noisewise.estimate;

import java.util.Locale;
import java.util.concurrent.ConcurrentHashMap;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.noisewise.math.ChiMoments;
import org.noisewise.math.MeanInverse;

/**
 * The log-normal interval of a ratio of a mean to a sigma, and the low-SNR rule shared by every
 * method, keyed on the channel count.
 */
public final class SnrMath {

    /**
     * For one channel, magnitudes are treated as Gaussian above an SNR of about 4 (references.md,
     * section 2; common practice). The rule for L channels keeps the same relative bias of the
     * magnitude mean, {@code mean_1(4)/4 - 1}, about 3.2%: the threshold rises with L because the
     * noise floor does ({@code beta_L}: 1.25 sigma for 1 channel, 3.94 sigma for 8).
     */
    public static final double ONE_CHANNEL_LIMIT = 4.0;

    private static final double Z975 = Levels.Z95;
    private static final ConcurrentHashMap<Integer, Double> LIMITS = new ConcurrentHashMap<>();

    private SnrMath() {
    }

    /**
     * 95% interval of {@code S / sigma} by the delta method on the log scale, combining the
     * standard error of the signal mean and the sigma interval (taken as symmetric in log sigma).
     * When {@code S <= 0} the interval is formed on the linear scale; NaN bounds when either spread is unknown.
     */
    public static Interval snrInterval(double signalMean, double signalSe, double sigma, Interval sigmaCi) {
        double snr = signalMean / sigma;
        double seLogSigma = CorrectedSnr.logSe(sigmaCi);
        if (!(sigma > 0) || !Double.isFinite(seLogSigma) || !Double.isFinite(signalSe)) {
            return new Interval(Double.NaN, Double.NaN);
        }
        if (signalMean > 0) {
            double seLogS = signalSe / signalMean;
            double half = Z975 * Math.sqrt(seLogS * seLogS + seLogSigma * seLogSigma);
            return new Interval(snr * Math.exp(-half), snr * Math.exp(half));
        }
        double se = Math.sqrt(Math.pow(signalSe / sigma, 2) + Math.pow(snr * seLogSigma, 2));
        return new Interval(snr - Z975 * se, snr + Z975 * se);
    }

    /** The relative bias of the magnitude mean at which the low-SNR rule fires: {@code mean_1(4)/4 - 1}. */
    public static double lowSnrBias() {
        return ChiMoments.mean(1, ONE_CHANNEL_LIMIT) / ONE_CHANNEL_LIMIT - 1.0;
    }

    /** The SNR below which the magnitude mean of L channels is biased by more than {@link #lowSnrBias()}. */
    public static double lowSnrLimit(int channels) {
        return LIMITS.computeIfAbsent(channels, l -> {
            if (l == 1) {
                return ONE_CHANNEL_LIMIT;
            }
            double bias = lowSnrBias();
            return new BrentSolver(1e-12, 1e-10).solve(200,
                    t -> ChiMoments.mean(l, t) / t - 1.0 - bias, 0.5, 200.0 * l);
        });
    }

    /** The true {@code A / sigma} whose expected magnitude equals {@code S / sigma}; 0 at or below the floor. */
    public static double trueSnrFromMagnitudeMean(double measuredSnr, int channels) {
        return MeanInverse.of(channels).theta(measuredSnr);
    }

    /**
     * The low-SNR warning, or {@code null} above {@link #lowSnrLimit}: how far the plain magnitude
     * ratio overestimates the corrected SNR, and what the correction relies on.
     *
     * @param snr          the corrected SNR {@code A / sigma}
     * @param magnitudeSnr the plain ratio of the magnitude mean to sigma (or to the magnitude SD)
     */
    public static Warning lowSnrWarning(double snr, double magnitudeSnr, int channels) {
        double limit = lowSnrLimit(channels);
        if (!(snr < limit)) {
            return null;
        }
        String model = channels == 1 ? "the Rice model of one channel"
                : "the noncentral chi model of " + channels + " channels combined by root sum of squares";
        if (!(snr > 0)) {
            return new Warning("low_snr", String.format(Locale.ROOT,
                    "the magnitude mean (%.3g sigma) is at or below the mean of pure noise (%.3g sigma, %s): the region "
                            + "cannot be told from noise, so the SNR is reported as 0",
                    magnitudeSnr, ChiMoments.beta(channels), model));
        }
        return new Warning("low_snr", String.format(Locale.ROOT,
                "SNR %.3g is below %.3g, where the magnitude statistics of %d channel%s are biased by noise: the plain "
                        + "ratio would be %.3g (%+.0f%%); the figures reported are corrected under %s, so they rely on the "
                        + "channel count being right and the channels being equal and uncorrelated",
                snr, limit, channels, channels == 1 ? "" : "s", magnitudeSnr, 100 * (magnitudeSnr / snr - 1), model));
    }
}
