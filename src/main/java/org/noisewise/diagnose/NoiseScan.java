package org.noisewise.diagnose;

import java.util.ArrayList;
import java.util.EnumMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.special.Gamma;
import org.noisewise.estimate.BackgroundSigma;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Levels;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SampleStats;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.SignedValues;
import org.noisewise.estimate.SpatialCorrelation;
import org.noisewise.math.ChiMoments;

/**
 * A noise-only scan: the same protocol acquired with the RF transmitter off, so that every pixel holds
 * only noise, reconstructed (coil combination, parallel-imaging unfolding, filters) as the image is.
 * Its pixels give sigma where the image's background cannot: at the signal region itself, when noise
 * varies over the image (the g-factor of parallel imaging, filters, coil sensitivities).
 *
 * <p><b>The model.</b> A pixel of the scan is central chi(2L) with the local {@code sigma(x, y)}, so
 * {@code M^2} is Gamma-distributed with shape {@code L} and mean {@code 2 L sigma^2}; over a region the
 * maximum-likelihood sigma is {@code sqrt(mean(M^2) / 2L)} (with Sheppard's {@code step^2 / 12} taken
 * off for integer storage), the estimate {@link BackgroundSigma} gives, and its interval takes the
 * effective pixel count from the correlation of neighbouring {@code M^2} measured on the scan.
 *
 * <p><b>Scale-free tests.</b> Sigma varies over the scan, so the checks use a statistic that does not
 * depend on it: in each {@value #BLOCK} x {@value #BLOCK} block, {@code t = mean(M)^2 / mean(M^2)},
 * of the values over their local RMS (the {@value #NORMALISER}-pixel mean of {@code M^2}, so that sigma
 * changing within a block does not widen the law), whose expectation for pure chi(2L) noise is
 * {@code g(L) = Gamma(L + 1/2)^2 / (L Gamma(L)^2)}
 * ({@code pi / 4} for one channel) plus {@code (1 - g) / n} for {@code n} pixels. Signal makes the
 * values less dispersed and {@code t} larger; a block whose {@code t} lies more than {@value #Z_STRUCTURE}
 * standard errors (delta method on the chi raw moments, widened by the measured correlation) above it is
 * structure, and so is a scan whose block statistics vary more than the null allows (a chi-square test of
 * their heterogeneity, {@code p < 1e-6}: sigma alone never changes {@code t}). Unless stated, {@code L}
 * is the solution of {@code g(L) = t} at the lower quartile of the blocks moved up by its offset under
 * the null (so signal over up to three quarters of the scan is still found), refined on all blocks once
 * they pass, with a 95% interval from the blocks' spread.
 * Blocks that are mostly exact zeros or constant are masked; values at the storage maximum are clipped.
 *
 * <p><b>Correlation.</b> From the variogram of {@code M^2} over its local mean (see
 * {@link #correlation}), so that a change of sigma over the scan does not look like correlation.
 *
 * <p><b>Channels.</b> Always estimated from the scan; a stated count outside the estimate's interval
 * (widened by half a channel) is refused, since sigma depends on it.
 */
public final class NoiseScan {

    /** Side of the test blocks, in pixels. */
    public static final int BLOCK = 16;
    /** Default side of the sigma map's window, in pixels. */
    public static final int DEFAULT_WINDOW = 15;
    /** One-sided z of the structure test (tail about 1e-6 per block). */
    public static final double Z_STRUCTURE = 4.75;
    /** The largest share of clipped pixels accepted. */
    public static final double MAX_CLIPPED = 0.001;
    /** The largest share of masked pixels accepted. */
    public static final double MAX_MASKED = 0.5;
    /** The largest channel count searched when it is not stated. */
    public static final double MAX_CHANNELS = 64;

    private static final double Z975 = Levels.Z95;

    private NoiseScan() {
    }

    /**
     * The checked scan of one plane.
     *
     * @param channels          the channel count used
     * @param estimate          the estimated count with its 95% interval, or null when it was stated
     * @param inflation         variance inflation of a mean of {@code M^2} from the scan's correlation (>= 1)
     * @param correlation       the correlation summary of the normalised {@code M^2}
     * @param usable            per pixel: not in a masked block, not clipped
     * @param maskedShare       share of the pixels in masked blocks
     * @param clippedShare      share of the pixels at the storage maximum
     * @param blocks            blocks tested
     * @param step              storage step (0: continuous)
     */
    public record Check(int channels, ChannelCount.Estimate estimate, double inflation,
                        SpatialCorrelation.Result correlation, boolean[] usable, double maskedShare,
                        double clippedShare, int blocks, double step) {
        public boolean channelsEstimated() {
            return estimate != null;
        }
    }

