package org.noisewise.estimate;

import java.util.List;

/**
 * How many independent samples a region is worth when its noise is spatially correlated
 * (interpolation, k-space zero-filling, reconstruction filters).
 *
 * <p>For a stationary field with correlation {@code rho(h)} over 2-D lags {@code h}, the mean of a
 * quantity {@code q} over a region of {@code n} pixels has variance {@code Var(q) V / n} with
 * {@code V = sum_h (N_h / n) rho_q(h)}, where {@code N_h} counts the pixel pairs at lag {@code h} inside
 * the region (references.md, section 9; the pair weights make edge effects exact). {@code V} is the
 * variance inflation: the region is worth {@code n / V} independent pixels for that statistic. Two
 * estimates of it are formed:
 * <ul>
 *   <li><b>Linear</b> ({@link Result#linear()}): the sum of the measured correlations of {@code q}
 *       itself over {@code |h_x|, |h_y| <=} {@value #WINDOW}. Removing the region mean biases every
 *       measured correlation by about {@code -V / n_m} ({@code n_m} the pixels the mean came from), so
 *       the raw sum {@code S} over a window of weight {@code F = sum_h N_h / n} is corrected to
 *       {@code V = S n_m / (n_m - F + S)}. Used for means, and in the background for each estimator's
 *       own influence quantity ({@code M^2} for maximum likelihood, {@code M} for the mean,
 *       {@code (M - mean)^2} for the SD, the indicator {@code M < median} for the median).</li>
 *   <li><b>Squared</b> ({@link Result#squared()}): for Gaussian noise the sample variance's inflation is
 *       {@code sum_h (N_h / n) rho(h)^2}; squaring the measured correlations over
 *       {@code |h| <=} {@value #SQUARE_WINDOW}, each corrected for the mean removal, and subtracting the
 *       sampling noise every squared estimate carries ({@code E[rho_hat^2] = rho^2 + V_2 / N_h},
 *       Bartlett's formula) gives {@code V_2 = S_2 / (1 + (W - 1) / n)} with {@code W} the number of lags.
 *       Far less noisy than correlating the squares themselves; used for the difference image and the
 *       temporal residuals of repeated acquisitions.</li>
 * </ul>
 * Both are 1 unless the neighbour correlation along x or y exceeds twice its standard error, so white
 * noise keeps its full count; they never fall below 1. A linear sum of {@code W} measured
 * correlations is itself uncertain, with a relative variance of about {@code 2W / n}; the intervals
 * allow for it as a t quantile allows for an estimated variance (with {@code nu = n / W} degrees of
 * freedom, {@code t ~ z (1 + (z^2 + 1) / 4nu)}), so the linear inflation includes the factor
 * {@code (1 + (z^2 + 1) W / 4n)^2}. The squared sums are far less noisy and need none. They are reliable when each region is many
 * correlation lengths wide (a correlation reaching beyond the window is cut off, and a region only a
 * few windows wide leaves the bias correction approximate). Regions with more than
 * {@value #MAX_ANCHORS} pixels are subsampled: every pixel stays a partner, a regular subset serves as
 * the first pixel of each pair.
 */
public final class SpatialCorrelation {

    /** Half-width of the lag window of linear sums. */
    public static final int WINDOW = 3;
    /** Half-width of the lag window of squared sums. */
    public static final int SQUARE_WINDOW = 6;
    /** At most this many first pixels of pairs per region. */
    public static final int MAX_ANCHORS = 1 << 18;

    private SpatialCorrelation() {
    }

    /** A region as a raster: its bounding box in the plane and which box pixels belong to it. */
    public static final class Patch {
        private final int x0;
        private final int y0;
        private final int w;
        private final int h;
        private final boolean[] in;
        private final int n;

        Patch(int x0, int y0, int w, int h, boolean[] in, int n) {
            this.x0 = x0;
            this.y0 = y0;
            this.w = w;
            this.h = h;
            this.in = in;
            this.n = n;
        }

        public int w() {
            return w;
        }

        public int h() {
            return h;
        }

        /** The pixels of the region. */
        public int n() {
            return n;
        }

        /** Membership of the box's pixels (the patch's own array, not a copy). */
        boolean[] in() {
            return in;
        }

