package org.noisewise.estimate;

import java.util.Arrays;
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
        int n = background.length;
        if (n < 2) {
            throw new IllegalArgumentException("at least two background pixels are needed, got " + n);
        }
        if (channels < 1) {
            throw new IllegalArgumentException("channel count must be >= 1, was " + channels);
        }
        Map<SigmaEstimator, SigmaEstimate> out = new EnumMap<>(SigmaEstimator.class);
        out.put(SigmaEstimator.MEAN, fromMean(stats, channels, count(effectiveCounts, SigmaEstimator.MEAN, n)));
        out.put(SigmaEstimator.SD, fromSd(stats, channels, count(effectiveCounts, SigmaEstimator.SD, n)));
        out.put(SigmaEstimator.ML, maximumLikelihood(stats, channels, count(effectiveCounts, SigmaEstimator.ML, n)));
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

    static SigmaEstimate fromSd(SampleStats s, int channels, double nEff) {
        int n = s.n();
        double c = ChiMoments.centralSd(channels);
        double var = s.sd() * s.sd();
        double sigma = s.sd() / c;
        if (var == 0) {
            return new SigmaEstimate(SigmaEstimator.SD, 0, new Interval(0, 0), n);
        }
        double varOfVar = (s.fourthCentralMoment() - var * var * (n - 3.0) / (n - 1.0)) / nEff;
        double seLogVar = Math.sqrt(Math.max(varOfVar, 0)) / var;
        double halfLogSd = 0.5 * Z975 * seLogVar;
        Interval ci = new Interval(sigma * Math.exp(-halfLogSd), sigma * Math.exp(halfLogSd));
        return new SigmaEstimate(SigmaEstimator.SD, sigma, ci, n);
    }

    static SigmaEstimate maximumLikelihood(SampleStats s, int channels, double nEff) {
        int n = s.n();
        double meanSquare = s.sumSquares() / n;
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
        double[] sorted = background.clone();
        Arrays.sort(sorted);
        double median = n % 2 == 1 ? sorted[n / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
        double unit = chiMedian(channels);
        // Order-statistic interval: B = #values below the median ~ Binomial(m, 1/2); ranks l and
        // m - l + 1 (1-based) cover the median with probability >= 95%. With correlated pixels the
        // binomial is taken on the effective count and the ranks mapped back to the full sample.
        int m = (int) Math.max(2, Math.floor(nEff));
        BinomialDistribution b = new BinomialDistribution(null, m, 0.5);
        int lower = 0;
        while (lower + 1 <= m && b.cumulativeProbability(lower) <= 0.025) {
            lower++;
        }
        // lower = number of ranks excluded at the bottom + 1, i.e. the 1-based rank of the bound
        int lowRank = Math.max(1, lower);
        int highRank = m - lowRank + 1;
        double scale = (double) n / m;
        int lo = clampRank((int) Math.floor((lowRank - 0.5) * scale + 0.5), n);
        int hi = clampRank((int) Math.ceil((highRank - 0.5) * scale + 0.5), n);
        Interval ci = new Interval(sorted[lo - 1] / unit, sorted[hi - 1] / unit);
        return new SigmaEstimate(SigmaEstimator.MEDIAN, median / unit, ci, n);
    }

    private static int clampRank(int r, int n) {
        return Math.max(1, Math.min(n, r));
    }

    /** Median of chi(2L) with unit sigma: {@code sqrt(chi2inv(0.5, 2L))}; L = 1 gives sqrt(2 ln 2). */
    public static double chiMedian(int channels) {
        return Math.sqrt(new ChiSquaredDistribution(null, 2.0 * channels, 1e-15).inverseCumulativeProbability(0.5));
    }
}
