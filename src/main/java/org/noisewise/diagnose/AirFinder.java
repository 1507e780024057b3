package org.noisewise.diagnose;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.OrderStatistics;
import org.noisewise.estimate.Region;

/**
 * Automatic air: the pixels of a slice that hold only noise under the chi(2L) model, found without
 * hand-drawn regions, in the spirit of PIESNO (Koay, Ozarslan and Pierpaoli 2009, J Magn Reson
 * 199:94: noise-only pixels identified statistically, sigma and the selection iterated to
 * self-consistency), written for a single image of any channel count.
 *
 * <p>Every pixel's {@value #WINDOW} x {@value #WINDOW} window gives the mean of {@code M^2} over its
 * usable pixels; for pure noise that mean is {@code 2 L sigma^2 chi^2(2 L k) / (2 L k)} for
 * {@code k} pixels. Usable pixels leave out the image border ({@value #BORDER} pixels), exact zeros
 * (masked or zero-filled areas), clipped values (the storage maximum, or a plateau of the slice's
 * largest value) and the caller's excluded region (the signal region). With {@code e} the current
 * estimate of {@code 2 L sigma^2}, a window is noise-like when its mean lies between the
 * {@code 1e-5} and {@code 1 - 1e-5} quantiles of that law; windows above (the object, ghosts, any
 * structure) and below (attenuated or filtered areas) are marked, the marks (already reaching half a
 * window beyond the structure) widened by
 * {@value #MARGIN} pixels; a second test with {@value #WIDE} x {@value #WIDE} windows over the remaining
 * candidates alone (the bright object no longer in them) finds faint extended structure such as a
 * ghost, whose rise in {@code M^2} a small window cannot tell from noise at 8 channels; the air is the
 * candidates outside both tests' widened marks. {@code e} becomes the mean {@code M^2} of the air and the two steps repeat until
 * the selection no longer changes. Started from the 1st percentile of the window means (below the
 * truth), the iteration climbs to its fixed point, where the truncation at the upper quantile
 * removes a negligible part of the noise law.
 *
 * <p>The air is returned split by image quadrant (parts of at least {@value #MIN_PART} pixels), so
 * the region-agreement diagnostics still compare parts of the background.
 */
public final class AirFinder {

    /** How the iteration ended. */
    public enum Settling {
        /** The selection no longer changed. */
        FIXED_POINT,
        /** Two selections alternated; the pixels both take are used. */
        CYCLE,
        /** Still changing after {@link #MAX_ITERATIONS} iterations; the last selection is used. */
        NOT_SETTLED
    }

    /** Window side in pixels. */
    public static final int WINDOW = 7;
    /** Side of the second, wider window that finds faint extended structure (ghosts) among the candidates. */
    public static final int WIDE = 15;
    /** Pixels at the image edge never used. */
    public static final int BORDER = 2;
    /** Widening of the marks around structure, in pixels. */
    public static final int MARGIN = 3;
    /** Tail probability of the window test, each side. */
    public static final double TAIL = 1e-5;
    /** The least air accepted, in pixels. */
    public static final int MIN_PIXELS = 500;
    /** The least pixels of a quadrant's part. */
    public static final int MIN_PART = 50;
    /** The largest channel count the dispersion check allows when the count is not stated. */
    public static final int MAX_CHANNELS = 64;
    /** Iterations at most. */
    public static final int MAX_ITERATIONS = 30;

    private AirFinder() {
    }

    /**
     * @param mask       {@code true} for air pixels
     * @param regions    the air as regions, one per image quadrant that holds at least {@value #MIN_PART} pixels
     * @param pixels     air pixels
     * @param share      air pixels over all pixels of the slice
     * @param iterations iterations to self-consistency
     */
    public record Result(boolean[] mask, List<Region> regions, int pixels, double share, int iterations,
                         Settling settling) {
        public Result {
            regions = List.copyOf(regions);
        }
    }