    /** A ratio of two sigmas with its 95% interval (log-normal, independent estimates; {@code logSe} of its log). */
    public record Ratio(double value, Interval ci95, double logSe) {
        public boolean excludesOne() {
            return ci95.low() > 1 || ci95.high() < 1;
        }

        /** Whether it differs from 1 by more than {@code share} and by more than {@code z} standard errors. */
        public boolean differs(double share, double z) {
            double d = Math.abs(Math.log(value));
            return Math.abs(value - 1) > share && d > z * logSe;
        }
    }

    /**
     * Checks a noise-only plane: no NaN or negative values, not masked, not clipped, no structure.
     *
     * @param channels stated channel count, or null to estimate it from the scan
     * @param signal   the region the scan must serve (it may not fall in a masked part), or null
     * @throws InputException naming what is wrong when the plane is not a usable noise-only scan
     */
    public static Check check(float[] noise, int width, int height, Integer channels, BackgroundCheck.Storage storage,
                              Region signal) throws InputException {
        if ((long) width * height != noise.length) {
            throw new IllegalArgumentException("plane is " + noise.length + " pixels, not " + width + "x" + height);
        }
        for (int i = 0; i < noise.length; i++) {
            if (!Float.isFinite(noise[i])) {
                throw new InputException(String.format(Locale.ROOT, "the noise-only scan holds %s at x=%d, y=%d: "
                        + "give the scan as the scanner wrote it", Float.isNaN(noise[i]) ? "NaN" : "an infinite value",
                        i % width, i / width));
            }
        }
        SignedValues.requireMagnitude(noise, "the noise-only scan", "a noise-only scan");
        double step = storage == null ? 0.0 : storage.step();
        double max = storage == null ? Double.POSITIVE_INFINITY : storage.maximum();
        boolean[] usable = new boolean[noise.length];
        int clipped = 0;
        for (int i = 0; i < noise.length; i++) {
            boolean c = Double.isFinite(max) && noise[i] >= max;
            clipped += c ? 1 : 0;
            usable[i] = !c;
        }
        double clippedShare = (double) clipped / noise.length;
        if (clippedShare > MAX_CLIPPED) {
            throw new InputException(String.format(Locale.ROOT, "the noise-only scan is clipped: %.2f%% of its pixels "
                    + "are at the storage maximum %.6g, which pure noise never reaches: it holds signal or was "
                    + "scaled too far; give a noise-only scan of the same protocol with the transmitter off",
                    100 * clippedShare, max));
        }
        List<int[]> blocks = blocks(width, height);
        int masked = 0;
        for (int[] b : blocks) {
            if (maskedBlock(noise, width, b)) {
                masked += b[2] * b[3];
                forEach(b, width, i -> usable[i] = false);
            }
        }
        double maskedShare = (double) masked / noise.length;
        if (maskedShare > MAX_MASKED) {
            throw new InputException(String.format(Locale.ROOT, "the noise-only scan is masked: %.0f%% of it is exact "
                    + "zeros or one constant value; a noise-only scan must hold noise everywhere (turn off "
                    + "background masking or zero-filling for it)", 100 * maskedShare));
        }
        if (signal != null) {
            int lost = 0;
            for (int i : signal.indices()) {
                lost += usable[i] ? 0 : 1;
            }
            if (lost > 0) {
                throw new InputException(String.format(Locale.ROOT, "%d pixels of region '%s' lie where the noise-only "
                        + "scan is masked (zeros) or clipped: it gives no sigma there; move the region or give a scan "
                        + "without masking", lost, signal.name()));
            }
        }
        double[] local = localMeanSquare(noise, width, height, usable);
        SpatialCorrelation.Result corr = correlation(noise, width, height, usable, local);
        double inflation = corr.correlated() ? Math.max(1.0, corr.linear()) : 1.0;
        double sheppard = step > 0 ? step * step / 12.0 : 0.0;
        List<double[]> stats = new ArrayList<>();
        for (int[] b : blocks) {
            double[] s = blockStats(noise, width, b, usable, sheppard, local);
            if (s != null) {
                stats.add(s);
            }
        }
        if (stats.size() < 4) {
            throw new InputException("the noise-only scan has too few usable " + BLOCK + "x" + BLOCK + " blocks ("
                    + stats.size() + ") to be checked: give a larger scan or one without masking");
        }
        // the lower quartile, moved up by its offset below the mean under the null: a scan holding
        // signal in up to three quarters of its blocks still gives the noise's channel count
        double[] t = stats.stream().mapToDouble(s -> s[0]).sorted().toArray();
        double quartile = t[t.length / 4];
        double nb = medianCount(stats);
        double start = solve(quartile, nb);
        for (int k = 0; k < 2; k++) {
            int li = (int) Math.max(1, Math.round(start));
            start = solve(quartile + 0.6745 * Math.sqrt(statisticVariance(li, nb) * inflation), nb);
        }
        refuseStructure(stats, (int) Math.max(1, Math.round(start)), inflation);
        double sum = 0;
        double n = 0;
        double var = 0;
        for (double[] s : stats) {
            sum += s[0];
            n += s[1];
        }
        double mean = sum / stats.size();
        for (double[] s : stats) {
            var += (s[0] - mean) * (s[0] - mean);
        }
        double se = Math.sqrt(var / (stats.size() - 1) / stats.size());
        double perBlock = n / stats.size();
        double l = solve(mean, perBlock);
        ChannelCount.Estimate estimate = new ChannelCount.Estimate(l, solve(mean - Z975 * se, perBlock),
                solve(mean + Z975 * se, perBlock), Double.NaN, (int) n);
        int used = (int) Math.max(1, Math.round(l));
        if (channels != null) {
            if (!(channels >= estimate.low() - 0.5 && channels <= estimate.high() + 0.5)) {
                throw new InputException(String.format(Locale.ROOT, "the noise-only scan behaves like %.2f channels "
                        + "(95%% interval %.2f-%.2f), not the %d stated: state %d channels, or let them be estimated "
                        + "from the scan", l, estimate.low(), estimate.high(), channels, used));
            }
            used = channels;
            estimate = null;
        }
        return new Check(used, estimate, inflation, corr, usable, maskedShare, clippedShare, stats.size(), step);
    }