        /** The patch of {@code region} in a plane {@code width} pixels wide. */
        public static Patch of(Region region, int width) {
            int[] idx = region.indices();
            int minX = Integer.MAX_VALUE;
            int minY = Integer.MAX_VALUE;
            int maxX = -1;
            int maxY = -1;
            for (int i : idx) {
                int x = i % width;
                int y = i / width;
                minX = Math.min(minX, x);
                maxX = Math.max(maxX, x);
                minY = Math.min(minY, y);
                maxY = Math.max(maxY, y);
            }
            int w = Math.max(0, maxX - minX + 1);
            int h = Math.max(0, maxY - minY + 1);
            boolean[] in = new boolean[w * h];
            int n = 0;
            for (int i : idx) {
                int k = (i / width - minY) * w + (i % width - minX);
                if (!in[k]) {
                    in[k] = true;
                    n++;
                }
            }
            return new Patch(minX, minY, w, h, in, n);
        }

        /**
         * The region's pixels in box order: {@code [0]} their indices in a plane {@code width} wide,
         * {@code [1]} their positions in the box.
         */
        public int[][] members(int width) {
            int[] plane = new int[n];
            int[] box = new int[n];
            int k = 0;
            for (int y = 0; y < h; y++) {
                for (int x = 0; x < w; x++) {
                    if (in[y * w + x]) {
                        plane[k] = (y0 + y) * width + x0 + x;
                        box[k++] = y * w + x;
                    }
                }
            }
            return new int[][] {plane, box};
        }

        /** The patch-local values of a plane. */
        public double[] sample(float[] plane, int width) {
            double[] out = new double[w * h];
            for (int y = 0; y < h; y++) {
                int row = (y0 + y) * width + x0;
                for (int x = 0; x < w; x++) {
                    if (in[y * w + x]) {
                        out[y * w + x] = plane[row + x];
                    }
                }
            }
            return out;
        }
    }

    /** The correlation summary of one quantity. */
    public record Result(double neighbourX, double neighbourY, double lag2X, double lag2Y, boolean correlated,
                         double linear, double squared, long pixels) {
        /** White noise: inflation 1. */
        public static Result white(long pixels) {
            return new Result(0, 0, 0, 0, false, 1.0, 1.0, pixels);
        }

        /** {@code n / linear}: the independent pixels behind a mean. */
        public double effectiveForMean(double n) {
            return n / linear;
        }

        /** {@code n / squared}: the independent pixels behind a variance of Gaussian values. */
        public double effectiveForVariance(double n) {
            return n / squared;
        }
    }

    /**
     * Pair sums over lags of the half window {@code {(hx, 0): hx = 1..k} and {(hx, hy): hy = 1..k, |hx| <= k}},
     * accumulated over patches and planes.
     */
    public static final class LagSums {
        private final int k;
        private final int[] lagX;
        private final int[] lagY;
        private final double[] products;
        private final long[] pairs;
        private double squares;
        private long count;
        /** The last patch whose every-pixel pair counts were computed, and those counts per lag. */
        private Patch counted;
        private long[] countedPairs;

        public LagSums(int halfWidth) {
            this.k = halfWidth;
            int lags = halfWidth * (2 * halfWidth + 2);
            lagX = new int[lags];
            lagY = new int[lags];
            int l = 0;
            for (int hx = 1; hx <= halfWidth; hx++) {
                lagX[l] = hx;
                lagY[l++] = 0;
            }
            for (int hy = 1; hy <= halfWidth; hy++) {
                for (int hx = -halfWidth; hx <= halfWidth; hx++) {
                    lagX[l] = hx;
                    lagY[l++] = hy;
                }
            }
            products = new double[lags];
            pairs = new long[lags];
        }

