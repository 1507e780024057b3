package org.noisewise.estimate;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.DoubleConsumer;
import org.apache.commons.math3.special.Gamma;

/**
 * The repeated-acquisition (multiple-acquisition) method: {@code K >= 2} identical acquisitions of
 * one slice give, pixel by pixel, a temporal mean, a temporal SD (divisor {@code K - 1}) and their
 * ratio, an SNR map. It is the reference against which Dietrich et al. (2007, JMRI 26:375) judged
 * the other methods, and it stays valid with parallel imaging, filters and array coils because it
 * measures noise where it is, not in the background.
 *
 * <p>Region summary: {@code S} = region mean of the mean map, {@code sigma = sqrt(region mean of the
 * per-pixel variances)} (pooled, {@code n (K-1)} degrees of freedom, exact chi-square interval for
 * independent pixels). The mean of the SNR map over a region is not used: {@code 1/s} is biased
 * for small K, {@code E[1/s] = (1/sigma) b(K)} with
 * {@code b(K) = sqrt((K-1)/2) Gamma((K-2)/2) / Gamma((K-1)/2)} (the reciprocal chi mean), so the
 * mean SNR-map value is about {@code b(K)} times too high: 1.77 for K = 3, 1.05 for K = 16, and
 * infinite in expectation for K = 2.
 *
 * <p>The maps are computed in one pass over the frames per pixel (Welford's update), rows in
 * parallel on every core, with no per-pixel object allocation.
 */
public final class RepeatedAcquisitions {

    private RepeatedAcquisitions() {
    }

    /**
     * Mean, SD and SNR maps of one slice. The arrays are the maps themselves (not copies: they are as
     * large as the image, and the maps own them); whoever receives the maps may hand them on, e.g. as
     * the pixels of new images.
     */
    public static final class Maps {
        private final int width;
        private final int height;
        private final int repeats;
        private final float[] mean;
        private final float[] sd;
        private final float[] snr;

        public Maps(int width, int height, int repeats, float[] mean, float[] sd, float[] snr) {
            this.width = width;
            this.height = height;
            this.repeats = repeats;
            this.mean = mean;
            this.sd = sd;
            this.snr = snr;
        }

        public int width() {
            return width;
        }

        public int height() {
            return height;
        }

        public int repeats() {
            return repeats;
        }

        public float[] mean() {
            return mean;
        }

        public float[] sd() {
            return sd;
        }

        public float[] snr() {
            return snr;
        }
    }

    /**
     * Computes the maps from calibrated float frames.
     *
     * @param frames   K frames of {@code width * height} calibrated values
     * @param progress receives the fraction done (0..1), from any thread; may be {@code null}
     */
    public static Maps maps(float[][] frames, int width, int height, DoubleConsumer progress) throws InputException {
        return maps(frames, width, height, 0.0, 1.0, null, progress);
    }

    /** Pixels per tile: the tile's sums and shifts stay in the first-level cache while the frames stream past. */
    static final int TILE = 8192;
    private static final ThreadLocal<Scratch> SCRATCH = ThreadLocal.withInitial(Scratch::new);

    /** Per-thread sums of one tile: whole numbers for integer data (exact, faster), doubles otherwise. */
    private static final class Scratch {
        final double[] base = new double[TILE];
        final double[] s1 = new double[TILE];
        final double[] s2 = new double[TILE];
        final int[] ibase = new int[TILE];
        final int[] is1 = new int[TILE];
        final long[] ls2 = new long[TILE];
    }

