package org.noisewise.estimate;

import java.util.Collections;
import java.util.EnumMap;
import java.util.Map;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.noisewise.math.ChiMoments;

/**
 * Background (air) estimates of the per-channel noise SD sigma of an L-channel magnitude image,
 * where background magnitudes are {@code sigma * chi(2L)} (Rayleigh for L = 1).
 *
 * <p>Each estimator returns a 95% confidence interval:
 * <ul>
 *   <li>{@link SigmaEstimator#ML}: {@code sum M^2 / sigma^2 ~ chi^2(2LN)} exactly, so
 *       {@code sigma in [sqrt(S/q_0.975), sqrt(S/q_0.025)]} (references.md section 1).</li>
 *   <li>{@link SigmaEstimator#MEAN}: central limit theorem for the sample mean with the sample SD
 *       as its spread, divided by {@code beta_L}.</li>
 *   <li>{@link SigmaEstimator#SD}: large-sample interval for the variance that does not assume
 *       normal data, {@code Var(s^2) ~ (m4 - s^4 (n-3)/(n-1)) / n}, applied on the log scale.</li>
 *   <li>{@link SigmaEstimator#MEDIAN}: the distribution-free order-statistic interval for the
 *       median (binomial ranks, coverage at least 95%), divided by the chi(2L) median.</li>
 * </ul>
 * Correlated pixels make every interval too narrow; callers pass each estimator's effective pixel
 * count when they know it ({@link BackgroundNoise} measures them).
 */
public final class BackgroundSigma {

    private static final double Z975 = Levels.Z95;

    private BackgroundSigma() {
    }

    /** All four estimates for independent pixels. */
    public static Map<SigmaEstimator, SigmaEstimate> estimate(double[] background, int channels) {
        return estimate(background, channels, background.length);
    }

    /** All four estimates for independent pixels stored as whole multiples of {@code step} (0: continuous). */
    public static Map<SigmaEstimator, SigmaEstimate> estimate(double[] background, int channels, double effectiveCount,
                                                              double step) {
        Map<SigmaEstimator, Double> counts = new EnumMap<>(SigmaEstimator.class);
        for (SigmaEstimator e : SigmaEstimator.values()) {
            counts.put(e, effectiveCount);
        }
        return estimate(background, SampleStats.of(background), channels, counts, step);
    }

    /**
     * All four estimates, every interval from the same effective pixel count.
     *
     * @param background     background magnitudes (finite, non-negative)
     * @param channels       number of combined receive channels L (1 for a single-channel image)
     * @param effectiveCount the number of independent pixels the sample is worth ({@code <= n});
     *                       it widens the intervals, never changes the estimates
     */
    public static Map<SigmaEstimator, SigmaEstimate> estimate(double[] background, int channels,
                                                              double effectiveCount) {
        Map<SigmaEstimator, Double> counts = new EnumMap<>(SigmaEstimator.class);
        for (SigmaEstimator e : SigmaEstimator.values()) {
            counts.put(e, effectiveCount);
        }
        return estimate(background, background.length >= 1 ? SampleStats.of(background) : null, channels, counts);
    }

    /**
     * All four estimates, each interval from its own effective pixel count (correlated noise inflates
     * the variance of each estimator differently: see {@link BackgroundNoise}).
     */
    public static Map<SigmaEstimator, SigmaEstimate> estimate(double[] background, SampleStats stats, int channels,
                                                              Map<SigmaEstimator, Double> effectiveCounts) {
        return estimate(background, stats, channels, effectiveCounts, 0.0);
    }

    /**
     * All four estimates of values stored as whole multiples of {@code step} (0: continuous). Rounding
     * adds {@code step^2 / 12} to every second moment (Sheppard's correction), which the ML and SD
     * estimates take off; the mean and median are unaffected to first order.
     */
    public static Map<SigmaEstimator, SigmaEstimate> estimate(double[] background, SampleStats stats, int channels,
                                                              Map<SigmaEstimator, Double> effectiveCounts, double step) {
        int n = background.length;
        if (n < 2) {
            throw new IllegalArgumentException("at least two background pixels are needed, got " + n);
        }
        if (channels < 1) {
            throw new IllegalArgumentException("channel count must be >= 1, was " + channels);
        }
        Map<SigmaEstimator, SigmaEstimate> out = new EnumMap<>(SigmaEstimator.class);
        out.put(SigmaEstimator.MEAN, fromMean(stats, channels, count(effectiveCounts, SigmaEstimator.MEAN, n)));
        double sheppard = step > 0 ? step * step / 12.0 : 0.0;
        out.put(SigmaEstimator.SD, fromSd(stats, channels, count(effectiveCounts, SigmaEstimator.SD, n), sheppard));
        out.put(SigmaEstimator.ML, maximumLikelihood(stats, channels, count(effectiveCounts, SigmaEstimator.ML, n),
                sheppard));
        out.put(SigmaEstimator.MEDIAN, fromMedian(background, channels, count(effectiveCounts, SigmaEstimator.MEDIAN, n)));
        return Collections.unmodifiableMap(out);
    }

    private static double count(Map<SigmaEstimator, Double> counts, SigmaEstimator e, int n) {
        Double c = counts.get(e);
        return Math.max(2.0, Math.min(n, c == null ? n : c));
    }

    static SigmaEstimate fromMean(SampleStats s, int channels, double nEff) {
        double beta = ChiMoments.beta(channels);
        double half = Z975 * s.sd() / Math.sqrt(nEff);
        double sigma = s.mean() / beta;
        Interval ci = new Interval(Math.max(0, s.mean() - half) / beta, (s.mean() + half) / beta);
        return new SigmaEstimate(SigmaEstimator.MEAN, sigma, ci, s.n());
    }

