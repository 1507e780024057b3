package org.noisewise.diagnose;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.NakagamiDistribution;
import org.noisewise.estimate.BackgroundNoise;
import org.noisewise.estimate.BackgroundSigma;
import org.noisewise.estimate.Blocks;
import org.noisewise.estimate.Levels;
import org.noisewise.estimate.SampleStats;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.Warning;

/**
 * Judges whether background (air) pixels behave like unprocessed magnitude noise, the chi(2L) model
 * that every background method assumes. Two jobs:
 * <ul>
 *   <li>{@link #storageReasons}: how the values were stored. Masking (the fraction of exact zeros),
 *       a background of one constant value, clipping at the storage type's maximum, and sigma below
 *       about one stored intensity step.</li>
 *   <li>{@link #fit}: the Kolmogorov-Smirnov distance to chi(2L) with the maximum-likelihood sigma, and
 *       the largest log-ratio of the mean-, SD- and median-based sigmas to the ML sigma (ghosts and
 *       signal leaking into the regions push the SD and mean above the median). Because sigma is
 *       fitted to the same pixels, the textbook KS p-value is too lenient; both p-values are a
 *       parametric bootstrap (Lilliefors' idea): the same statistics on up to {@value #BOOTSTRAP}
 *       samples simulated from the fitted model, each refitted. The simulated values are stored as the
 *       image stored its values (rounded to the same intensity step, clipped at the same range), so
 *       the ties of 8- and 16-bit data do not count against them. Regions of more than
 *       {@value #MAX_TESTED} pixels are tested on a regular subsample of that size.</li>
 * </ul>
 * The bootstrap is seeded from the data, so the same pixels always get the same verdict.
 */
public final class BackgroundCheck {

    /** Bootstrap samples for the p-values. */
    public static final int BOOTSTRAP = 199;
    /** Sequential stopping: replicates per batch, and exceedances after which the p-value is clearly large. */
    static final int BATCH = 20;
    static final int STOP_AFTER = 10;
    /** p-values below this count as evidence against the model. */
    public static final double ALPHA = Levels.ALPHA;
    /** More than this fraction of exact zeros: masked background (common practice). */
    public static final double ZERO_LIMIT = 0.01;
    /** More than this fraction at the type's maximum: clipped (common practice). */
    public static final double CLIP_LIMIT = 0.001;
    /**
     * sigma below this many stored steps: too coarsely quantised for background statistics (Sheppard's
     * correction of the rounding, {@code step^2/12}, holds down to about half a step; below a quarter of a
     * step the values are mostly one or two levels and the sigma is invalid).
     */
    public static final double QUANTISATION_LIMIT = 0.5;
    /** The goodness-of-fit bootstrap works on at most this many pixels. */
    public static final int MAX_TESTED = 20000;

    private BackgroundCheck() {
    }

    /**
     * What is known about how the values were stored: calibrated value = {@code offset + step * raw}
     * for whole-number raw values between the storage type's limits.
     *
     * @param step    the smallest difference the storage can represent in calibrated units (e.g. the
     *                DICOM rescale slope for integer data), 0 for floating point
     * @param offset  the calibrated value of raw 0 (e.g. the rescale intercept)
     * @param minimum the smallest storable calibrated value, or -infinity
     * @param maximum the largest storable calibrated value, or +infinity
     */
    public record Storage(double step, double offset, double minimum, double maximum) {
        public Storage(double step, double maximum) {
            this(step, 0.0, step > 0 ? 0.0 : Double.NEGATIVE_INFINITY, maximum);
        }

        public static Storage floatingPoint() {
            return new Storage(0.0, 0.0, Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY);
        }

        /** Whether values are stored as whole multiples of a step. */
        public boolean integer() {
            return step > 0;
        }

        /** A value as this storage would hold it: rounded to the step and clipped at the range. */
        public double stored(double v) {
            double r = step > 0 ? offset + step * Math.rint((v - offset) / step) : v;
            return Math.max(minimum, Math.min(maximum, r));
        }
    }