    /**
     * Computes the maps straight from stored frames, without converting them: each frame is a
     * {@code byte[]} (unsigned 8-bit), {@code short[]} (unsigned 16-bit) or {@code float[]} array of
     * stored values, and {@code calibrated = offset + slope * stored} (or {@code table[stored]} for 8-
     * and 16-bit data with a non-linear calibration table).
     *
     * <p>One streaming pass per tile of {@value #TILE} pixels: for each frame, the deviation from the
     * tile's first frame {@code d = x - x_0} is added to a sum and a sum of squares. For integer data
     * both sums are exact (whole numbers below 2^53), and the shift removes the cancellation of
     * {@code E[x^2] - E[x]^2} for any data; then {@code mean = x_0 + sum d / K} and
     * {@code var = (sum d^2 - (sum d)^2 / K) / (K - 1)}, with the linear calibration applied to the
     * results ({@code mean * slope + offset}, {@code sd * |slope|}). Tiles run in parallel on
     * Noisewise's workers, whose scratch sums are kept per thread, so a call allocates only its three
     * output maps.
     */
    public static Maps maps(Object[] frames, int width, int height, double offset, double slope, float[] table,
                            DoubleConsumer progress) throws InputException {
        int k = frames.length;
        if (k < 2) {
            throw new InputException("the repeated-acquisition method needs at least 2 repeats of the slice; got "
                    + k + ": choose a stack or a time series of repeated acquisitions");
        }
        int size = width * height;
        for (int f = 0; f < k; f++) {
            int len = frames[f] instanceof float[] a ? a.length : frames[f] instanceof short[] b ? b.length
                    : frames[f] instanceof byte[] c ? c.length : -1;
            if (len < 0) {
                throw new IllegalArgumentException("frame " + (f + 1) + " is not byte[], short[] or float[]");
            }
            if (len != size) {
                throw new InputException("repeat " + (f + 1) + " has " + len + " pixels, not " + size
                        + ": every repeat must have the same matrix");
            }
        }
        float[] mean = new float[size];
        float[] sd = new float[size];
        float[] snr = new float[size];
        int tiles = (size + TILE - 1) / TILE;
        AtomicInteger done = new AtomicInteger();
        int step = Math.max(1, tiles / 50);
        double scale = Math.abs(slope);
        // integer data without a table: whole-number sums (sum d fits an int for fewer than 32768 frames)
        boolean whole = table == null && !(frames[0] instanceof float[]) && k < 32768;
        Blocks.tasks(tiles, t -> {
            int from = t * TILE;
            int n = Math.min(TILE, size - from);
            Scratch sc = SCRATCH.get();
            double[] base = sc.base;
            double[] s1 = sc.s1;
            double[] s2 = sc.s2;
            if (whole) {
                wholeSums(frames, from, n, sc);
            } else {
                load(frames[0], table, from, n, base);
                java.util.Arrays.fill(s1, 0, n, 0.0);
                java.util.Arrays.fill(s2, 0, n, 0.0);
                for (int f = 1; f < k; f++) {
                    accumulate(frames[f], table, from, n, base, s1, s2);
                }
            }
            for (int j = 0; j < n; j++) {
                double m = base[j] + s1[j] / k;
                double var = Math.max(0.0, (s2[j] - s1[j] * s1[j] / k) / (k - 1));
                double sdev = Math.sqrt(var) * (table == null ? scale : 1.0);
                double calibrated = table == null ? offset + slope * m : m;
                mean[from + j] = (float) calibrated;
                sd[from + j] = (float) sdev;
                snr[from + j] = sdev > 0 ? (float) (calibrated / sdev) : Float.NaN;
            }
            int d = done.incrementAndGet();
            if (progress != null && d % step == 0) {
                progress.accept((double) d / tiles);
            }
        });
        if (progress != null) {
            progress.accept(1.0);
        }
        return new Maps(width, height, k, mean, sd, snr);
    }

    /** Exact whole-number sums of deviations of 8- or 16-bit frames, left as doubles in the scratch. */
    private static void wholeSums(Object[] frames, int from, int n, Scratch sc) {
        int[] b = sc.ibase;
        int[] s1 = sc.is1;
        long[] s2 = sc.ls2;
        if (frames[0] instanceof short[] first) {
            for (int j = 0; j < n; j++) {
                b[j] = first[from + j] & 0xffff;
            }
        } else {
            byte[] first = (byte[]) frames[0];
            for (int j = 0; j < n; j++) {
                b[j] = first[from + j] & 0xff;
            }
        }
        java.util.Arrays.fill(s1, 0, n, 0);
        java.util.Arrays.fill(s2, 0, n, 0L);
        for (int f = 1; f < frames.length; f++) {
            if (frames[f] instanceof short[] a) {
                for (int j = 0; j < n; j++) {
                    int d = (a[from + j] & 0xffff) - b[j];
                    s1[j] += d;
                    s2[j] += (long) d * d;
                }
            } else {
                byte[] a = (byte[]) frames[f];
                for (int j = 0; j < n; j++) {
                    int d = (a[from + j] & 0xff) - b[j];
                    s1[j] += d;
                    s2[j] += (long) d * d;
                }
            }
        }
        for (int j = 0; j < n; j++) {
            sc.base[j] = b[j];
            sc.s1[j] = s1[j];
            sc.s2[j] = s2[j];
        }
    }

    /**
     * The stored (or table-calibrated) values of one tile of a frame: {@code byte[]} and {@code short[]} are
     * unsigned, {@code table} (or null) maps stored to calibrated values. Shared with the stability maps.
     */
    public static void load(Object frame, float[] table, int from, int n, double[] out) {
        if (frame instanceof short[] a) {
            for (int j = 0; j < n; j++) {
                int raw = a[from + j] & 0xffff;
                out[j] = table == null ? raw : table[raw];
            }
        } else if (frame instanceof byte[] a) {
            for (int j = 0; j < n; j++) {
                int raw = a[from + j] & 0xff;
                out[j] = table == null ? raw : table[raw];
            }
        } else {
            float[] a = (float[]) frame;
            for (int j = 0; j < n; j++) {
                out[j] = a[from + j];
            }
        }
    }