        /**
         * Adds the pairs of one patch.
         *
         * @param q    patch-local values of the quantity ({@code p.w() * p.h()})
         * @param mean the value subtracted from every {@code q}
         */
        public void add(Patch p, double[] q, double mean) {
            int w = p.w();
            int h = p.h();
            boolean[] in = p.in();
            int stride = p.n() > MAX_ANCHORS ? (int) Math.ceil((double) p.n() / MAX_ANCHORS) : 1;
            if (stride == 1) {
                addEvery(p, q, mean);
                return;
            }
            int seen = 0;
            for (int y = 0; y < h; y++) {
                for (int x = 0; x < w; x++) {
                    int a = y * w + x;
                    if (!in[a] || (stride > 1 && seen++ % stride != 0)) {
                        continue;
                    }
                    double da = q[a] - mean;
                    squares += da * da;
                    count++;
                    for (int l = 0; l < lagX.length; l++) {
                        int xx = x + lagX[l];
                        int yy = y + lagY[l];
                        if (xx < 0 || xx >= w || yy >= h) {
                            continue;
                        }
                        int b = yy * w + xx;
                        if (in[b]) {
                            products[l] += da * (q[b] - mean);
                            pairs[l]++;
                        }
                    }
                }
            }
        }

        /**
         * Every pixel of the patch as an anchor, lag by lag over whole rows: the same sums as the
         * pixel-by-pixel loop, in simple loops without branches (deviations are 0 outside the region).
         * The pair counts depend on the patch alone: they are counted once (the product of the
         * membership masks) and reused while the same patch is added again, e.g. frame after frame.
         */
        private void addEvery(Patch p, double[] q, double mean) {
            int w = p.w();
            int h = p.h();
            boolean[] in = p.in();
            int n = w * h;
            double[] d = new double[n];
            for (int a = 0; a < n; a++) {
                if (in[a]) {
                    double da = q[a] - mean;
                    d[a] = da;
                    squares += da * da;
                    count++;
                }
            }
            if (counted != p) {
                countedPairs = pairCounts(p);
                counted = p;
            }
            for (int l = 0; l < lagX.length; l++) {
                int hx = lagX[l];
                int hy = lagY[l];
                int xs = Math.max(0, -hx);
                int xe = Math.min(w, w - hx);
                // four running sums: independent additions the processor overlaps (one sum waits on each add)
                double p0 = 0;
                double p1 = 0;
                double p2 = 0;
                double p3 = 0;
                for (int y = 0; y + hy < h; y++) {
                    int rowA = y * w;
                    int rowB = (y + hy) * w + hx;
                    int x = xs;
                    for (; x + 3 < xe; x += 4) {
                        p0 += d[rowA + x] * d[rowB + x];
                        p1 += d[rowA + x + 1] * d[rowB + x + 1];
                        p2 += d[rowA + x + 2] * d[rowB + x + 2];
                        p3 += d[rowA + x + 3] * d[rowB + x + 3];
                    }
                    for (; x < xe; x++) {
                        p0 += d[rowA + x] * d[rowB + x];
                    }
                }
                products[l] += (p0 + p1) + (p2 + p3);
                pairs[l] += countedPairs[l];
            }
        }

        /** The pairs of region pixels at each lag within a patch. */
        private long[] pairCounts(Patch p) {
            int w = p.w();
            int h = p.h();
            boolean[] in = p.in();
            int[] m = new int[w * h];
            for (int a = 0; a < m.length; a++) {
                m[a] = in[a] ? 1 : 0;
            }
            long[] out = new long[lagX.length];
            for (int l = 0; l < lagX.length; l++) {
                int hx = lagX[l];
                int hy = lagY[l];
                int xs = Math.max(0, -hx);
                int xe = Math.min(w, w - hx);
                long cnt = 0;
                for (int y = 0; y + hy < h; y++) {
                    int rowA = y * w;
                    int rowB = (y + hy) * w + hx;
                    for (int x = xs; x < xe; x++) {
                        cnt += m[rowA + x] & m[rowB + x];
                    }
                }
                out[l] = cnt;
            }
            return out;
        }

        /** Adds the same patch's pairs for values given as a plane. */
        public void add(Patch p, float[] plane, int width, double mean) {
            add(p, p.sample(plane, width), mean);
        }

        /** The correlation at each lag (half window, in the order of construction). */
        double[] correlations() {
            double var = count > 0 ? squares / count : 0;
            double[] rho = new double[products.length];
            for (int l = 0; l < rho.length; l++) {
                rho[l] = pairs[l] > 0 && var > 0 ? products[l] / pairs[l] / var : 0.0;
            }
            return rho;
        }

        private int index(int hx, int hy) {
            return hy == 0 ? hx - 1 : k + (hy - 1) * (2 * k + 1) + (hx + k);
        }