    /**
     * Finds the air of one slice.
     *
     * @param pixels   calibrated values, row by row
     * @param channels L of the noise model, or 0 when unknown (the window test for 1 channel, the widest)
     * @param storage  how the values are stored (its maximum marks clipped values)
     * @param exclude  pixels never taken as air (e.g. the signal region), or null
     * @throws InputException when less than {@value #MIN_PIXELS} pixels of air are found, saying why
     */
    public static Result find(float[] pixels, int width, int height, int channels, BackgroundCheck.Storage storage,
                              Region exclude) throws InputException {
        int n = width * height;
        int stated = channels;
        channels = Math.max(1, channels);
        boolean[] usable = usable(pixels, width, height, storage, exclude);
        int k = WINDOW * WINDOW;
        int half = WINDOW / 2;
        // window sums of usable counts and of M^2 by integral images
        double[] m2 = new double[n];
        for (int i = 0; i < n; i++) {
            m2[i] = usable[i] ? (double) pixels[i] * pixels[i] : 0.0;
        }
        int[] counts = windowCounts(usable, width, height, half);
        double[] sums = windowSums(m2, width, height, half);
        int minCount = (k + 1) / 2;
        double[] mean = new double[n];
        double[] means = new double[n];
        int valid = 0;
        for (int i = 0; i < n; i++) {
            mean[i] = counts[i] >= minCount ? sums[i] / counts[i] : Double.NaN;
            if (usable[i] && counts[i] >= minCount) {
                means[valid++] = mean[i];
            }
        }
        if (valid < MIN_PIXELS) {
            throw tooLittle(pixels, usable, valid, n, "the slice holds too few usable pixels away from zeros, "
                    + "clipped values and the border");
        }
        double e = OrderStatistics.selectInPlace(Arrays.copyOf(means, valid), 0, valid - 1, (int) (0.01 * (valid - 1)));
        if (!(e > 0)) {
            e = OrderStatistics.selectInPlace(Arrays.copyOf(means, valid), 0, valid - 1, valid / 2);
        }
        double[][] q = quantiles(channels, k, minCount);
        int wideK = WIDE * WIDE;
        int wideMin = wideK / 4;
        double[][] wideQ = quantiles(channels, wideK, wideMin);
        boolean[] air = new boolean[n];
        boolean[] before = null;
        int iterations = 0;
        int count = 0;
        Settling settling = Settling.NOT_SETTLED;
        for (int it = 1; it <= MAX_ITERATIONS; it++) {
            iterations = it;
            boolean[] marked = new boolean[n];
            for (int i = 0; i < n; i++) {
                if (!Double.isNaN(mean[i])) {
                    int c = counts[i];
                    marked[i] = mean[i] > e * q[1][c] || mean[i] < e * q[0][c];
                }
            }
            int[] near = windowCounts(marked, width, height, MARGIN);
            boolean[] candidate = new boolean[n];
            for (int i = 0; i < n; i++) {
                candidate[i] = usable[i] && !Double.isNaN(mean[i]) && near[i] == 0;
            }
            // the wide window over the candidates only: faint extended structure the small window misses
            double[] cm2 = new double[n];
            for (int i = 0; i < n; i++) {
                cm2[i] = candidate[i] ? m2[i] : 0.0;
            }
            int[] wideCounts = windowCounts(candidate, width, height, WIDE / 2);
            double[] wideSums = windowSums(cm2, width, height, WIDE / 2);
            boolean[] wideMarked = new boolean[n];
            for (int i = 0; i < n; i++) {
                int c = wideCounts[i];
                if (candidate[i] && c >= wideMin) {
                    double m = wideSums[i] / c;
                    wideMarked[i] = m > e * wideQ[1][c] || m < e * wideQ[0][c];
                }
            }
            int[] wideNear = windowCounts(wideMarked, width, height, MARGIN);
            boolean[] next = new boolean[n];
            double sum = 0;
            int cnt = 0;
            for (int i = 0; i < n; i++) {
                if (candidate[i] && wideNear[i] == 0) {
                    next[i] = true;
                    sum += m2[i];
                    cnt++;
                }
            }
            boolean same = Arrays.equals(next, air);
            if (!same && before != null && Arrays.equals(next, before)) {
                // two selections alternate (a window on the edge of a quantile flips back and forth):
                // the pixels both take are air under either estimate
                sum = 0;
                cnt = 0;
                for (int i = 0; i < n; i++) {
                    next[i] &= air[i];
                    if (next[i]) {
                        sum += m2[i];
                        cnt++;
                    }
                }
                air = next;
                count = cnt;
                e = cnt > 0 ? sum / cnt : e;
                settling = Settling.CYCLE;
                break;
            }
            before = air;
            air = next;
            count = cnt;
            if (cnt == 0) {
                break;
            }
            double updated = sum / cnt;
            if (same || Math.abs(updated / e - 1) < 1e-9) {
                e = updated;
                settling = Settling.FIXED_POINT;
                break;
            }
            e = updated;
        }
        if (count < MIN_PIXELS) {
            throw tooLittle(pixels, usable, count, n, "the object (or structure such as ghosts) leaves too little "
                    + "air: the field of view may be filled by the object");
        }
        // pure noise of L channels has Var(M^2) / E[M^2]^2 = 1 / L; smooth object has far less
        double s1 = 0;
        double s2 = 0;
        for (int i = 0; i < n; i++) {
            if (air[i]) {
                s1 += m2[i];
                s2 += m2[i] * m2[i];
            }
        }
        double m = s1 / count;
        double dispersion = (s2 / count - m * m) / (m * m);
        double lowest = stated > 0 ? 0.5 / stated : 0.5 / MAX_CHANNELS;
        double highest = stated > 0 ? 2.0 / stated : 2.0;
        if (!(dispersion >= lowest && dispersion <= highest)) {
            throw tooLittle(pixels, usable, 0, n, String.format(Locale.ROOT, "the most uniform pixels do not spread as "
                    + "pure noise%s does (relative variance of M^2 %.3g, expected %s): the field of view may be filled "
                    + "by the object", stated > 0 ? " of " + stated + " channel" + (stated == 1 ? "" : "s") : "",
                    dispersion, stated > 0 ? String.format(Locale.ROOT, "%.3g", 1.0 / stated)
                            : String.format(Locale.ROOT, "1/L, at least %.3g", 1.0 / MAX_CHANNELS)));
        }
        return new Result(air, quadrants(air, width, height), count, (double) count / n, iterations, settling);
    }

