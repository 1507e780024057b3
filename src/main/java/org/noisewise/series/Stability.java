package org.noisewise.series;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.function.DoubleConsumer;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;
import org.noisewise.estimate.Blocks;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Levels;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.estimate.SignedValues;
import org.noisewise.estimate.SpatialCorrelation;
import org.noisewise.estimate.Warning;

/**
 * Scanner stability from a repeated phantom series (Friedman and Glover 2006, JMRI 23:827; Weisskoff
 * 1996, MRM 36:643).
 *
 * <p>Preparation: the first {@code skip} frames are dropped (steady state) and each voxel's series is
 * detrended by a least-squares second-order polynomial in time ({@link QuadraticTrend}). Maps: signal
 * = temporal mean; fluctuation noise = residual SD ({@code n - 3} degrees of freedom); SFNR = signal /
 * fluctuation noise; static spatial noise = sum of the odd frames minus sum of the even frames used
 * (the last dropped when their number is odd). Region figures: see {@link #summarize}.
 */
public final class Stability {

    /** Frames to drop by default. */
    public static final int DEFAULT_SKIP = 2;
    /** Default side of the square region, pixels. */
    public static final int DEFAULT_ROI = 21;
    /** Frames the figures need at least, after the skipped ones. */
    public static final int MIN_FRAMES = 10;
    /** Below this many frames used the figures are imprecise (a warning). */
    public static final int FEW_FRAMES = 50;
    /**
     * An SFNR below this says the region holds little more than noise (pure magnitude noise gives its
     * mean over its SD, 1.91 for one channel; common practice to warn at about twice that).
     */
    public static final double IN_AIR_SFNR = 4.0;
    /** Voxels of the region whose residuals are kept for the correlation in time. */
    static final int SAMPLED = 1024;

    static final int TILE = 4096;
    private static final ThreadLocal<double[][]> SCRATCH = ThreadLocal.withInitial(
            () -> Blocks.staggeredDoubles(6, TILE));
    private static final ThreadLocal<long[][]> WHOLE = ThreadLocal.withInitial(
            () -> Blocks.staggeredLongs(6, TILE));

    private Stability() {
    }