    static SigmaEstimate fromSd(SampleStats s, int channels, double nEff, double sheppard) {
        int n = s.n();
        double c = ChiMoments.centralSd(channels);
        double var = s.sd() * s.sd();
        double sigma = Math.sqrt(Math.max(0.0, var - sheppard)) / c;
        if (var == 0 || sigma == 0) {
            return new SigmaEstimate(SigmaEstimator.SD, 0, new Interval(0, 0), n);
        }
        double varOfVar = (s.fourthCentralMoment() - var * var * (n - 3.0) / (n - 1.0)) / nEff;
        double seLogVar = Math.sqrt(Math.max(varOfVar, 0)) / var;
        double halfLogSd = 0.5 * Z975 * seLogVar;
        Interval ci = new Interval(sigma * Math.exp(-halfLogSd), sigma * Math.exp(halfLogSd));
        return new SigmaEstimate(SigmaEstimator.SD, sigma, ci, n);
    }

    static SigmaEstimate maximumLikelihood(SampleStats s, int channels, double nEff, double sheppard) {
        int n = s.n();
        double meanSquare = Math.max(0.0, s.sumSquares() / n - sheppard);
        double sigma = Math.sqrt(meanSquare / (2.0 * channels));
        // sum M^2 / sigma^2 ~ chi^2(2 L N); with correlated pixels the sum is worth nEff pixels.
        double dof = 2.0 * channels * nEff;
        ChiSquaredDistribution chi2 = new ChiSquaredDistribution(null, dof);
        double scaledSum = meanSquare * nEff;
        Interval ci = new Interval(Math.sqrt(scaledSum / chi2.inverseCumulativeProbability(0.975)),
                Math.sqrt(scaledSum / chi2.inverseCumulativeProbability(0.025)));
        return new SigmaEstimate(SigmaEstimator.ML, sigma, ci, n);
    }

    static SigmaEstimate fromMedian(double[] background, int channels, double nEff) {
        int n = background.length;
        double median = OrderStatistics.median(background);
        double unit = chiMedian(channels);
        // Order-statistic interval: B = #values below the median ~ Binomial(m, 1/2); ranks l and
        // m - l + 1 (1-based) cover the median with probability >= 95%. With correlated pixels the
        // binomial is taken on the effective count and the ranks mapped back to the full sample.
        int m = (int) Math.max(2, Math.floor(nEff));
        BinomialDistribution b = new BinomialDistribution(null, m, 0.5);
        // the smallest k with P(B <= k) > 0.025: the number of ranks excluded at the bottom + 1, i.e. the
        // 1-based rank of the bound
        int lower = b.inverseCumulativeProbability(0.025);
        while (lower < m && b.cumulativeProbability(lower) <= 0.025) {
            lower++;
        }
        int lowRank = Math.max(1, lower);
        int highRank = m - lowRank + 1;
        double scale = (double) n / m;
        int lo = clampRank((int) Math.floor((lowRank - 0.5) * scale + 0.5), n);
        int hi = clampRank((int) Math.ceil((highRank - 0.5) * scale + 0.5), n);
        double[] bounds = OrderStatistics.select(background, lo - 1, hi - 1);
        Interval ci = new Interval(bounds[0] / unit, bounds[1] / unit);
        return new SigmaEstimate(SigmaEstimator.MEDIAN, median / unit, ci, n);
    }

    private static int clampRank(int r, int n) {
        return Math.max(1, Math.min(n, r));
    }

    /** Median of chi(2L) with unit sigma: {@code sqrt(chi2inv(0.5, 2L))}; L = 1 gives sqrt(2 ln 2). */
    public static double chiMedian(int channels) {
        return MEDIANS.computeIfAbsent(channels, l -> Math.sqrt(new ChiSquaredDistribution(null, 2.0 * l, 1e-15)
                .inverseCumulativeProbability(0.5)));
    }

    private static final java.util.concurrent.ConcurrentHashMap<Integer, Double> MEDIANS =
            new java.util.concurrent.ConcurrentHashMap<>();

    /**
     * The four sigmas without their intervals (what a bootstrap replicate needs), for values stored as
     * whole multiples of {@code step} (0: continuous); {@code sorted} must be in ascending order.
     */
    public static Map<SigmaEstimator, Double> sigmas(double[] sorted, int channels, double step) {
        int n = sorted.length;
        double sum = 0;
        double sq = 0;
        for (double v : sorted) {
            sum += v;
            sq += v * v;
        }
        double mean = sum / n;
        double dev = 0;
        for (double v : sorted) {
            dev += (v - mean) * (v - mean);
        }
        double sheppard = step > 0 ? step * step / 12.0 : 0.0;
        double median = n % 2 == 1 ? sorted[n / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
        Map<SigmaEstimator, Double> out = new EnumMap<>(SigmaEstimator.class);
        out.put(SigmaEstimator.MEAN, mean / ChiMoments.beta(channels));
        out.put(SigmaEstimator.SD, Math.sqrt(Math.max(0.0, dev / (n - 1) - sheppard)) / ChiMoments.centralSd(channels));
        out.put(SigmaEstimator.ML, Math.sqrt(Math.max(0.0, sq / n - sheppard) / (2.0 * channels)));
        out.put(SigmaEstimator.MEDIAN, median / chiMedian(channels));
        return out;
    }
}
