package org.noisewise.estimate;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.noisewise.math.ChiMoments;

/**
 * SNR from a signal-region mean and a noise sigma, its confidence interval, and the low-SNR bias
 * rule shared by every method.
 */
public final class SnrMath {

    /** Below this magnitude SNR the Rician bias is no longer negligible (references.md, section 2; common practice). */
    public static final double LOW_SNR_LIMIT = 4.0;

    private static final double Z975 = 1.959963984540054;

    private SnrMath() {
    }

    /**
     * 95% interval of {@code S / sigma} by the delta method on the log scale, combining the
     * standard error of the signal mean and the sigma interval (taken as symmetric in log sigma).
     * When {@code S <= 0} the interval is formed on the linear scale.
     */
    public static Interval snrInterval(double signalMean, double signalSe, double sigma, Interval sigmaCi) {
        double snr = signalMean / sigma;
        double seLogSigma = (Math.log(sigmaCi.high()) - Math.log(sigmaCi.low())) / (2 * Z975);
        if (!(sigma > 0) || !Double.isFinite(seLogSigma)) {
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

    /**
     * The true {@code A / sigma} whose expected magnitude equals the measured {@code S / sigma}
     * under the L-channel model, or 0 when the measured value is at or below the pure-noise mean.
     */
    public static double trueSnrFromMagnitudeMean(double measuredSnr, int channels) {
        double floor = ChiMoments.beta(channels);
        if (!(measuredSnr > floor)) {
            return 0.0;
        }
        // mean(theta) rises from beta_L at theta = 0 and exceeds theta for every theta, so the
        // root lies in [0, measuredSnr].
        BrentSolver solver = new BrentSolver(1e-12, 1e-10);
        return solver.solve(200, t -> ChiMoments.mean(channels, t) - measuredSnr, 0.0, measuredSnr);
    }

    /**
     * The low-SNR warning, or {@code null} when {@code S / sigma >= 4}. States how far the
     * magnitude mean overestimates the true signal at this SNR (from the Rice / noncentral chi
     * mean) and points to Rician correction.
     */
    public static Warning lowSnrWarning(double measuredSnr, int channels) {
        if (!(measuredSnr < LOW_SNR_LIMIT)) {
            return null;
        }
        double theta = trueSnrFromMagnitudeMean(measuredSnr, channels);
        String model = channels == 1 ? "Rice model" : "noncentral chi model, " + channels + " channels";
        if (theta == 0.0) {
            return new Warning("low_snr", String.format(java.util.Locale.ROOT,
                    "SNR %.2f is at or below the mean of pure noise (%.3f sigma, %s): the signal region "
                            + "cannot be told from noise, so this SNR is not meaningful.",
                    measuredSnr, ChiMoments.beta(channels), model));
        }
        double bias = 100.0 * (measuredSnr / theta - 1.0);
        return new Warning("low_snr", String.format(java.util.Locale.ROOT,
                "SNR %.2f is below %.0f: the magnitude mean is biased upward by noise, here by about %.0f%% "
                        + "(%s; true SNR about %.2f). Apply Rician bias correction or measure at higher SNR.",
                measuredSnr, LOW_SNR_LIMIT, bias, model, theta));
    }
}