    /** The result of the check. */
    public record Result(int channels, int pixels, Map<SigmaEstimator, SigmaEstimate> estimates,
                         SampleStats stats, double zeroFraction, double clippedFraction, double ksDistance,
                         double fitP, double disagreement, double agreementP, Verdict verdict,
                         List<Warning> reasons) {
        public Result {
            estimates = Map.copyOf(estimates);
            reasons = List.copyOf(reasons);
        }

        public double sigma() {
            return estimates.get(SigmaEstimator.ML).sigma();
        }
    }

    /** The goodness-of-fit and estimator-agreement statistics with their bootstrap p-values. */
    public record Fit(double ksDistance, double fitP, double disagreement, double agreementP) {
        static final Fit NONE = new Fit(Double.NaN, Double.NaN, Double.NaN, Double.NaN);
    }

    /** The check of independent pixels (simulated data, tests). */
    public static Result check(double[] background, int channels, Storage storage) {
        return check(BackgroundNoise.independent(background), channels, storage);
    }

    /**
     * Checks measured background regions, with the estimates and effective counts of {@code noise}
     * (the same intervals every other output shows).
     */
    public static Result check(BackgroundNoise noise, int channels, Storage storage) {
        double[] values = noise.values();
        int n = values.length;
        Map<SigmaEstimator, SigmaEstimate> est = noise.estimates(channels, storage.step());
        SampleStats stats = noise.stats();
        double sigma = est.get(SigmaEstimator.ML).sigma();
        int zeros = 0;
        int clipped = 0;
        for (double v : values) {
            zeros += v == 0 ? 1 : 0;
            clipped += v >= storage.maximum() ? 1 : 0;
        }
        double zeroFraction = (double) zeros / n;
        double clippedFraction = (double) clipped / n;
        List<Warning> reasons = new ArrayList<>();
        double expectedZeros = expectedZeroFraction(sigma, channels, storage);
        double zeroLimit = ZERO_LIMIT + expectedZeros + 3 * Math.sqrt(expectedZeros * (1 - expectedZeros) / n);
        Verdict v = storageReasons(stats, sigma, zeroFraction, zeroLimit, clippedFraction, storage, reasons);
        if (!(sigma > 0) || !(stats.sd() > 0)) {
            return new Result(channels, n, est, stats, zeroFraction, clippedFraction, Double.NaN, Double.NaN,
                    Double.NaN, Double.NaN, v, reasons);
        }
        Fit fit = fit(values, channels, storage, noise.effectivePixels(SigmaEstimator.MEDIAN));
        if (fit.fitP() < ALPHA) {
            v = v.worst(Verdict.QUESTIONABLE);
            reasons.add(new Warning("poor_fit", String.format(Locale.ROOT,
                    "the background histogram does not follow the %s model (Kolmogorov-Smirnov distance %.3f, "
                            + "bootstrap p = %.3f): ghosts, artefacts, filtering, parallel imaging or a wrong channel "
                            + "count; prefer the difference method", modelName(channels), fit.ksDistance(), fit.fitP())));
        }
        if (fit.agreementP() < ALPHA) {
            v = v.worst(Verdict.QUESTIONABLE);
            reasons.add(new Warning("estimators_disagree", String.format(Locale.ROOT,
                    "the mean-, SD-, ML- and median-based sigmas disagree by up to %.1f%%, more than sampling "
                            + "allows (bootstrap p = %.3f): something other than noise is in the regions (ghosts, "
                            + "signal, artefacts); move them or use the difference method",
                    100 * (Math.exp(fit.disagreement()) - 1), fit.agreementP())));
        }
        return new Result(channels, n, est, stats, zeroFraction, clippedFraction, fit.ksDistance(), fit.fitP(),
                fit.disagreement(), fit.agreementP(), v, reasons);
    }

    /**
     * The fraction of exact zeros rounding alone makes of sigma * chi(2L) noise: the model's probability
     * below half a step when 0 is a stored level, else 0 (floating point keeps no exact zeros).
     */
    static double expectedZeroFraction(double sigma, int channels, Storage storage) {
        if (!storage.integer() || !(sigma > 0)) {
            return 0.0;
        }
        double levels = -storage.offset() / storage.step();
        if (Math.abs(levels - Math.rint(levels)) > 1e-9) {
            return 0.0;
        }
        return new NakagamiDistribution(null, channels, 2.0 * channels * sigma * sigma,
                NakagamiDistribution.DEFAULT_INVERSE_ABSOLUTE_ACCURACY).cumulativeProbability(0.5 * storage.step());
    }