    /** Refuses a scan with a block above pure noise, or with block statistics more varied than noise allows. */
    private static void refuseStructure(List<double[]> stats, int used, double inflation) throws InputException {
        int flagged = 0;
        double worst = 0;
        double[] first = null;
        double q = 0;
        double tMean = stats.stream().mapToDouble(s -> s[0]).average().orElse(0);
        for (double[] s : stats) {
            double z = structureZ(s, used, inflation);
            if (z > Z_STRUCTURE) {
                flagged++;
                if (first == null) {
                    first = s;
                }
                worst = Math.max(worst, z);
            }
            double d = s[0] - tMean;
            q += d * d / (statisticVariance(used, s[1]) * inflation);
        }
        if (flagged > 0) {
            throw new InputException(String.format(Locale.ROOT, "the noise-only scan holds structure: %d of %d blocks of "
                    + "%dx%d pixels are less dispersed than pure chi(%d) noise (the first at x=%d, y=%d, %.1f standard "
                    + "errors): they behave like signal plus noise. A noise-only scan is the same protocol with the RF "
                    + "transmitter off; check that this image is one", flagged, stats.size(), BLOCK, BLOCK, 2 * used,
                    (int) first[3], (int) first[4], worst));
        }
        double pHetero = 1 - new ChiSquaredDistribution(stats.size() - 1).cumulativeProbability(q);
        if (pHetero < 1e-6) {
            throw new InputException(String.format(Locale.ROOT, "the noise-only scan holds structure: the shape of its "
                    + "values changes from block to block far more than noise allows (p = %.1g over %d blocks of "
                    + "%dx%d pixels), as where signal lies over part of it. A noise-only scan is the same protocol "
                    + "with the RF transmitter off; check that this image is one", pHetero, stats.size(), BLOCK,
                    BLOCK));
        }
    }