        /** Correlation at lag {@code (hx, hy)} with {@code hy > 0}, or {@code hy = 0, hx > 0}. */
        public double at(int hx, int hy) {
            return correlations()[index(hx, hy)];
        }

        /** Whether the neighbour correlation along x or y exceeds twice its standard error. */
        public boolean neighboursCorrelate() {
            double[] rho = correlations();
            int x = index(1, 0);
            int y = index(0, 1);
            return (pairs[x] > 0 && rho[x] > 2.0 / Math.sqrt(pairs[x]))
                    || (pairs[y] > 0 && rho[y] > 2.0 / Math.sqrt(pairs[y]));
        }

        /**
         * The linear sum over the window of half-width {@code kk <= k}, corrected for the mean having been
         * estimated from {@code meanPixels} values (0: the mean was known).
         */
        public double linear(int kk, double meanPixels) {
            double[] rho = correlations();
            double s = 1.0;
            double f = 1.0;
            for (int l = 0; l < rho.length; l++) {
                if (Math.abs(lagX[l]) <= kk && lagY[l] <= kk) {
                    double weight = (double) pairs[l] / count;
                    s += 2 * weight * rho[l];
                    f += 2 * weight;
                }
            }
            if (meanPixels > 0) {
                double denominator = meanPixels - f + s;
                s = denominator > 0 ? s * meanPixels / denominator : s;
            }
            return s;
        }

        /** The squared (Gaussian) sum over the whole window, see the class description. */
        public double squared(double meanPixels) {
            double[] rho = correlations();
            double bias = meanPixels > 0 ? linear(Math.min(k, WINDOW), meanPixels) / meanPixels : 0.0;
            double s = 1.0;
            for (int l = 0; l < rho.length; l++) {
                double r = rho[l] * (1 - bias) + bias;
                s += 2 * ((double) pairs[l] / count) * r * r;
            }
            double lags = (2.0 * k + 1) * (2.0 * k + 1);
            return s / (1.0 + (lags - 1) / count);
        }

        public long count() {
            return count;
        }

        /** The widening for the uncertainty of a linear sum over the window (see the class description). */
        double allowance() {
            int kk = Math.min(k, WINDOW);
            double lags = (2.0 * kk + 1) * (2.0 * kk + 1);
            double z2 = Levels.Z95 * Levels.Z95;
            double factor = 1.0 + (z2 + 1.0) * lags / (4.0 * Math.max(count, 1));
            return factor * factor;
        }

        /**
         * The summary: neighbour correlations, and the two inflations (1 unless neighbours correlate).
         *
         * @param meanPixels pixels the subtracted mean came from, 0 when it was known
         */
        public Result result(double meanPixels) {
            double[] rho = correlations();
            boolean correlated = neighboursCorrelate();
            double lin = correlated ? Math.max(1.0, linear(Math.min(k, WINDOW), meanPixels)) * allowance() : 1.0;
            double sq = correlated && k >= SQUARE_WINDOW ? Math.max(1.0, squared(meanPixels)) : lin;
            return new Result(rho[index(1, 0)], rho[index(0, 1)], k >= 2 ? rho[index(2, 0)] : 0,
                    k >= 2 ? rho[index(0, 2)] : 0, correlated, lin, sq, count);
        }
    }

    /**
     * The correlation of a plane's values over one region (its own mean removed): for Gaussian-like
     * values such as a difference image, with both the linear and the squared inflation.
     */
    public static Result ofValues(float[] plane, int width, Region region) {
        Patch p = Patch.of(region, width);
        double[] q = p.sample(plane, width);
        double mean = mean(p, q);
        LagSums sums = new LagSums(SQUARE_WINDOW);
        sums.add(p, q, mean);
        return sums.result(p.n());
    }

    /** Mean of a patch's values. */
    static double mean(Patch p, double[] q) {
        double s = 0;
        boolean[] in = p.in();
        for (int i = 0; i < q.length; i++) {
            if (in[i]) {
                s += q[i];
            }
        }
        return p.n() > 0 ? s / p.n() : 0.0;
    }

    /** Patches of several regions. */
    public static List<Patch> patches(List<Region> regions, int width) {
        return regions.stream().map(r -> Patch.of(r, width)).toList();
    }
}