    /**
     * Masking, a constant background, clipping and quantisation: the verdict they imply, reasons added.
     *
     * @param zeroLimit the fraction of exact zeros beyond which the background counts as masked
     *                  ({@value #ZERO_LIMIT} above what rounding makes, allowing for sampling)
     */
    static Verdict storageReasons(SampleStats stats, double sigma, double zeroFraction, double zeroLimit,
                                  double clippedFraction, Storage storage, List<Warning> reasons) {
        Verdict v = Verdict.VALID;
        if (!(sigma > 0)) {
            reasons.add(new Warning("masked_background", "every background pixel is exactly zero: the background "
                    + "was masked or zero-filled by the reconstruction, so it holds no noise; acquire twice and use the "
                    + "difference method"));
            return Verdict.INVALID;
        }
        if (zeroFraction > zeroLimit) {
            v = Verdict.INVALID;
            reasons.add(new Warning("masked_background", String.format(Locale.ROOT,
                    "%.1f%% of the background pixels are exactly zero: the background was masked or zero-filled "
                            + "by the reconstruction, so it no longer holds the noise; acquire twice and use the "
                            + "difference method", 100 * zeroFraction)));
        }
        if (!(stats.sd() > 0)) {
            reasons.add(new Warning("constant_background", String.format(Locale.ROOT,
                    "every background pixel has the same value (%.6g): the background was replaced by a constant "
                            + "(masking to an offset, or not an image of noise), so it holds no noise; check the regions "
                            + "lie in air, or acquire twice and use the difference method", stats.mean())));
            return Verdict.INVALID;
        }
        if (clippedFraction > CLIP_LIMIT) {
            v = v.worst(Verdict.INVALID);
            reasons.add(new Warning("clipped", String.format(Locale.ROOT,
                    "%.2f%% of the background pixels sit at the largest storable value: the regions hold "
                            + "saturated signal or artefact, not air; move them", 100 * clippedFraction)));
        }
        if (storage.step() > 0 && sigma < QUANTISATION_LIMIT * storage.step()) {
            v = v.worst(sigma < 0.5 * QUANTISATION_LIMIT * storage.step() ? Verdict.INVALID : Verdict.QUESTIONABLE);
            reasons.add(new Warning("quantised", String.format(Locale.ROOT,
                    "the noise sigma (%.3g) is below half a stored intensity step (%.3g): the values are too "
                            + "coarsely quantised for background statistics; export with finer scaling or use the "
                            + "difference method", sigma, storage.step())));
        }
        return v;
    }

    /**
     * Parametric bootstrap of the fit and agreement statistics, with sequential stopping (Besag and
     * Clifford 1991, Biometrika 78:301): replicates run in batches, each from its own seeded stream so
     * the result does not depend on how they are spread over the cores, until both statistics have been
     * reached {@value #STOP_AFTER} times (the p-value is then clearly large) or {@value #BOOTSTRAP}
     * replicates are done.
     *
     * @param effective the independent pixels the sample is worth; the replicates simulate that many
     */
    static Fit fit(double[] all, int channels, Storage storage, double effective) {
        double[] values = subsample(all);
        double ratio = (double) values.length / all.length;
        int simulated = (int) Math.max(10, Math.min(values.length, Math.round(effective * ratio)));
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        Map<SigmaEstimator, Double> est = BackgroundSigma.sigmas(sorted, channels, storage.step());
        double sigma = est.get(SigmaEstimator.ML);
        double ks = ksDistance(sorted, channels, sigma);
        double dis = disagreement(est);
        SplittableRandom master = new SplittableRandom(seedOf(sorted));
        int ksExceed = 0;
        int disExceed = 0;
        int done = 0;
        while (done < BOOTSTRAP && (ksExceed < STOP_AFTER || disExceed < STOP_AFTER)) {
            int batch = Math.min(BATCH, BOOTSTRAP - done);
            SplittableRandom[] streams = new SplittableRandom[batch];
            for (int b = 0; b < batch; b++) {
                streams[b] = master.split();
            }
            boolean[] ksOver = new boolean[batch];
            boolean[] disOver = new boolean[batch];
            Blocks.tasks(batch, b -> {
                double[] sim = simulate(streams[b], simulated, sigma, channels, storage);
                Arrays.sort(sim);
                Map<SigmaEstimator, Double> e = BackgroundSigma.sigmas(sim, channels, storage.step());
                ksOver[b] = ksDistance(sim, channels, e.get(SigmaEstimator.ML)) >= ks;
                disOver[b] = disagreement(e) >= dis;
            });
            for (int b = 0; b < batch; b++) {
                ksExceed += ksOver[b] ? 1 : 0;
                disExceed += disOver[b] ? 1 : 0;
            }
            done += batch;
        }
        boolean complete = done >= BOOTSTRAP;
        double fitP = complete ? (1.0 + ksExceed) / (BOOTSTRAP + 1.0) : (double) ksExceed / done;
        double agreementP = complete ? (1.0 + disExceed) / (BOOTSTRAP + 1.0) : (double) disExceed / done;
        return new Fit(ks, fitP, dis, agreementP);
    }