    /**
     * The maps of one slice from its frames as stored ({@code byte[]} unsigned 8-bit, {@code short[]}
     * unsigned 16-bit or {@code float[]}), {@code calibrated = offset + slope * stored} or
     * {@code table[stored]} when a table is given. One streaming pass per tile of pixels: deviations
     * from the first frame used are summed with the weights 1, {@code p1(t)}, {@code p2(t)}, {@code +-1}
     * and squared, so the mean, the trend, the residual sum of squares and the odd-minus-even sum come
     * from one reading of the data.
     */
    public static StabilityMaps maps(Object[] frames, int width, int height, int skip, double offset, double slope,
                                     float[] table, DoubleConsumer progress) throws InputException {
        int k = frames.length;
        if (skip < 0) {
            throw new InputException("the number of frames to skip cannot be negative, was " + skip);
        }
        int n = k - skip;
        if (n < MIN_FRAMES) {
            throw new InputException(String.format(Locale.ROOT, "the series has %d frame%s; after skipping %d for the "
                    + "steady state, %d remain, and the stability figures need at least %d (200 or more are usual): "
                    + "acquire a longer series or skip fewer frames", k, k == 1 ? "" : "s", skip, Math.max(0, n),
                    MIN_FRAMES));
        }
        int size = width * height;
        for (int f = 0; f < k; f++) {
            int len = frames[f] instanceof float[] a ? a.length : frames[f] instanceof short[] b ? b.length
                    : frames[f] instanceof byte[] c ? c.length : -1;
            if (len < 0) {
                throw new IllegalArgumentException("frame " + (f + 1) + " is not byte[], short[] or float[]");
            }
            if (len != size) {
                throw new InputException("frame " + (f + 1) + " has " + len + " pixels, not " + size + " (" + width + "x"
                        + height + "): every frame of the series must have the same matrix");
            }
        }
        QuadraticTrend trend = new QuadraticTrend(n);
        int ns = n % 2 == 0 ? n : n - 1;
        double[] w1 = new double[n];
        double[] w2 = new double[n];
        double[] ws = new double[n];
        for (int t = 0; t < n; t++) {
            w1[t] = trend.p1(t);
            w2[t] = trend.p2(t);
            ws[t] = t >= ns ? 0 : t % 2 == 0 ? 1 : -1;
        }
        float[] signal = new float[size];
        float[] fluct = new float[size];
        float[] sfnr = new float[size];
        float[] stat = new float[size];
        float[] lin = new float[size];
        float[] quad = new float[size];
        double scale = Math.abs(slope);
        double n1 = trend.norm1();
        double n2 = trend.norm2();
        int tiles = (size + TILE - 1) / TILE;
        java.util.concurrent.atomic.AtomicInteger done = new java.util.concurrent.atomic.AtomicInteger();
        Blocks.tasks(tiles, tile -> {
            int from = tile * TILE;
            int m = Math.min(TILE, size - from);
            double[][] sc = SCRATCH.get();
            double[] base = sc[0];
            double[] s1 = sc[1];
            double[] s2 = sc[2];
            double[] s3 = sc[3];
            double[] s4 = sc[4];
            double[] s5 = sc[5];
            if (table == null && !(frames[skip] instanceof float[])) {
                wholeSums(frames, skip, n, ns, from, m, trend, sc, WHOLE.get());
            } else {
                RepeatedAcquisitions.load(frames[skip], table, from, m, base);
                java.util.Arrays.fill(s1, 0, m, 0.0);
                java.util.Arrays.fill(s2, 0, m, 0.0);
                java.util.Arrays.fill(s3, 0, m, 0.0);
                java.util.Arrays.fill(s4, 0, m, 0.0);
                java.util.Arrays.fill(s5, 0, m, 0.0);
                for (int t = 1; t < n; t++) {
                    accumulate(frames[skip + t], table, from, m, base, w1[t], w2[t], ws[t], s1, s2, s3, s4, s5);
                }
            }
            // the first frame used has d = 0: it adds nothing to any sum; its weights enter through the means
            for (int j = 0; j < m; j++) {
                double mean = base[j] + s1[j] / n;
                // the basis has zero sum, so projecting d = x - base equals projecting x
                double a1 = s3[j] / n1;
                double a2 = s4[j] / n2;
                double rss = s2[j] - s1[j] * s1[j] / n - a1 * a1 * n1 - a2 * a2 * n2;
                double sd = Math.sqrt(Math.max(0.0, rss) / (n - 3)) * (table == null ? scale : 1.0);
                double cal = table == null ? offset + slope * mean : mean;
                // sum of +-1 weights is 0 (an even number of frames), so the sum of +-d is the sum of +-x
                double st = s5[j] * (table == null ? slope : 1.0);
                signal[from + j] = (float) cal;
                fluct[from + j] = (float) sd;
                sfnr[from + j] = sd > 0 ? (float) (cal / sd) : Float.NaN;
                stat[from + j] = (float) st;
                lin[from + j] = (float) (a1 * (table == null ? slope : 1.0));
                quad[from + j] = (float) (a2 * (table == null ? slope : 1.0));
            }
            int d = done.incrementAndGet();
            if (progress != null && d % Math.max(1, tiles / 20) == 0) {
                progress.accept((double) d / tiles);
            }
        });
        if (progress != null) {
            progress.accept(1.0);
        }
        return new StabilityMaps(width, height, n, skip, ns, signal, fluct, sfnr, stat, lin, quad);
    }

    /** Calibrated maps from float frames (calibration already applied). */
    public static StabilityMaps maps(float[][] frames, int width, int height, int skip) throws InputException {
        return maps(frames, width, height, skip, 0.0, 1.0, null, null);
    }

