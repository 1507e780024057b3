package org.noisewise.estimate;

import java.util.Locale;
import java.util.stream.IntStream;
import org.noisewise.math.ChiMoments;

/**
 * Removes the noise bias of a magnitude image pixel by pixel, given the per-channel noise SD sigma.
 *
 * <ul>
 *   <li>{@link Method#KOAY_BASSER} (default): the amplitude {@code A} whose expected magnitude equals
 *       the pixel value, {@code sigma * mean_L(A / sigma) = M}, inverting the Rice / noncentral chi
 *       mean used by Koay and Basser (2006, J Magn Reson 179:317). Where {@code M} is at or below
 *       the mean of pure noise ({@code beta_L sigma}, 1.2533 sigma for L = 1) the result is 0: such a
 *       pixel cannot be told from noise.</li>
 *   <li>{@link Method#POWER}: {@code sqrt(M^2 - 2 L sigma^2)}, from {@code E[M^2] = A^2 + 2 L sigma^2}
 *       (Gudbjartsson and Patz 1995 for one channel; Constantinides et al. 1997 for L channels).
 *       Unbiased in power, not in amplitude; negative {@code M^2 - 2L sigma^2} (about half of the
 *       pure-noise pixels) is set to 0, so near zero it is biased low and noisier than the mean
 *       inversion.</li>
 * </ul>
 * Both are applied to single pixels and so cannot remove the noise itself; they remove its bias.
 */
public final class RicianCorrection {

    /** The correction methods. */
    public enum Method {
        KOAY_BASSER("koay", "Koay-Basser (mean inversion)"),
        POWER("power", "Power: sqrt(M^2 - 2L sigma^2)");

        private final String key;
        private final String label;

        Method(String key, String label) {
            this.key = key;
            this.label = label;
        }

        public String key() {
            return key;
        }

        public String label() {
            return label;
        }

        public static Method parse(String text) {
            String t = text.trim().toLowerCase(Locale.ROOT);
            for (Method m : values()) {
                if (m.key.equals(t) || m.label.toLowerCase(Locale.ROOT).equals(t)) {
                    return m;
                }
            }
            throw new IllegalArgumentException("unknown correction method '" + text + "': use koay or power");
        }

        public static String[] labels() {
            return new String[] {KOAY_BASSER.label, POWER.label};
        }
    }

    private static final double TABLE_MAX = 60.0;
    private static final double TABLE_STEP = 1e-3;

    private RicianCorrection() {
    }

    /** A corrected copy of {@code pixels}; the input is not changed. */
    public static float[] correct(float[] pixels, double sigma, int channels, Method method) throws InputException {
        if (!(sigma > 0) || Double.isInfinite(sigma)) {
            throw new InputException("sigma must be a positive number, was " + sigma
                    + ": measure it from background regions or two acquisitions first");
        }
        if (channels < 1) {
            throw new InputException("the channel count must be at least 1, was " + channels);
        }
        float[] out = new float[pixels.length];
        if (method == Method.POWER) {
            double floor = 2.0 * channels * sigma * sigma;
            IntStream.range(0, pixels.length).parallel().forEach(i -> {
                double m = pixels[i];
                out[i] = Float.isNaN(pixels[i]) ? Float.NaN : (float) Math.sqrt(Math.max(0.0, m * m - floor));
            });
            return out;
        }
        MeanInverse inv = MeanInverse.forChannels(channels);
        IntStream.range(0, pixels.length).parallel().forEach(i -> {
            float m = pixels[i];
            out[i] = Float.isNaN(m) ? Float.NaN : (float) (sigma * inv.theta(Math.max(0.0, m / sigma)));
        });
        return out;
    }

    /** Inverse of {@code theta -> mean_L(theta)} by a fine table and linear interpolation. */
    static final class MeanInverse {
        /** Tables are immutable and cost ~0.1-1 s to build, so each channel count is built once. */
        private static final java.util.concurrent.ConcurrentHashMap<Integer, MeanInverse> CACHE =
                new java.util.concurrent.ConcurrentHashMap<>();

        private final int channels;
        private final double[] means;
        private final double floor;

        static MeanInverse forChannels(int channels) {
            return CACHE.computeIfAbsent(channels, MeanInverse::new);
        }

        private MeanInverse(int channels) {
            this.channels = channels;
            int n = (int) Math.round(TABLE_MAX / TABLE_STEP) + 1;
            means = new double[n];
            IntStream.range(0, n).parallel().forEach(j -> means[j] = ChiMoments.mean(channels, j * TABLE_STEP));
            floor = means[0];
        }

        double theta(double x) {
            if (x <= floor) {
                return 0.0;
            }
            if (x >= means[means.length - 1]) {
                // beyond the table: mean ~ sqrt(theta^2 + 2L - 1), off by about (2L-1)^2 / (8 theta^3):
                // under 1e-5 sigma for L = 1, about 2e-3 sigma for L = 32
                return Math.sqrt(Math.max(0.0, x * x - (2.0 * channels - 1)));
            }
            int lo = 0;
            int hi = means.length - 1;
            while (hi - lo > 1) {
                int mid = (lo + hi) >>> 1;
                if (means[mid] <= x) {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            double f = (x - means[lo]) / (means[hi] - means[lo]);
            return (lo + f) * TABLE_STEP;
        }
    }
}