    /** Adds one frame's deviations from the tile's first frame to the sums. */
    private static void accumulate(Object frame, float[] table, int from, int n, double[] base, double[] s1,
                                   double[] s2) {
        if (frame instanceof short[] a && table == null) {
            for (int j = 0; j < n; j++) {
                double d = (a[from + j] & 0xffff) - base[j];
                s1[j] += d;
                s2[j] += d * d;
            }
        } else if (frame instanceof float[] a) {
            for (int j = 0; j < n; j++) {
                double d = a[from + j] - base[j];
                s1[j] += d;
                s2[j] += d * d;
            }
        } else if (frame instanceof byte[] a && table == null) {
            for (int j = 0; j < n; j++) {
                double d = (a[from + j] & 0xff) - base[j];
                s1[j] += d;
                s2[j] += d * d;
            }
        } else {
            for (int j = 0; j < n; j++) {
                int raw = frame instanceof short[] sa ? sa[from + j] & 0xffff : ((byte[]) frame)[from + j] & 0xff;
                double d = table[raw] - base[j];
                s1[j] += d;
                s2[j] += d * d;
            }
        }
    }

    /** {@code b(K)}: how many times too high the mean of a per-pixel SNR map is, for K repeats. */
    public static double snrMapBias(int repeats) {
        if (repeats <= 2) {
            return Double.POSITIVE_INFINITY;
        }
        double nu = repeats - 1.0;
        return Math.sqrt(nu / 2.0) * Math.exp(Gamma.logGamma((nu - 1) / 2.0) - Gamma.logGamma(nu / 2.0));
    }

    /** The repeated frames of one slice, read one calibrated plane at a time. */
    public interface Frames {
        int count();

        float[] plane(int frame) throws InputException;

        /** The calibrated values of frame {@code frame} at plane indices {@code indices}, into {@code out}. */
        default void gather(int frame, int[] indices, double[] out) throws InputException {
            float[] p = plane(frame);
            for (int i = 0; i < indices.length; i++) {
                out[i] = p[indices[i]];
            }
        }

        /** Frames already in memory. */
        static Frames of(float[][] frames) {
            return new Frames() {
                @Override
                public int count() {
                    return frames.length;
                }

                @Override
                public float[] plane(int frame) {
                    return frames[frame];
                }
            };
        }
    }

    /**
     * Region summary of the maps, corrected for the magnitude bias (Koay and Basser 2006, L channels).
     *
     * <p>The magnitude mean {@code S} is the region mean of the mean map, the magnitude SD
     * {@code s = sqrt(region mean of the per-pixel variances)} (pooled, {@code n (K - 1)} degrees of
     * freedom for independent pixels). Spatial correlation of the noise is measured on the temporal
     * residuals {@code x_f - mean} over the region, pooled over the frames (their spatial mean is not
     * estimated, so no mean-removal bias arises): the squared sum divides the degrees of freedom of
     * {@code s}, the linear sum those of {@code S}. {@code S} and {@code s} then go through
     * {@link CorrectedSnr#meanAndSd}.
     *
     * @param frames   the frames the maps were made from (for the residual correlation)
     * @param channels receive channels L for the noise model
     */
    public static RepeatedSnrResult summarize(Maps maps, Frames frames, Region signal, int channels)
            throws InputException {
        return summarize(maps, frames, signal, channels, 0.0);
    }