    /**
     * Sigma over a region's pixels of the scan: the ML estimate with its interval from the effective
     * pixel count (the region's pixels over the scan's correlation inflation).
     */
    public static SigmaEstimate sigma(float[] noise, Region region, Check check) throws InputException {
        double[] v = region.values(noise);
        if (v.length < 2) {
            throw new InputException("region '" + region.name() + "' has " + v.length + " pixel(s): the noise-only "
                    + "scan's sigma needs at least 2");
        }
        // rounding to the storage step adds about 8 L sigma^2 step^2 / 12 to the variance of M^2 (4 L sigma^4)
        double meanSquare = 0;
        for (double x : v) {
            meanSquare += x * x / v.length;
        }
        double sigma2 = meanSquare / (2.0 * check.channels());
        double rounding = check.step() > 0 && sigma2 > 0 ? 1 + check.step() * check.step() / (6 * sigma2) : 1.0;
        Map<SigmaEstimator, Double> counts = new EnumMap<>(SigmaEstimator.class);
        counts.put(SigmaEstimator.ML, v.length / (check.inflation() * rounding));
        return BackgroundSigma.estimate(v, SampleStats.of(v), check.channels(), counts, check.step())
                .get(SigmaEstimator.ML);
    }

    /** The ratio {@code a / b} of two independent sigma estimates, with a log-normal 95% interval. */
    public static Ratio ratio(SigmaEstimate a, SigmaEstimate b) {
        double value = a.sigma() / b.sigma();
        double se = Math.hypot(logSe(a), logSe(b));
        return new Ratio(value, new Interval(value * Math.exp(-Z975 * se), value * Math.exp(Z975 * se)), se);
    }

    private static double logSe(SigmaEstimate s) {
        return (Math.log(s.ci95().high()) - Math.log(Math.max(1e-300, s.ci95().low()))) / (2 * Z975);
    }

    /**
     * The sigma map: every pixel's ML sigma over the usable pixels of the {@code window x window}
     * window centred on it (clipped at the image edge), corrected for the small-sample bias of a square
     * root ({@code E sqrt(chi^2_k / k)} with {@code k = 2 L n / inflation}); NaN where fewer than a
     * quarter of the window's pixels are usable.
     */
    public static float[] sigmaMap(float[] noise, int width, int height, Check check, int window) {
        if (window < 3 || window % 2 == 0) {
            throw new IllegalArgumentException("window must be odd and at least 3, was " + window);
        }
        double[][] local = windowMeanSquare(noise, width, height, check.usable(), window);
        int l = check.channels();
        double sheppard = check.step() > 0 ? check.step() * check.step() / 12.0 : 0.0;
        double minCount = window * window / 4.0;
        float[] map = new float[noise.length];
        for (int i = 0; i < map.length; i++) {
            double c = local[1][i];
            if (c < minCount) {
                map[i] = Float.NaN;
                continue;
            }
            double v = Math.max(0.0, local[0][i] - sheppard) / (2.0 * l);
            map[i] = (float) (Math.sqrt(v) / rootBias(2.0 * l * c / check.inflation()));
        }
        return map;
    }

    /** {@code E[sqrt(X / k)]} for {@code X ~ chi^2_k}: {@code sqrt(2 / k) Gamma((k + 1) / 2) / Gamma(k / 2)}. */
    static double rootBias(double k) {
        return Math.exp(0.5 * Math.log(2.0 / k) + Gamma.logGamma(0.5 * (k + 1)) - Gamma.logGamma(0.5 * k));
    }

    /** {@code g(L) = Gamma(L + 1/2)^2 / (L Gamma(L)^2)}, the expected {@code mean(M)^2 / mean(M^2)} of chi(2L). */
    static double g(double l) {
        return Math.exp(2 * (Gamma.logGamma(l + 0.5) - Gamma.logGamma(l))) / l;
    }

    /** The channel count whose expected block statistic for {@code n} pixels is {@code t}. */
    static double solve(double t, double n) {
        double target = (t - 1.0 / n) / (1.0 - 1.0 / n);
        double lo = 0.05;
        double hi = MAX_CHANNELS;
        if (target <= g(lo)) {
            return lo;
        }
        if (target >= g(hi)) {
            return hi;
        }
        return new BrentSolver(1e-10, 1e-9).solve(200, l -> g(l) - target, lo, hi);
    }

    /** How far a block's statistic lies above pure noise, in standard errors. */
    static double structureZ(double[] s, int channels, double inflation) {
        double g = g(channels);
        double expected = g + (1 - g) / s[1];
        return (s[0] - expected) / Math.sqrt(statisticVariance(channels, s[1]) * inflation);
    }