    private static final java.util.concurrent.ConcurrentHashMap<Long, double[][]> QUANTILES =
            new java.util.concurrent.ConcurrentHashMap<>();

    /** {lower, upper} quantiles ({@link #TAIL}) of a window mean of pure noise, relative to its expectation, by pixel count. */
    private static double[][] quantiles(int channels, int k, int minCount) {
        return QUANTILES.computeIfAbsent(((long) channels << 40) | ((long) k << 20) | minCount,
                key -> computeQuantiles(channels, k, minCount));
    }

    private static double[][] computeQuantiles(int channels, int k, int minCount) {
        double[][] q = new double[2][k + 1];
        for (int c = minCount; c <= k; c++) {
            double dof = 2.0 * channels * c;
            ChiSquaredDistribution chi = new ChiSquaredDistribution(null, dof, 1e-12);
            q[0][c] = chi.inverseCumulativeProbability(TAIL) / dof;
            q[1][c] = chi.inverseCumulativeProbability(1 - TAIL) / dof;
        }
        return q;
    }

    /** Pixels that may be air at all: inside the border, finite, not zero, not clipped, not excluded. */
    static boolean[] usable(float[] px, int width, int height, BackgroundCheck.Storage storage, Region exclude) {
        int n = width * height;
        boolean[] ok = new boolean[n];
        double clip = clipLevel(px, storage);
        for (int y = BORDER; y < height - BORDER; y++) {
            for (int x = BORDER; x < width - BORDER; x++) {
                int i = y * width + x;
                float v = px[i];
                ok[i] = Float.isFinite(v) && v != 0f && v < clip;
            }
        }
        if (exclude != null) {
            for (int i : exclude.indices()) {
                ok[i] = false;
            }
        }
        return ok;
    }

    /** Values at or above this are clipped: the storage maximum, or a plateau of the slice's largest value. */
    static double clipLevel(float[] px, BackgroundCheck.Storage storage) {
        double clip = storage != null && Double.isFinite(storage.maximum()) && storage.maximum() > 0
                ? storage.maximum() : Double.POSITIVE_INFINITY;
        float max = Float.NEGATIVE_INFINITY;
        for (float v : px) {
            if (v > max) {
                max = v;
            }
        }
        int atMax = 0;
        for (float v : px) {
            atMax += v == max ? 1 : 0;
        }
        // a continuous maximum is hit once; many pixels at exactly the largest value are a clipped plateau
        if (atMax >= 10 && max < clip) {
            clip = max;
        }
        return clip;
    }