    /**
     * The same sums for 8- and 16-bit data in whole numbers (exact): deviations {@code d} from the first
     * frame used, summed plain, squared, times {@code t} and {@code t^2}, and over the even frames (the
     * odd-minus-even sum is {@code 2 sum_even d - sum d}); the orthogonal projections follow exactly,
     * {@code sum d p1 = sum d t - c sum d} and {@code sum d p2 = sum d t^2 - 2c sum d t + (c^2 - q) sum d}.
     */
    private static void wholeSums(Object[] frames, int skip, int n, int ns, int from, int m, QuadraticTrend trend,
                                  double[][] out, long[][] w) {
        long[] b = w[0];
        long[] s1 = w[1];
        long[] s2 = w[2];
        long[] st = w[3];
        long[] stt = w[4];
        long[] se = w[5];
        Object first = frames[skip];
        for (int j = 0; j < m; j++) {
            b[j] = first instanceof short[] a ? a[from + j] & 0xffff : ((byte[]) first)[from + j] & 0xff;
        }
        java.util.Arrays.fill(s1, 0, m, 0L);
        java.util.Arrays.fill(s2, 0, m, 0L);
        java.util.Arrays.fill(st, 0, m, 0L);
        java.util.Arrays.fill(stt, 0, m, 0L);
        java.util.Arrays.fill(se, 0, m, 0L);
        int t = 1;
        // frames in pairs (t odd, t + 1 even): half the accumulator traffic; the even frame counts for the
        // odd-minus-even sum when it is one of the first ns frames
        for (; t + 1 < n; t += 2) {
            Object f0 = frames[skip + t];
            Object f1 = frames[skip + t + 1];
            long t1 = t + 1;
            long tt0 = (long) t * t;
            long tt1 = t1 * t1;
            boolean even = t + 1 < ns;
            if (f0 instanceof short[] a0 && f1 instanceof short[] a1) {
                for (int j = 0; j < m; j++) {
                    long bj = b[j];
                    long d0 = (a0[from + j] & 0xffff) - bj;
                    long d1 = (a1[from + j] & 0xffff) - bj;
                    s1[j] += d0 + d1;
                    s2[j] += d0 * d0 + d1 * d1;
                    st[j] += d0 * t + d1 * t1;
                    stt[j] += d0 * tt0 + d1 * tt1;
                    se[j] += even ? d1 : 0;
                }
            } else {
                addFrame(f0, t, false, from, m, b, s1, s2, st, stt, se);
                addFrame(f1, t + 1, even, from, m, b, s1, s2, st, stt, se);
            }
        }
        for (; t < n; t++) {
            addFrame(frames[skip + t], t, t % 2 == 0 && t < ns, from, m, b, s1, s2, st, stt, se);
        }
        double c = (n - 1) / 2.0;
        double q = 0;
        for (int u = 0; u < n; u++) {
            q += (u - c) * (u - c);
        }
        q /= n;
        for (int j = 0; j < m; j++) {
            double sum = s1[j];
            out[0][j] = b[j];
            out[1][j] = sum;
            out[2][j] = s2[j];
            out[3][j] = st[j] - c * sum;
            out[4][j] = stt[j] - 2 * c * st[j] + (c * c - q) * sum;
            // frames t < ns with t even carry +1 (frame 0 has d = 0), the others -1, the last (when ns < n) 0
            double last = ns < n ? lastDeviation(frames, skip + n - 1, from + j, b[j]) : 0.0;
            out[5][j] = 2.0 * se[j] - (sum - last);
        }
    }

    private static void addFrame(Object f, int t, boolean even, int from, int m, long[] b, long[] s1, long[] s2,
                                 long[] st, long[] stt, long[] se) {
        long tt = (long) t * t;
        for (int j = 0; j < m; j++) {
            long d = (f instanceof short[] a ? a[from + j] & 0xffff : ((byte[]) f)[from + j] & 0xff) - b[j];
            s1[j] += d;
            s2[j] += d * d;
            st[j] += d * t;
            stt[j] += d * tt;
            if (even) {
                se[j] += d;
            }
        }
    }

    private static double lastDeviation(Object[] frames, int f, int i, long base) {
        Object a = frames[f];
        return (a instanceof short[] s ? s[i] & 0xffff : ((byte[]) a)[i] & 0xff) - base;
    }

    private static void accumulate(Object frame, float[] table, int from, int n, double[] base, double w1, double w2,
                                   double ws, double[] s1, double[] s2, double[] s3, double[] s4, double[] s5) {
        if (frame instanceof short[] a && table == null) {
            for (int j = 0; j < n; j++) {
                double d = (a[from + j] & 0xffff) - base[j];
                s1[j] += d;
                s2[j] += d * d;
                s3[j] += d * w1;
                s4[j] += d * w2;
                s5[j] += d * ws;
            }
        } else if (frame instanceof float[] a) {
            for (int j = 0; j < n; j++) {
                double d = a[from + j] - base[j];
                s1[j] += d;
                s2[j] += d * d;
                s3[j] += d * w1;
                s4[j] += d * w2;
                s5[j] += d * ws;
            }
        } else {
            for (int j = 0; j < n; j++) {
                int raw = frame instanceof short[] sa ? sa[from + j] & 0xffff : ((byte[]) frame)[from + j] & 0xff;
                double d = (table == null ? raw : table[raw]) - base[j];
                s1[j] += d;
                s2[j] += d * d;
                s3[j] += d * w1;
                s4[j] += d * w2;
                s5[j] += d * ws;
            }
        }
    }

