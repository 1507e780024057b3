package org.noisewise.diagnose;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.stream.IntStream;
import org.apache.commons.math3.distribution.NakagamiDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.noisewise.estimate.BackgroundSigma;
import org.noisewise.estimate.SampleStats;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.Warning;
import org.noisewise.sample.Phantoms;

/**
 * Judges whether background (air) pixels behave like unprocessed magnitude noise, the chi(2L) model
 * that every background method assumes.
 *
 * <ul>
 *   <li>Masking: the fraction of exact zeros (zero-filled or masked backgrounds).</li>
 *   <li>Clipping: the fraction at the storage type's maximum.</li>
 *   <li>Quantisation: sigma below about one stored intensity step.</li>
 *   <li>Fit: the Kolmogorov-Smirnov distance to chi(2L) with the maximum-likelihood sigma. Because
 *       sigma is fitted to the same pixels, the textbook KS p-value is too lenient; the p-value here
 *       is a parametric bootstrap (Lilliefors' idea): the same statistic on {@value #BOOTSTRAP}
 *       samples simulated from the fitted model, each refitted.</li>
 *   <li>Agreement: the largest log-ratio of the mean-, SD- and median-based sigmas to the ML sigma,
 *       compared with its bootstrap distribution. Ghosts and signal leaking into the regions push
 *       the SD and mean above the median.</li>
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
    public static final double ALPHA = 0.01;
    /** More than this fraction of exact zeros: masked background (common practice). */
    public static final double ZERO_LIMIT = 0.01;
    /** More than this fraction at the type's maximum: clipped (common practice). */
    public static final double CLIP_LIMIT = 0.001;
    /** sigma below this many stored steps: too coarsely quantised for background statistics. */
    public static final double QUANTISATION_LIMIT = 1.0;

    private BackgroundCheck() {
    }

    /**
     * What is known about how the values were stored.
     *
     * @param step    the smallest difference the storage can represent in calibrated units (e.g. the
     *                DICOM rescale slope for integer data), 0 for floating point
     * @param maximum the largest storable calibrated value, or +infinity
     */
    public record Storage(double step, double maximum) {
        public static Storage floatingPoint() {
            return new Storage(0.0, Double.POSITIVE_INFINITY);
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

    public static Result check(double[] background, int channels, Storage storage) {
        return check(background, channels, storage, background.length);
    }

    /**
     * The check for correlated pixels: the bootstrap simulates {@code effectiveCount} independent
     * pixels, which matches the sampling spread of the statistics on the correlated sample.
     */
    public static Result check(double[] background, int channels, Storage storage, double effectiveCount) {
        int n = background.length;
        int simulated = (int) Math.max(10, Math.min(n, Math.round(effectiveCount)));
        if (n < 2) {
            throw new IllegalArgumentException("need at least 2 background pixels");
        }
        Map<SigmaEstimator, SigmaEstimate> est = BackgroundSigma.estimate(background, channels);
        SampleStats stats = SampleStats.of(background);
        double sigma = est.get(SigmaEstimator.ML).sigma();
        int zeros = 0;
        int clipped = 0;
        for (double v : background) {
            if (v == 0) {
                zeros++;
            }
            if (v >= storage.maximum()) {
                clipped++;
            }
        }
        double zeroFraction = (double) zeros / n;
        double clippedFraction = (double) clipped / n;

        if (!(sigma > 0)) {
            Warning allZero = new Warning("masked_background", "every background pixel is exactly zero: the background "
                    + "was masked or zero-filled by the reconstruction, so it holds no noise; acquire twice and use the "
                    + "difference method");
            return new Result(channels, n, est, stats, zeroFraction, clippedFraction, Double.NaN, Double.NaN,
                    Double.NaN, Double.NaN, Verdict.INVALID, List.of(allZero));
        }
        double[] sorted = background.clone();
        Arrays.sort(sorted);
        double ks = ksDistance(sorted, channels, sigma);
        double dis = disagreement(est);
        // Parametric bootstrap, one independent seeded stream per replicate so the result does not
        // depend on how the replicates are spread over the cores.
        // Parametric bootstrap with sequential stopping (Besag and Clifford 1991, Biometrika 78:301):
        // replicates run in batches, one seeded stream each so the result does not depend on how they
        // are spread over the cores, until both statistics have been reached STOP_AFTER times (the
        // p-value is then clearly large) or BOOTSTRAP replicates are done.
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
            int[] exceed = IntStream.range(0, batch).parallel().mapToObj(b -> {
                SplittableRandom rng = streams[b];
                double[] sim = new double[simulated];
                for (int i = 0; i < simulated; i++) {
                    sim[i] = Phantoms.magnitude(rng, 0.0, sigma, channels);
                }
                Map<SigmaEstimator, SigmaEstimate> e = BackgroundSigma.estimate(sim, channels);
                Arrays.sort(sim);
                return new int[] {ksDistance(sim, channels, e.get(SigmaEstimator.ML).sigma()) >= ks ? 1 : 0,
                        disagreement(e) >= dis ? 1 : 0};
            }).reduce(new int[2], (x, y) -> new int[] {x[0] + y[0], x[1] + y[1]});
            ksExceed += exceed[0];
            disExceed += exceed[1];
            done += batch;
        }
        boolean complete = done >= BOOTSTRAP;
        double fitP = complete ? (1.0 + ksExceed) / (BOOTSTRAP + 1.0) : (double) ksExceed / done;
        double agreementP = complete ? (1.0 + disExceed) / (BOOTSTRAP + 1.0) : (double) disExceed / done;

        List<Warning> reasons = new ArrayList<>();
        Verdict v = Verdict.VALID;
        if (zeroFraction > ZERO_LIMIT) {
            v = Verdict.INVALID;
            reasons.add(new Warning("masked_background", String.format(Locale.ROOT,
                    "%.1f%% of the background pixels are exactly zero: the background was masked or zero-filled "
                            + "by the reconstruction, so it no longer holds the noise; acquire twice and use the "
                            + "difference method", 100 * zeroFraction)));
        }
        if (clippedFraction > CLIP_LIMIT) {
            v = v.worst(Verdict.INVALID);
            reasons.add(new Warning("clipped", String.format(Locale.ROOT,
                    "%.2f%% of the background pixels sit at the largest storable value: the regions hold "
                            + "saturated signal or artefact, not air; move them", 100 * clippedFraction)));
        }
        if (storage.step() > 0 && sigma < QUANTISATION_LIMIT * storage.step()) {
            v = v.worst(sigma < 0.5 * storage.step() ? Verdict.INVALID : Verdict.QUESTIONABLE);
            reasons.add(new Warning("quantised", String.format(Locale.ROOT,
                    "the noise sigma (%.3g) is below one stored intensity step (%.3g): the values are too "
                            + "coarsely quantised for background statistics; export with finer scaling or use the "
                            + "difference method", sigma, storage.step())));
        }
        if (fitP < ALPHA) {
            v = v.worst(Verdict.QUESTIONABLE);
            reasons.add(new Warning("poor_fit", String.format(Locale.ROOT,
                    "the background histogram does not follow the %s model (Kolmogorov-Smirnov distance %.3f, "
                            + "bootstrap p = %.3f): ghosts, artefacts, filtering, parallel imaging or a wrong channel "
                            + "count; prefer the difference method", modelName(channels), ks, fitP)));
        }
        if (agreementP < ALPHA) {
            v = v.worst(Verdict.QUESTIONABLE);
            reasons.add(new Warning("estimators_disagree", String.format(Locale.ROOT,
                    "the mean-, SD-, ML- and median-based sigmas disagree by up to %.1f%%, more than sampling "
                            + "allows (bootstrap p = %.3f): something other than noise is in the regions (ghosts, "
                            + "signal, artefacts); move them or use the difference method",
                    100 * (Math.exp(dis) - 1), agreementP)));
        }
        return new Result(channels, n, est, stats, zeroFraction, clippedFraction, ks, fitP, dis, agreementP, v,
                reasons);
    }

    /** "Rayleigh" for one channel, else "chi(2L)". */
    public static String modelName(int channels) {
        return channels == 1 ? "Rayleigh" : "chi(" + 2 * channels + ")";
    }

    /** Largest |log(sigma_k / sigma_ML)| over the mean-, SD- and median-based estimates. */
    static double disagreement(Map<SigmaEstimator, SigmaEstimate> e) {
        double ml = e.get(SigmaEstimator.ML).sigma();
        double worst = 0;
        for (SigmaEstimator k : new SigmaEstimator[] {SigmaEstimator.MEAN, SigmaEstimator.SD, SigmaEstimator.MEDIAN}) {
            worst = Math.max(worst, Math.abs(Math.log(e.get(k).sigma() / ml)));
        }
        return worst;
    }

    /** KS distance of sorted data to sigma*chi(2L) = Nakagami(L, 2L sigma^2) (Commons Math). */
    static double ksDistance(double[] sorted, int channels, double sigma) {
        NakagamiDistribution model = new NakagamiDistribution(null, channels, 2.0 * channels * sigma * sigma,
                NakagamiDistribution.DEFAULT_INVERSE_ABSOLUTE_ACCURACY);
        int n = sorted.length;
        double d = 0;
        for (int i = 0; i < n; i++) {
            double f = model.cumulativeProbability(sorted[i]);
            d = Math.max(d, Math.max(f - (double) i / n, (i + 1.0) / n - f));
        }
        return d;
    }

    /** Commons Math's own KS test statistic, exposed for cross-checking {@link #ksDistance}. */
    static double commonsKs(double[] data, int channels, double sigma) {
        return new KolmogorovSmirnovTest().kolmogorovSmirnovStatistic(
                new NakagamiDistribution(channels, 2.0 * channels * sigma * sigma), data);
    }

    private static long seedOf(double[] sorted) {
        long h = 1125899906842597L;
        for (double v : sorted) {
            h = 31 * h + Double.doubleToLongBits(v);
        }
        return h;
    }
}