    /**
     * {@code n} background magnitudes {@code sigma * chi(2L)} as the storage holds them:
     * {@code M^2 / sigma^2} is twice a sum of L unit exponentials, {@code -2 ln(U_1 ... U_L)}.
     */
    static double[] simulate(SplittableRandom rng, int n, double sigma, int channels, Storage storage) {
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            double product = 1.0;
            for (int c = 0; c < channels; c++) {
                product *= 1.0 - rng.nextDouble();
            }
            out[i] = storage.stored(sigma * Math.sqrt(-2.0 * Math.log(product)));
        }
        return out;
    }

    /** At most {@value #MAX_TESTED} values, a regular subsample of the pooled regions. */
    private static double[] subsample(double[] values) {
        if (values.length <= MAX_TESTED) {
            return values;
        }
        double[] out = new double[MAX_TESTED];
        double step = (double) values.length / MAX_TESTED;
        for (int i = 0; i < MAX_TESTED; i++) {
            out[i] = values[(int) (i * step)];
        }
        return out;
    }

    /** "Rayleigh" for one channel, else "chi(2L)". */
    public static String modelName(int channels) {
        return channels == 1 ? "Rayleigh" : "chi(" + 2 * channels + ")";
    }

    /** Largest |log(sigma_k / sigma_ML)| over the mean-, SD- and median-based estimates. */
    static double disagreement(Map<SigmaEstimator, Double> e) {
        double ml = e.get(SigmaEstimator.ML);
        double worst = 0;
        for (SigmaEstimator k : new SigmaEstimator[] {SigmaEstimator.MEAN, SigmaEstimator.SD, SigmaEstimator.MEDIAN}) {
            worst = Math.max(worst, Math.abs(Math.log(e.get(k) / ml)));
        }
        return worst;
    }

    /**
     * KS distance of sorted data to sigma * chi(2L), whose distribution function for whole L is
     * {@code 1 - e^(-u) sum_(k<L) u^k / k!} with {@code u = x^2 / 2 sigma^2} (the regularised gamma
     * P(L, u) in closed form; tests check it against Commons Math's Nakagami(L, 2L sigma^2)).
     */
    static double ksDistance(double[] sorted, int channels, double sigma) {
        int n = sorted.length;
        double inv = 1.0 / (2.0 * sigma * sigma);
        double d = 0;
        for (int i = 0; i < n; i++) {
            double u = sorted[i] * sorted[i] * inv;
            double term = 1.0;
            double sum = 1.0;
            for (int k = 1; k < channels; k++) {
                term *= u / k;
                sum += term;
            }
            double f = Math.max(0.0, 1.0 - Math.exp(-u) * sum);
            d = Math.max(d, Math.max(f - (double) i / n, (i + 1.0) / n - f));
        }
        return d;
    }

    private static long seedOf(double[] sorted) {
        long h = 1125899906842597L;
        for (double v : sorted) {
            h = 31 * h + Double.doubleToLongBits(v);
        }
        return h;
    }
}