    /** The frames of one slice, read as calibrated values at chosen pixels (0-based over all frames). */
    public interface Frames {
        /** Writes the calibrated values of frame {@code frame} at {@code indices} to {@code out}. */
        void gather(int frame, int[] indices, double[] out) throws InputException;

        /** Frames already in memory as calibrated planes. */
        static Frames of(float[][] planes) {
            return (frame, indices, out) -> {
                float[] p = planes[frame];
                for (int i = 0; i < indices.length; i++) {
                    out[i] = p[indices[i]];
                }
            };
        }
    }

    /**
     * Where the region figures are read: the region itself, and the square of {@code side} pixels whose
     * top-left corner is {@code (x0, y0)}, in which the Weisskoff squares of side 1 .. {@code side} are
     * nested about the same centre.
     */
    public record Placement(Region region, int x0, int y0, int side) {
    }

    /**
     * The region figures.
     * <ul>
     *   <li>SFNR: the region mean of the SFNR map (Friedman and Glover's figure, {@code sfnr_map_mean}),
     *       and the headline {@code sfnr}, that mean divided by {@code b(nu) = E[sigma / s]} for a residual
     *       SD with {@code nu = n - 3} degrees of freedom ({@link RepeatedAcquisitions#snrMapBias}), which
     *       removes the small bias of a mean of reciprocal SDs. 95% interval: the region's pooled residual
     *       variance {@code v} is a fluctuation common to its voxels (variance {@code s^2}) plus independent
     *       noise ({@code sigma^2}); the region-mean series, whose residual variance is
     *       {@code s^2 + sigma^2 / m}, separates the two, so {@code Var(v) = (2 / nu)(s^4 + 2 s^2 sigma^2 / m
     *       + sigma^4 / m)} and {@code v} is taken as chi-square with Satterthwaite's
     *       {@code nu_eff = 2 v^2 / Var(v)} degrees of freedom; SFNR goes as {@code v^(-1/2)}.</li>
     *   <li>Static-noise SNR: {@code S / sqrt(V / N_s)} with S the region mean of the signal map, V the
     *       variance over the region of the static-noise map (divisor {@code m - 1}) and {@code N_s} the
     *       frames in the odd-minus-even sum; an exact chi-square interval on {@code m - 1} degrees of
     *       freedom for the noise (voxels independent), combined on the log scale with the standard
     *       error of S from the region-mean series.</li>
     *   <li>Percent fluctuation: 100 x residual SD of the region-mean series after its own second-order
     *       fit / mean of the series; drift: 100 x (max - min of that fit) / mean.</li>
     *   <li>Weisskoff curve F(k), k = 1 .. side: the percent coefficient of variation of the detrended
     *       mean of the k x k square (same centre); radius of decorrelation {@code F(1) / F(side)}.</li>
     * </ul>
     *
     * @param repetitionSeconds the time between frames, or NaN when unknown (the spectrum is then per frame)
     */
    public static StabilityResult summarize(StabilityMaps maps, Frames frames, Placement place,
                                            double repetitionSeconds) throws InputException {
        int w = maps.width();
        int h = maps.height();
        Region region = place.region();
        if (region == null || region.size() == 0) {
            throw new InputException("no region for the stability figures: give a square size or a signal region");
        }
        for (int i : region.indices()) {
            if (i < 0 || i >= w * h) {
                throw new InputException("the region '" + region.name() + "' lies outside the " + w + "x" + h
                        + " image: move or shrink it");
            }
        }
        int side = place.side();
        if (side < 1 || place.x0() < 0 || place.y0() < 0 || place.x0() + side > w || place.y0() + side > h) {
            throw new InputException(String.format(Locale.ROOT, "the %dx%d square at x=%d, y=%d does not fit in the "
                    + "%dx%d image: choose a smaller square or move the region", side, side, place.x0(), place.y0(), w, h));
        }
        int n = maps.framesUsed();
        int skip = maps.skipped();
        QuadraticTrend trend = new QuadraticTrend(n);
        int[] idx = region.indices();
        int m = idx.length;
        double[] regionSeries = new double[n];
        double[][] squares = new double[side][n];
        double[] z = new double[n];
        float[] mean = maps.signal();
        float[] a1 = maps.linear();
        float[] a2 = maps.quadratic();
        // the square's pixels in raster order, then the region's (unless it is the square itself): one gather per frame
        int sq = side * side;
        int[] square = new int[sq];
        for (int y = 0; y < side; y++) {
            for (int x = 0; x < side; x++) {
                square[y * side + x] = (place.y0() + y) * w + place.x0() + x;
            }
        }
        boolean same = java.util.Arrays.equals(square, idx);
        int[] wanted = same ? square : new int[sq + m];
        int at = same ? 0 : sq;
        if (!same) {
            System.arraycopy(square, 0, wanted, 0, sq);
            System.arraycopy(idx, 0, wanted, sq, m);
        }
        double[] got = new double[wanted.length];
        double[] prefix = new double[(side + 1) * (side + 1)];
        long negatives = 0;
        // residuals kept for the noise structure: every frame of up to SAMPLED voxels (their correlation in
        // time), and the whole region in up to 64 frames (its correlation in space)
        int kept = Math.min(m, SAMPLED);
        double[][] resid = new double[n][kept];
        double[] common = new double[n];
        SpatialCorrelation.Patch patch = SpatialCorrelation.Patch.of(region, w);
        int[][] members = patch.members(w);
        java.util.Map<Integer, Integer> boxOf = new java.util.HashMap<>();
        for (int k = 0; k < members[0].length; k++) {
            boxOf.put(members[0][k], members[1][k]);
        }
        int[] box = new int[m];
        for (int j = 0; j < m; j++) {
            box[j] = boxOf.get(idx[j]);
        }
        SpatialCorrelation.LagSums spatial = new SpatialCorrelation.LagSums(SpatialCorrelation.SQUARE_WINDOW);
        int spatialStep = Math.max(1, n / 64);
        double[] r = new double[m];
        double[] patchValues = new double[patch.w() * patch.h()];
        for (int t = 0; t < n; t++) {
            frames.gather(skip + t, wanted, got);
            double s = 0;
            double zz = 0;
            double b1 = trend.p1(t);
            double b2 = trend.p2(t);
            double rs = 0;
            for (int j = 0; j < m; j++) {
                int i = idx[j];
                double x = got[at + j];
                negatives += x < 0 ? 1 : 0;
                s += x;
                r[j] = x - (mean[i] + a1[i] * b1 + a2[i] * b2);
                rs += r[j];
                zz += r[j] * r[j];
            }
            regionSeries[t] = s / m;
            z[t] = zz / m;
            common[t] = rs / m;
            for (int j = 0; j < kept; j++) {
                resid[t][j] = r[j] - common[t];
            }
            if (t % spatialStep == 0 && m > 1) {
                for (int j = 0; j < m; j++) {
                    patchValues[box[j]] = r[j] - common[t];
                }
                spatial.add(patch, patchValues, 0.0);
            }
            // nested k x k squares about the same centre from the square's summed-area table
            int s1 = side + 1;
            for (int y = 0; y < side; y++) {
                double row = 0;
                for (int x = 0; x < side; x++) {
                    row += got[y * side + x];
                    prefix[(y + 1) * s1 + x + 1] = prefix[y * s1 + x + 1] + row;
                }
            }
            for (int k = 1; k <= side; k++) {
                int o = (side - k) / 2;
                double q = prefix[(o + k) * s1 + o + k] - prefix[o * s1 + o + k] - prefix[(o + k) * s1 + o]
                        + prefix[o * s1 + o];
                squares[k - 1][t] = q / (k * k);
            }
        }
        double signalMean = 0;
        double sfnrSum = 0;
        int sfnrCount = 0;
        double staticMean = 0;
        for (int i : idx) {
            signalMean += mean[i];
            float v = maps.sfnr()[i];
            if (Float.isFinite(v)) {
                sfnrSum += v;
                sfnrCount++;
            }
            staticMean += maps.staticNoise()[i];
        }
        signalMean /= m;
        staticMean /= m;
        double staticVar = 0;
        for (int i : idx) {
            double d = maps.staticNoise()[i] - staticMean;
            staticVar += d * d;
        }
        List<Warning> warnings = new ArrayList<>();
        if (SignedValues.signed((int) Math.min(Integer.MAX_VALUE, negatives), (long) n * m)) {
            throw new InputException(String.format(Locale.ROOT, "%.1f%% of the values in region '%s' are below zero: "
                    + "this is not a magnitude series (a phase-sensitive or real-part reconstruction, or a difference), "
                    + "and the stability figures are defined on magnitude images; measure the magnitude series",
                    100.0 * negatives / ((double) n * m), region.name()));
        }
        int nu = n - 3;
        // the noise structure: correlation between the voxels' own parts (the common part removed) and in time
        SpatialCorrelation.Result corr = m > 1 ? spatial.result(m) : SpatialCorrelation.Result.white(m);
        double v1 = Math.min(corr.linear(), 0.5 * m);
        double v2 = corr.squared();
        double[] seriesResiduals = trend.residuals(regionSeries);
        // the residuals' correlation in time; the variance of a variance is more sensitive to it than a mean is,
        // so its model takes the larger margin for the correlation's own uncertainty
        SeriesNoise.Ar1[] arSeries = n > 8 ? SeriesNoise.Ar1.ofLag1(SeriesNoise.autocorrelation(seriesResiduals, 1),
                trend, 2.0, 1.5) : new SeriesNoise.Ar1[] {SeriesNoise.Ar1.white(n), SeriesNoise.Ar1.white(n)};
        SeriesNoise.Ar1 arCommon = arSeries[0];
        SeriesNoise.Ar1 arTrend = arSeries[1];
        SeriesNoise.Ar1 arVoxel = n > 8 ? SeriesNoise.Ar1.ofLag1(voxelLag1(resid, n, kept), trend, 2.0)
                : SeriesNoise.Ar1.white(n);
        double tcc = arCommon.varianceFactor();
        double tee = arVoxel.varianceFactor();
        double pc = arCommon.phi() * arVoxel.phi();
        double tce = (1 + pc) / (1 - pc);
        double sfnrMapMean = sfnrCount > 0 ? sfnrSum / sfnrCount : Double.NaN;
        double zSum = 0;
        for (double v : z) {
            zSum += v;
        }
        // the pooled residual variance and its effective degrees of freedom (Satterthwaite): the region's
        // residuals are a common part c(t) (variance s^2) plus the voxels' own parts (variance sigma^2,
        // correlated between neighbours), which the region-mean series separates: its residual variance is
        // s^2 + sigma^2 V1 / m. Var(v) = (2 / nu) (s^4 Tcc + 2 s^2 sigma^2 (V1 / m) Tce + sigma^4 (V2 / m) Tee),
        // V1, V2 the spatial inflations for means and variances, T the temporal ones (SeriesNoise)
        double vbar = zSum / nu;
        if (!(vbar > 0)) {
            warnings.add(new Warning("no_temporal_noise", "the values in region '" + region.name() + "' follow their "
                    + "fitted trend exactly (no temporal noise): the SFNR and the noise figures are undefined; the frames "
                    + "are copies of one image, or the region is saturated or masked: check the series"));
        }
        double vm = Math.pow(trend.residualSd(regionSeries), 2);
        double sig2 = m > 1 ? Math.max(0.0, (vbar - vm) / (1 - v1 / m)) : vbar;
        double s2 = Math.max(0.0, vbar - sig2);
        double varV = 2.0 / nu * (s2 * s2 * tcc + 2 * s2 * sig2 * (v1 / m) * tce + sig2 * sig2 * (v2 / m) * tee);
        double nuEff = varV > 0 ? 2 * vbar * vbar / varV : Double.NaN;
        // E[sigma / s] for one voxel's residual SD, whose variance has nu (s^2 + sigma^2)^2 / (s^4 Tcc +
        // 2 s^2 sigma^2 Tce + sigma^4 Tee) effective degrees of freedom (nu for white residuals)
        double own = s2 * s2 * tcc + 2 * s2 * sig2 * tce + sig2 * sig2 * tee;
        double nuVoxel = own > 0 ? nu * (s2 + sig2) * (s2 + sig2) / own : nu;
        double bias = nuVoxel > 1 ? Math.sqrt(nuVoxel / 2) * Math.exp(org.apache.commons.math3.special.Gamma.logGamma(
                (nuVoxel - 1) / 2) - org.apache.commons.math3.special.Gamma.logGamma(nuVoxel / 2)) : Double.NaN;
        double sfnr = sfnrMapMean / bias;
        Interval sfnrCi = new Interval(Double.NaN, Double.NaN);
        if (Double.isFinite(sfnr) && Double.isFinite(nuEff) && nuEff > 0) {
            // true variance between nuEff vbar / chi2(0.975) and nuEff vbar / chi2(0.025); SFNR goes as its -1/2 power
            double[] qv = chiQuantiles(nuEff);
            double vLow = nuEff * vbar / qv[1];
            double vHigh = nuEff * vbar / qv[0];
            sfnrCi = new Interval(sfnr * Math.sqrt(vbar / vHigh), sfnr * Math.sqrt(vbar / vLow));
        }
        if (corr.correlated() && Math.max(corr.neighbourX(), corr.neighbourY()) > 0.1) {
            warnings.add(new Warning("correlated_noise", String.format(Locale.ROOT, "neighbouring voxels' noise "
                    + "correlates (%.2f along x, %.2f along y in the temporal residuals): interpolation or k-space "
                    + "filtering; the intervals use an effective voxel count of %.0f of %d", corr.neighbourX(),
                    corr.neighbourY(), m / v2, m)));
        }
        if (tcc > 1.5 || tee > 1.5) {
            warnings.add(new Warning("slow_fluctuation", String.format(Locale.ROOT, "the residuals correlate from frame "
                    + "to frame (%s): slow physiological-like or thermal fluctuation; the SFNR interval counts %.0f "
                    + "effective frames of %d", tcc > tee ? "the region mean" : "each voxel", nuEff / 2 * 2, n)));
        }

        double snr = Double.NaN;
        Interval snrCi = new Interval(Double.NaN, Double.NaN);
        double staticSigma = Double.NaN;
        if (m >= 2) {
            // the static map's spatial variance: unbiased for correlated voxels with the divisor m - V1, and worth
            // (m - V1) / V2 degrees of freedom (the voxel noise's correlation, measured on the residuals, is the
            // map's: it sums the same voxels' frames)
            double v1s = v1;
            double nuS = Math.max(1.0, (m - v1s) / v2);
            staticVar /= m - v1s;
            staticSigma = Math.sqrt(staticVar / maps.staticFrames());
            // the headline is corrected for the bias of 1 / s (E[sigma / s] for nuS degrees of freedom)
            snr = signalMean / staticSigma / Math.sqrt(nuS / 2) / Math.exp(org.apache.commons.math3.special.Gamma
                    .logGamma((nuS - 1) / 2) - org.apache.commons.math3.special.Gamma.logGamma(nuS / 2));
            double[] qs = chiQuantiles(nuS);
            double lo = Math.sqrt(nuS * staticVar / qs[1] / maps.staticFrames());
            double hi = Math.sqrt(nuS * staticVar / qs[0] / maps.staticFrames());
            double seLogSignal = sd(regionSeries) / Math.sqrt(n) / Math.abs(signalMean);
            if (staticSigma > 0) {
                // the chi-square ends of the noise on the log scale, the (small) spread of the signal mean
                // added in quadrature to each end's distance
                double down = Math.log(hi / staticSigma);
                double up = Math.log(staticSigma / lo);
                double zs = Levels.Z95 * seLogSignal;
                snrCi = new Interval(snr * Math.exp(-Math.sqrt(down * down + zs * zs)),
                        snr * Math.exp(Math.sqrt(up * up + zs * zs)));
            }
        } else {
            warnings.add(new Warning("few_pixels", "a one-pixel region has no spatial variance: no static-noise SNR; "
                    + "use a larger region"));
        }

        double[] coef = trend.fit(regionSeries);
        double[] fit = trend.fitted(coef);
        double seriesMean = coef[0];
        double fluctuation = 100.0 * trend.residualSd(regionSeries) / seriesMean;
        double drift = SeriesNoise.drift(trend, coef[1], coef[2], seriesMean);
        // the coefficients' standard errors from the region-mean series' own AR(1) structure (white: sigma^2 / |b|^2)
        double gamma0 = arTrend.gamma0(Math.pow(trend.residualSd(regionSeries), 2));
        Interval driftCi = SeriesNoise.driftInterval(trend, coef[1], coef[2], seriesMean,
                Math.sqrt(gamma0 * arTrend.bRb1()) / trend.norm1(), Math.sqrt(gamma0 * arTrend.bRb2()) / trend.norm2(),
                Double.doubleToLongBits(seriesMean) ^ (31L * n + m));
        if (Double.isFinite(driftCi.low()) && driftCi.low() <= 0) {
            warnings.add(new Warning("drift_within_noise", String.format(Locale.ROOT, "the drift's 95%% interval "
                    + "(%.2g-%.2g%%) reaches 0: no drift can be told from the fluctuation of this series",
                    driftCi.low(), driftCi.high())));
        }
        double[] weisskoff = new double[side];
        for (int k = 0; k < side; k++) {
            double mk = trend.fit(squares[k])[0];
            weisskoff[k] = 100.0 * trend.residualSd(squares[k]) / mk;
        }
        double rdc = weisskoff[0] / weisskoff[side - 1];
        if (n < FEW_FRAMES) {
            warnings.add(new Warning("few_frames", String.format(Locale.ROOT, "only %d frames used: the SFNR, fluctuation "
                    + "and Weisskoff figures are imprecise (their SD is about %.0f%% of their value); 200 or more are usual",
                    n, 100.0 / Math.sqrt(2.0 * nu))));
        }
        if (!(seriesMean > 0)) {
            warnings.add(new Warning("no_signal", "the region's mean is not positive: the percent figures are "
                    + "meaningless; place the region on the phantom"));
        } else if (sfnrMapMean < IN_AIR_SFNR) {
            warnings.add(new Warning("region_in_air", String.format(Locale.ROOT, "the region's SFNR is %.2g, little "
                    + "more than pure noise gives (about 1.9 for a region in air, the mean over the SD of Rayleigh "
                    + "noise): the region lies in air or on very weak signal; place it on the phantom", sfnrMapMean)));
        }
        double[] residuals = new double[n];
        for (int t = 0; t < n; t++) {
            residuals[t] = regionSeries[t] - fit[t];
        }
        double[][] spectrum = spectrum(residuals, repetitionSeconds);
        return new StabilityResult(n, skip, side, m, signalMean, sfnr, sfnrCi, sfnrMapMean, snr, snrCi, staticSigma,
                fluctuation, drift, driftCi, weisskoff, rdc, regionSeries, fit, spectrum[0], spectrum[1], repetitionSeconds,
                warnings);
    }

