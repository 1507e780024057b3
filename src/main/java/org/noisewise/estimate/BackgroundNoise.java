package org.noisewise.estimate;

import java.util.EnumMap;
import java.util.List;
import java.util.Map;

/**
 * The background (air) regions of one plane, measured once for every later use: the pooled
 * magnitudes, their statistics, and the spatial correlation of each sigma estimator's own influence
 * quantity, from which every interval takes its effective pixel count
 * ({@link SpatialCorrelation}, references.md section 9):
 * <ul>
 *   <li>maximum likelihood sums {@code M^2}: its inflation is the correlation sum of {@code M^2}, which
 *       for complex Gaussian noise is {@code |rho|^2};</li>
 *   <li>the mean-based estimate averages {@code M};</li>
 *   <li>the SD-based estimate averages {@code (M - mean)^2};</li>
 *   <li>the median-based estimate counts {@code M < median}.</li>
 * </ul>
 * Every correlation is measured about the pooled mean of all regions (the model gives them one
 * sigma; region-to-region differences, which the region-agreement test reports, only widen the
 * intervals). All four are 1 unless neighbouring {@code M^2} correlate.
 */
public final class BackgroundNoise {

    private final double[] values;
    private final SampleStats stats;
    private final SpatialCorrelation.Result squares;
    private final Map<SigmaEstimator, Double> inflation;

    private BackgroundNoise(double[] values, SampleStats stats, SpatialCorrelation.Result squares,
                            Map<SigmaEstimator, Double> inflation) {
        this.values = values;
        this.stats = stats;
        this.squares = squares;
        this.inflation = inflation;
    }

    /**
     * Pools and measures the background regions of a plane.
     *
     * @throws InputException when a region is empty, outside the plane, holds NaN or negative values
     */
    public static BackgroundNoise measure(float[] pixels, int width, List<Region> background) throws InputException {
        double[] values = Region.pooledMagnitudes(pixels, background);
        SampleStats stats = SampleStats.of(values);
        double median = OrderStatistics.median(values);
        double meanSquare = stats.sumSquares() / values.length;
        double below = 0;
        double dev2 = 0;
        for (double v : values) {
            below += v < median ? 1 : 0;
            dev2 += (v - stats.mean()) * (v - stats.mean());
        }
        below /= values.length;
        dev2 /= values.length;
        int k = SpatialCorrelation.WINDOW;
        SpatialCorrelation.LagSums sq = new SpatialCorrelation.LagSums(k);
        SpatialCorrelation.LagSums lin = new SpatialCorrelation.LagSums(k);
        SpatialCorrelation.LagSums dev = new SpatialCorrelation.LagSums(k);
        SpatialCorrelation.LagSums ind = new SpatialCorrelation.LagSums(k);
        for (Region r : background) {
            SpatialCorrelation.Patch p = SpatialCorrelation.Patch.of(r, width);
            double[] m = p.sample(pixels, width);
            double[] m2 = new double[m.length];
            double[] d2 = new double[m.length];
            double[] in = new double[m.length];
            for (int i = 0; i < m.length; i++) {
                m2[i] = m[i] * m[i];
                d2[i] = (m[i] - stats.mean()) * (m[i] - stats.mean());
                in[i] = m[i] < median ? 1 : 0;
            }
            sq.add(p, m2, meanSquare);
            lin.add(p, m, stats.mean());
            dev.add(p, d2, dev2);
            ind.add(p, in, below);
        }
        int n = values.length;
        SpatialCorrelation.Result squares = sq.result(n);
        Map<SigmaEstimator, Double> inflation = new EnumMap<>(SigmaEstimator.class);
        boolean correlated = squares.correlated();
        inflation.put(SigmaEstimator.ML, squares.linear());
        inflation.put(SigmaEstimator.MEAN, correlated ? Math.max(1.0, lin.linear(k, n)) * lin.allowance() : 1.0);
        inflation.put(SigmaEstimator.SD, correlated ? Math.max(1.0, dev.linear(k, n)) * dev.allowance() : 1.0);
        inflation.put(SigmaEstimator.MEDIAN, correlated ? Math.max(1.0, ind.linear(k, n)) * ind.allowance() : 1.0);
        return new BackgroundNoise(values, stats, squares, inflation);
    }

    /** The same pixels treated as independent (no correlation measured), e.g. for simulated samples. */
    public static BackgroundNoise independent(double[] values) {
        Map<SigmaEstimator, Double> inflation = new EnumMap<>(SigmaEstimator.class);
        for (SigmaEstimator e : SigmaEstimator.values()) {
            inflation.put(e, 1.0);
        }
        return new BackgroundNoise(values.clone(), SampleStats.of(values),
                SpatialCorrelation.Result.white(values.length), inflation);
    }

    /** The pooled magnitudes (a copy). */
    public double[] values() {
        return values.clone();
    }

    public int size() {
        return values.length;
    }

    public SampleStats stats() {
        return stats;
    }

    /** The correlation of {@code M^2}: neighbour correlations and the maximum-likelihood inflation. */
    public SpatialCorrelation.Result squares() {
        return squares;
    }

    /** How many pixels make one independent sample for an estimator. */
    public double inflation(SigmaEstimator e) {
        return inflation.get(e);
    }

    /** The effective pixel count behind an estimator's interval. */
    public double effectivePixels(SigmaEstimator e) {
        return values.length / inflation.get(e);
    }

    /** The noise correlation of neighbouring pixels along x: {@code sqrt} of the {@code M^2} correlation. */
    public double noiseCorrelationX() {
        return Math.sqrt(Math.max(0.0, squares.neighbourX()));
    }

    public double noiseCorrelationY() {
        return Math.sqrt(Math.max(0.0, squares.neighbourY()));
    }

    /** All four sigma estimates for {@code channels}, each interval with its own effective count. */
    public Map<SigmaEstimator, SigmaEstimate> estimates(int channels) {
        return estimates(channels, 0.0);
    }

    /** The estimates of values stored as whole multiples of {@code step} (Sheppard-corrected, see BackgroundSigma). */
    public Map<SigmaEstimator, SigmaEstimate> estimates(int channels, double step) {
        Map<SigmaEstimator, Double> counts = new EnumMap<>(SigmaEstimator.class);
        for (SigmaEstimator e : SigmaEstimator.values()) {
            counts.put(e, effectivePixels(e));
        }
        return BackgroundSigma.estimate(values, stats, channels, counts, step);
    }
}