    private static int[] windowCounts(boolean[] in, int width, int height, int half) {
        double[] v = new double[in.length];
        for (int i = 0; i < v.length; i++) {
            v[i] = in[i] ? 1 : 0;
        }
        double[] s = windowSums(v, width, height, half);
        int[] out = new int[s.length];
        for (int i = 0; i < s.length; i++) {
            out[i] = (int) Math.round(s[i]);
        }
        return out;
    }

    /** Sums over the (2 half + 1)^2 window centred on each pixel, clipped at the edges (summed-area table). */
    private static double[] windowSums(double[] v, int width, int height, int half) {
        int w1 = width + 1;
        double[] t = new double[w1 * (height + 1)];
        for (int y = 0; y < height; y++) {
            double row = 0;
            for (int x = 0; x < width; x++) {
                row += v[y * width + x];
                t[(y + 1) * w1 + x + 1] = t[y * w1 + x + 1] + row;
            }
        }
        double[] out = new double[v.length];
        for (int y = 0; y < height; y++) {
            int y0 = Math.max(0, y - half);
            int y1 = Math.min(height, y + half + 1);
            for (int x = 0; x < width; x++) {
                int x0 = Math.max(0, x - half);
                int x1 = Math.min(width, x + half + 1);
                out[y * width + x] = t[y1 * w1 + x1] - t[y0 * w1 + x1] - t[y1 * w1 + x0] + t[y0 * w1 + x0];
            }
        }
        return out;
    }

    private static List<Region> quadrants(boolean[] air, int width, int height) {
        String[] names = {"air (automatic, top left)", "air (automatic, top right)", "air (automatic, bottom left)",
            "air (automatic, bottom right)"};
        List<List<Integer>> parts = new ArrayList<>();
        for (int q = 0; q < 4; q++) {
            parts.add(new ArrayList<>());
        }
        for (int y = 0; y < height; y++) {
            for (int x = 0; x < width; x++) {
                int i = y * width + x;
                if (air[i]) {
                    parts.get((y < height / 2 ? 0 : 2) + (x < width / 2 ? 0 : 1)).add(i);
                }
            }
        }
        List<Region> out = new ArrayList<>();
        List<Integer> small = new ArrayList<>();
        for (int q = 0; q < 4; q++) {
            if (parts.get(q).size() >= MIN_PART) {
                out.add(new Region(names[q], parts.get(q).stream().mapToInt(Integer::intValue).toArray()));
            } else {
                small.addAll(parts.get(q));
            }
        }
        if (!small.isEmpty()) {
            if (out.isEmpty()) {
                out.add(new Region("air (automatic)", small.stream().mapToInt(Integer::intValue).sorted().toArray()));
            } else {
                // a quadrant too small to stand alone joins the largest part
                Region big = out.get(0);
                for (Region r : out) {
                    if (r.indices().length > big.indices().length) {
                        big = r;
                    }
                }
                int[] merged = java.util.stream.IntStream.concat(Arrays.stream(big.indices()),
                        small.stream().mapToInt(Integer::intValue)).sorted().toArray();
                out.set(out.indexOf(big), new Region(big.name(), merged));
            }
        }
        return out;
    }

    private static InputException tooLittle(float[] px, boolean[] usable, int found, int n, String reason) {
        int zeros = 0;
        for (float v : px) {
            zeros += v == 0f ? 1 : 0;
        }
        String why = zeros > 0.2 * n ? String.format(Locale.ROOT, "the background is masked or zero-filled (%.0f%% of "
                + "the pixels are exactly 0)", 100.0 * zeros / n) : reason;
        return new InputException(String.format(Locale.ROOT, "automatic air found only %d pixels of pure noise "
                + "(%.1f%% of the slice; at least %d are needed): %s. Mark background regions in air by hand, or use "
                + "the difference method (two acquisitions)", found, 100.0 * found / n, MIN_PIXELS, why));
    }