    /** The voxels' own residuals' lag-1 correlation, pooled over the voxels kept. */
    private static double voxelLag1(double[][] resid, int n, int kept) {
        double num = 0;
        double den = 0;
        for (int t = 0; t < n; t++) {
            double[] a = resid[t];
            for (int j = 0; j < kept; j++) {
                den += a[j] * a[j];
                if (t + 1 < n) {
                    num += a[j] * resid[t + 1][j];
                }
            }
        }
        return den > 0 ? num / den : 0.0;
    }

    private static final java.util.concurrent.ConcurrentHashMap<Long, double[]> QUANTILES =
            new java.util.concurrent.ConcurrentHashMap<>();

    /**
     * The 2.5% and 97.5% quantiles of chi-square with {@code dof} degrees of freedom (Commons Math), kept
     * per dof rounded to 0.05% (a change of the interval far below its own uncertainty), so a series of
     * slices does not pay the inverse distribution function again and again.
     */
    static double[] chiQuantiles(double dof) {
        long key = Math.round(Math.log(dof) * 2000);
        return QUANTILES.computeIfAbsent(key, k -> {
            ChiSquaredDistribution c = new ChiSquaredDistribution(null, Math.exp(k / 2000.0));
            return new double[] {c.inverseCumulativeProbability(0.025), c.inverseCumulativeProbability(0.975)};
        });
    }