    /** Variance of a block's {@code mean(M)^2 / mean(M^2)} for {@code n} independent chi(2L) pixels (delta method). */
    static double statisticVariance(int channels, double n) {
        double m1 = ChiMoments.centralRawMoment(channels, 1);
        double m2 = ChiMoments.centralRawMoment(channels, 2);
        double m3 = ChiMoments.centralRawMoment(channels, 3);
        double m4 = ChiMoments.centralRawMoment(channels, 4);
        double da = 2 * m1 / m2;
        double db = -m1 * m1 / (m2 * m2);
        return (da * da * (m2 - m1 * m1) + db * db * (m4 - m2 * m2) + 2 * da * db * (m3 - m1 * m2)) / n;
    }

    /** Tiles of {@value #BLOCK} pixels; a remainder narrower than half a block joins the last tile. */
    static List<int[]> blocks(int width, int height) {
        List<int[]> out = new ArrayList<>();
        int[] xs = cuts(width);
        int[] ys = cuts(height);
        for (int j = 0; j + 1 < ys.length; j++) {
            for (int i = 0; i + 1 < xs.length; i++) {
                out.add(new int[]{xs[i], ys[j], xs[i + 1] - xs[i], ys[j + 1] - ys[j]});
            }
        }
        return out;
    }

    private static int[] cuts(int size) {
        int n = Math.max(1, size / BLOCK);
        if (size - n * BLOCK >= BLOCK / 2) {
            n++;
        }
        int[] c = new int[n + 1];
        for (int k = 0; k < n; k++) {
            c[k] = k * BLOCK;
        }
        c[n] = size;
        return c;
    }

    private static boolean maskedBlock(float[] noise, int width, int[] b) {
        int zeros = 0;
        float first = noise[b[1] * width + b[0]];
        boolean constant = true;
        for (int y = b[1]; y < b[1] + b[3]; y++) {
            for (int x = b[0]; x < b[0] + b[2]; x++) {
                float v = noise[y * width + x];
                zeros += v == 0f ? 1 : 0;
                constant &= v == first;
            }
        }
        return constant || zeros * 2 > b[2] * b[3];
    }

    /** {t, n, unused, x, y} of a block's usable pixels, or null with fewer than half a block's pixels. */
    private static double[] blockStats(float[] noise, int width, int[] b, boolean[] usable, double sheppard,
                                       double[] local) {
        double s1 = 0;
        double s2 = 0;
        int n = 0;
        for (int y = b[1]; y < b[1] + b[3]; y++) {
            for (int x = b[0]; x < b[0] + b[2]; x++) {
                int i = y * width + x;
                if (usable[i] && local[i] > 0) {
                    // each value over the local RMS, so that sigma changing within the block does not widen the law
                    s1 += noise[i] / Math.sqrt(local[i]);
                    s2 += ((double) noise[i] * noise[i] - sheppard) / local[i];
                    n++;
                }
            }
        }
        if (n < BLOCK * BLOCK / 2) {
            return null;
        }
        double a = s1 / n;
        double q = s2 / n;
        if (!(q > 0)) {
            return null;
        }
        return new double[]{a * a / q, n, 0, b[0], b[1]};
    }

    private static double medianCount(List<double[]> stats) {
        double[] n = stats.stream().mapToDouble(s -> s[1]).sorted().toArray();
        return n[n.length / 2];
    }

    private static void forEach(int[] b, int width, java.util.function.IntConsumer f) {
        for (int y = b[1]; y < b[1] + b[3]; y++) {
            for (int x = b[0]; x < b[0] + b[2]; x++) {
                f.accept(y * width + x);
            }
        }
    }

    /** Side of the local mean that normalises {@code M^2} for the correlation and the block tests. */
    static final int NORMALISER = 31;

    /** The mean of {@code M^2} over the usable pixels of the {@value #NORMALISER}-pixel window around each pixel. */
    static double[] localMeanSquare(float[] noise, int width, int height, boolean[] usable) {
        return windowMeanSquare(noise, width, height, usable, NORMALISER)[0];
    }