    /**
     * As {@link #summarize(Maps, Frames, Region, int)} for values stored as whole multiples of
     * {@code step} (0: continuous): rounding adds {@code step^2 / 12} to each pixel's temporal variance
     * (Sheppard's correction), which the corrected figures remove; the plain SNR keeps it.
     */
    public static RepeatedSnrResult summarize(Maps maps, Frames frames, Region signal, int channels, double step)
            throws InputException {
        if (signal == null) {
            throw new InputException("no signal region: mark the region to summarise");
        }
        double[] means = signal.values(maps.mean());
        double[] sds = signal.values(maps.sd());
        int n = means.length;
        int k = maps.repeats();
        SampleStats meanStats = SampleStats.of(means);
        double varSum = 0;
        int constant = 0;
        for (double s : sds) {
            varSum += s * s;
            constant += s == 0 ? 1 : 0;
        }
        double s = Math.sqrt(varSum / n);
        if (!(s > 0)) {
            throw new InputException("the repeats are identical in region '" + signal.name()
                    + "': there is no noise to measure; check that the stack holds separate acquisitions");
        }
        long[] negatives = new long[2];
        SpatialCorrelation.Result corr = residualCorrelation(maps, frames, signal, negatives);
        double seLogS = Math.sqrt(corr.squared() / (2.0 * n * (k - 1.0)));
        double seMean = s * Math.sqrt(corr.linear() / ((double) n * k));
        boolean signed = SignedValues.signed((int) Math.min(Integer.MAX_VALUE, negatives[0]), negatives[1]);
        double noise = SampleStats.sheppard(s, step);
        CorrectedSnr figures = signed ? CorrectedSnr.gaussian(meanStats.mean(), seMean, noise, seLogS)
                : CorrectedSnr.meanAndSd(meanStats.mean(), seMean, noise, seLogS, channels);
        double plain = meanStats.mean() / s;
        double seLogPlain = Math.sqrt(Math.pow(seMean / meanStats.mean(), 2) + seLogS * seLogS);
        Interval plainCi = meanStats.mean() > 0 ? new Interval(plain * Math.exp(-Levels.Z95 * seLogPlain),
                plain * Math.exp(Levels.Z95 * seLogPlain)) : new Interval(Double.NaN, Double.NaN);
        if (signed) {
            plainCi = figures.snrCi95();
        }
        double mapSum = 0;
        int mapCount = 0;
        for (int i : signal.indices()) {
            float v = maps.snr()[i];
            if (Float.isFinite(v)) {
                mapSum += v;
                mapCount++;
            }
        }
        List<Warning> warnings = new ArrayList<>();
        if (signed) {
            warnings.add(SignedValues.gaussianWarning(signal.name(), (int) negatives[0], negatives[1]));
        }
        if (constant > 0) {
            warnings.add(new Warning("constant_pixels", String.format(Locale.ROOT,
                    "%d pixel(s) of region '%s' have the same value in every repeat (no temporal noise: saturated, "
                            + "masked or copied frames); their SNR-map value is undefined and left out of the map mean",
                    constant, signal.name())));
        }
        if (corr.correlated() && Math.max(corr.neighbourX(), corr.neighbourY()) > 0.1) {
            warnings.add(new Warning("correlated_noise", String.format(Locale.ROOT,
                    "neighbouring pixels' noise correlates (%.2f along x, %.2f along y in the temporal residuals): "
                            + "interpolation, zero-filling or filtering; intervals use an effective pixel count of "
                            + "%.0f of %d", corr.neighbourX(), corr.neighbourY(), n / corr.squared(), n)));
        }
        if (k < 8) {
            double b = snrMapBias(k);
            warnings.add(new Warning("few_repeats", String.format(Locale.ROOT,
                    "only %d repeats: each pixel's SD is rough and the SNR map's pixel values scatter widely (%s); "
                            + "rely on the region summary", k, Double.isFinite(b)
                            ? String.format(Locale.ROOT, "their mean is about %.2f times too high", b)
                            : "with 2 repeats their mean has no finite expectation")));
        }
        warnings.addAll(figures.warnings());
        return new RepeatedSnrResult(k, n, meanStats.mean(), s, plain, plainCi, figures,
                mapCount > 0 ? mapSum / mapCount : Double.NaN, snrMapBias(k), corr, channels, warnings);
    }

    /**
     * The spatial correlation of the temporal residuals over the region, pooled over the frames; counts
     * the negative values seen into {@code negatives[0]} of {@code negatives[1]}.
     */
    static SpatialCorrelation.Result residualCorrelation(Maps maps, Frames frames, Region signal, long[] negatives)
            throws InputException {
        SpatialCorrelation.Patch p = SpatialCorrelation.Patch.of(signal, maps.width());
        double[] mean = p.sample(maps.mean(), maps.width());
        SpatialCorrelation.LagSums sums = new SpatialCorrelation.LagSums(SpatialCorrelation.SQUARE_WINDOW);
        int k = frames.count();
        int[][] members = p.members(maps.width());
        double[] values = new double[members[0].length];
        double[] r = new double[mean.length];
        // a few dozen frames measure the correlation well; more only cost time
        int step = Math.max(1, k / 64);
        for (int f = 0; f < k; f += step) {
            frames.gather(f, members[0], values);
            for (int i = 0; i < values.length; i++) {
                int b = members[1][i];
                r[b] = values[i] - mean[b];
                negatives[0] += values[i] < 0 ? 1 : 0;
            }
            negatives[1] += values.length;
            sums.add(p, r, 0.0);
        }
        return sums.result(0);
    }
}