    private static double sd(double[] v) {
        double s = 0;
        for (double x : v) {
            s += x;
        }
        double mu = s / v.length;
        double ss = 0;
        for (double x : v) {
            ss += (x - mu) * (x - mu);
        }
        return Math.sqrt(ss / (v.length - 1));
    }

    /**
     * The power spectrum of a residual series (Commons Math's FFT, zero-padded to a power of two):
     * frequencies in Hz when the frame interval is known, else in cycles per frame; power
     * {@code |X_k|^2 / n}, from 0 to the Nyquist frequency.
     */
    static double[][] spectrum(double[] r, double repetitionSeconds) {
        int len = Integer.highestOneBit(Math.max(1, r.length - 1)) << 1;
        double[] padded = java.util.Arrays.copyOf(r, len);
        org.apache.commons.math3.complex.Complex[] x = new FastFourierTransformer(DftNormalization.STANDARD)
                .transform(padded, TransformType.FORWARD);
        int half = len / 2;
        double[] f = new double[half + 1];
        double[] p = new double[half + 1];
        double unit = Double.isFinite(repetitionSeconds) && repetitionSeconds > 0 ? 1.0 / repetitionSeconds : 1.0;
        for (int k = 0; k <= half; k++) {
            f[k] = unit * k / len;
            double a = x[k].abs();
            p[k] = a * a / r.length;
        }
        return new double[][] {f, p};
    }
}