    /**
     * How far {@code u = mean(M^4) / mean(M^2)^2} of {@code n} pixels lies from its chi(2L) value
     * {@code (L + 1) / L} ({@code M^2} is Gamma with shape L), in standard errors (delta method on the
     * Gamma moments): faint signal makes it smaller, a mixture of levels larger.
     */
    static double kurtosisZ(double u, int n, int channels) {
        double l = channels;
        double m1 = l;
        double m2 = l * (l + 1);
        double m3 = l * (l + 1) * (l + 2);
        double m4 = l * (l + 1) * (l + 2) * (l + 3);
        double expected = m2 / (m1 * m1);
        double da = -2 * m2 / (m1 * m1 * m1);
        double db = 1 / (m1 * m1);
        double var = (da * da * (m2 - m1 * m1) + db * db * (m4 - m2 * m2) + 2 * da * db * (m3 - m1 * m2)) / n;
        return (u - expected) / Math.sqrt(var);
    }

    /** Pure noise louder than the air's, found in blocks the selection left out. */
    public record Louder(int blocks, double ratio) {
    }

    /** The {@code noise_varies} reason for louder noise outside the air. */
    public static org.noisewise.estimate.Warning louderWarning(Louder l) {
        return new org.noisewise.estimate.Warning("noise_varies", String.format(Locale.ROOT, "%d blocks of 16x16 "
                + "pixels away from the air found spread like pure noise at up to %.2f times the air's sigma: noise "
                + "varies over the image (parallel imaging, filters, coil sensitivity), or a faint ghost lies there, so "
                + "the air's sigma may not be the signal region's; measure with a noise-only scan, or acquire twice "
                + "for the difference method",
                l.blocks(), l.ratio()));
    }

    /** Blocks counted as louder noise: at least this many. */
    public static final int LOUDER_BLOCKS = 2;
    /** Louder by more than this factor of the air's sigma. */
    public static final double LOUDER_RATIO = 1.3;

    /**
     * Whether noise varies over the slice where the air cannot show it: the {@value NoiseScan#BLOCK}-pixel
     * blocks holding no air, no excluded pixel and no zero whose values spread as pure chi(2L) noise does
     * (the scale-free statistic of {@link NoiseScan} and {@code mean(M^4) / mean(M^2)^2} each within 3
     * standard errors of its null value; the object and ghosts are less spread, mixtures of levels more) but at a sigma more than {@value #LOUDER_RATIO} times the
     * air's. Parallel imaging, filters and coil sensitivity raise the noise in air the window test then
     * takes for structure.
     *
     * @return the louder blocks (at least {@value #LOUDER_BLOCKS}) and the largest ratio, or null
     */
    public static Louder louderNoise(float[] pixels, int width, int height, boolean[] air, int channels,
                                     Region exclude) {
        boolean[] ex = new boolean[pixels.length];
        if (exclude != null) {
            for (int i : exclude.indices()) {
                ex[i] = true;
            }
        }
        double airSum = 0;
        int airCount = 0;
        for (int i = 0; i < pixels.length; i++) {
            if (air[i]) {
                airSum += (double) pixels[i] * pixels[i];
                airCount++;
            }
        }
        if (airCount == 0) {
            return null;
        }
        double airMeanSquare = airSum / airCount;
        int count = 0;
        double worst = 0;
        for (int[] b : NoiseScan.blocks(width, height)) {
            double s1 = 0;
            double s2 = 0;
            double s4 = 0;
            int n = 0;
            boolean skip = false;
            for (int y = b[1]; y < b[1] + b[3] && !skip; y++) {
                for (int x = b[0]; x < b[0] + b[2]; x++) {
                    int i = y * width + x;
                    if (air[i] || ex[i] || !(pixels[i] > 0)) {
                        skip = true;
                        break;
                    }
                    double m2 = (double) pixels[i] * pixels[i];
                    s1 += pixels[i];
                    s2 += m2;
                    s4 += m2 * m2;
                    n++;
                }
            }
            if (skip || n < NoiseScan.BLOCK * NoiseScan.BLOCK / 2) {
                continue;
            }
            double a = s1 / n;
            double q = s2 / n;
            double z = NoiseScan.structureZ(new double[] {a * a / q, n}, channels, 1.0);
            double zk = kurtosisZ(s4 / n / (q * q), n, channels);
            double ratio = Math.sqrt(q / airMeanSquare);
            if (Math.abs(z) < 3 && Math.abs(zk) < 3 && ratio > LOUDER_RATIO) {
                count++;
                worst = Math.max(worst, ratio);
            }
        }
        return count >= LOUDER_BLOCKS ? new Louder(count, worst) : null;
    }
}