    /**
     * {@code [0]}: the mean of {@code M^2} over the usable pixels of the {@code window}-pixel square around
     * each pixel (clipped at the edge; 0 where none is usable), {@code [1]}: how many pixels it holds;
     * from summed-area tables.
     */
    static double[][] windowMeanSquare(float[] noise, int width, int height, boolean[] usable, int window) {
        int w1 = width + 1;
        double[] sum = new double[w1 * (height + 1)];
        int[] cnt = new int[w1 * (height + 1)];
        for (int y = 0; y < height; y++) {
            double rs = 0;
            int rc = 0;
            for (int x = 0; x < width; x++) {
                int i = y * width + x;
                if (usable[i]) {
                    rs += (double) noise[i] * noise[i];
                    rc++;
                }
                sum[(y + 1) * w1 + x + 1] = sum[y * w1 + x + 1] + rs;
                cnt[(y + 1) * w1 + x + 1] = cnt[y * w1 + x + 1] + rc;
            }
        }
        int r = window / 2;
        double[] mean = new double[noise.length];
        double[] count = new double[noise.length];
        for (int y = 0; y < height; y++) {
            int y0 = Math.max(0, y - r);
            int y1 = Math.min(height, y + r + 1);
            for (int x = 0; x < width; x++) {
                int x0 = Math.max(0, x - r);
                int x1 = Math.min(width, x + r + 1);
                int c = cnt[y1 * w1 + x1] - cnt[y0 * w1 + x1] - cnt[y1 * w1 + x0] + cnt[y0 * w1 + x0];
                count[y * width + x] = c;
                mean[y * width + x] = c == 0 ? 0.0
                        : (sum[y1 * w1 + x1] - sum[y0 * w1 + x1] - sum[y1 * w1 + x0] + sum[y0 * w1 + x0]) / c;
            }
        }
        return new double[][] {mean, count};
    }

    /**
     * Correlation of {@code M^2} at the lags of the half window {@link SpatialCorrelation#WINDOW}, from
     * the variogram of {@code q = M^2 / S}, {@code S} the local mean of {@code M^2} over
     * {@value #NORMALISER} x {@value #NORMALISER} pixels: {@code rho(h) = 1 - E[(q_i - q_(i+h))^2] / (2 var q)}.
     * Neighbours share nearly the same {@code S}, so its error and the change of sigma over the scan
     * cancel in the differences; the inflation of a mean of {@code M^2} is {@code 1 + 2 sum rho}, applied
     * when a neighbour correlation exceeds twice its standard error (from the spread of the squared
     * differences).
     */
    static SpatialCorrelation.Result correlation(float[] noise, int width, int height, boolean[] usable,
                                                 double[] local) {
        double[] q = new double[noise.length];
        double mean = 0;
        int n = 0;
        for (int i = 0; i < noise.length; i++) {
            if (usable[i]) {
                q[i] = local[i] > 0 ? (double) noise[i] * noise[i] / local[i] : 1.0;
                mean += q[i];
                n++;
            }
        }
        mean /= Math.max(1, n);
        double var = 0;
        for (int i = 0; i < q.length; i++) {
            if (usable[i]) {
                var += (q[i] - mean) * (q[i] - mean);
            }
        }
        var /= Math.max(1, n - 1);
        int k = SpatialCorrelation.WINDOW;
        double inflation = 1.0;
        double[] rho = new double[4];
        boolean correlated = false;
        for (int hy = 0; hy <= k; hy++) {
            for (int hx = hy == 0 ? 1 : -k; hx <= k; hx++) {
                double s = 0;
                double s2 = 0;
                long pairs = 0;
                for (int y = 0; y + hy < height; y++) {
                    for (int x = Math.max(0, -hx); x < width && x + hx < width; x++) {
                        int i = y * width + x;
                        int j = (y + hy) * width + x + hx;
                        if (usable[i] && usable[j]) {
                            double d = q[i] - q[j];
                            double h = 0.5 * d * d;
                            s += h;
                            s2 += h * h;
                            pairs++;
                        }
                    }
                }
                if (pairs < 2 || !(var > 0)) {
                    continue;
                }
                double gamma = s / pairs;
                double rh = 1 - gamma / var;
                double se = Math.sqrt(Math.max(0, s2 / pairs - gamma * gamma) / pairs) / var;
                inflation += 2 * rh;
                if ((hx == 1 && hy == 0) || (hx == 0 && hy == 1)) {
                    correlated |= rh > 2 * se;
                    rho[hy == 0 ? 0 : 1] = rh;
                } else if ((hx == 2 && hy == 0) || (hx == 0 && hy == 2)) {
                    rho[hy == 0 ? 2 : 3] = rh;
                }
            }
        }
        double used = correlated ? Math.max(1.0, inflation) : 1.0;
        return new SpatialCorrelation.Result(rho[0], rho[1], rho[2], rho[3], correlated, used, used, n);
    }
}
