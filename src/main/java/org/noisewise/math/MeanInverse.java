package org.noisewise.math;

import java.util.concurrent.ConcurrentHashMap;

/**
 * The inverse of the noncentral-chi mean, {@code x -> theta} with {@code mean_L(theta) = x} (all in
 * units of sigma): the amplitude whose expected magnitude equals a measured magnitude. Zero at and
 * below the pure-noise mean {@code beta_L}.
 *
 * <p>Near the floor {@code theta} grows like {@code sqrt((x - beta_L) / a)} with
 * {@code a = beta_L / (4L)}, which no polynomial in {@code x} follows; in {@code w = sqrt(x - beta_L)}
 * the inverse is analytic. It is tabulated on a uniform grid in {@code w} (step {@value #STEP_TEXT})
 * up to {@code x =} {@value #TABLE_MAX}, each node solved by Newton's method on the exact mean, with
 * its exact derivative {@code d theta / dw = 2w / mean'(theta)}; between nodes a cubic Hermite
 * polynomial interpolates (error below {@code 1e-10} sigma). Above the table a few Newton steps on
 * Kummer's asymptotic mean finish the job. One table per channel count is built on first use (a few
 * milliseconds) and shared.
 *
 * <p>Whole images go through {@link #apply}, a single-precision kernel the JIT vectorises: with
 * {@code t = x - beta_L} (the floor subtracted in the image's units, the constant split in two floats,
 * so that {@code t} keeps full relative precision just above the floor), {@code theta^2 = R(u) t (x + beta_L)} where
 * {@code u = t / (t + c)} maps {@code [0, inf)} onto {@code [0, 1)} and {@code R} (from
 * {@code 2L / beta_L^2} at the floor to 1 at high SNR) is analytic; a degree-{@value #DEGREE}
 * polynomial in {@code 2u - 1}, interpolated at Chebyshev nodes from the exact inverse with the
 * scale {@code c} chosen per channel count, reproduces it to single precision. Each candidate is
 * checked against the exact inverse at setup; if none reaches {@value #KERNEL_TOLERANCE} the
 * kernel falls back to the table.
 */
public final class MeanInverse {

    static final String STEP_TEXT = "1/64";
    /** Grid step in {@code w}. */
    static final double STEP = 1.0 / 64.0;
    /** Largest tabulated {@code x = M / sigma}. */
    static final double TABLE_MAX = 400.0;

    /** Degree of the single-precision kernel's polynomial. */
    static final int DEGREE = 16;
    /** Largest relative error of {@code theta} (for {@code theta >= 0.1}) the kernel may have against the exact inverse. */
    static final double KERNEL_TOLERANCE = 4e-7;
    /** Elements per inner pass: the kernel's three passes stay within the first-level cache. */
    private static final int CHUNK = 4096;

    private static final ConcurrentHashMap<Integer, MeanInverse> CACHE = new ConcurrentHashMap<>();

    private final int channels;
    private final double floor;
    private final int intervals;
    /** Four polynomial coefficients per interval, in the fraction {@code f} of the step. */
    private final double[] poly;
    /** The kernel's monomial coefficients in {@code y = 2u - 1}, or {@code null} to use the table. */
    private final float[] kernel;
    private final float kernelScale;
    private final double kernelError;

    private MeanInverse(int channels) {
        this.channels = channels;
        this.floor = ChiMoments.beta(channels);
        double wMax = Math.sqrt(TABLE_MAX - floor);
        intervals = (int) Math.ceil(wMax / STEP);
        int nodes = intervals + 1;
        double[] theta = new double[nodes];
        double[] slope = new double[nodes];
        // d theta / d w at w = 0: mean(theta) ~ beta + beta theta^2 / (4L), so theta ~ w sqrt(4L / beta)
        slope[0] = Math.sqrt(4.0 * channels / floor);
        for (int j = 1; j < nodes; j++) {
            double w = j * STEP;
            double x = floor + w * w;
            double guess = theta[j - 1] + STEP * slope[j - 1];
            theta[j] = solve(x, guess);
            slope[j] = 2.0 * w / ChiMoments.meanDerivative(channels, theta[j]);
        }
        poly = new double[4 * intervals];
        for (int j = 0; j < intervals; j++) {
            double p0 = theta[j];
            double p1 = theta[j + 1];
            double m0 = STEP * slope[j];
            double m1 = STEP * slope[j + 1];
            poly[4 * j] = p0;
            poly[4 * j + 1] = m0;
            poly[4 * j + 2] = 3 * (p1 - p0) - 2 * m0 - m1;
            poly[4 * j + 3] = 2 * (p0 - p1) + m0 + m1;
        }
        float[] bestKernel = null;
        double bestScale = Double.NaN;
        double bestError = Double.POSITIVE_INFINITY;
        for (double c : new double[] {1, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10, 12, 16}) {
            float[] k = fitKernel(c);
            double e = kernelError(k, (float) c);
            if (e < bestError) {
                bestError = e;
                bestKernel = k;
                bestScale = c;
            }
        }
        kernel = bestError <= KERNEL_TOLERANCE ? bestKernel : null;
        kernelScale = (float) bestScale;
        kernelError = bestError;
    }

    /** Monomial coefficients (in {@code y in [-1, 1]}) of the Chebyshev interpolant of {@code R}. */
    private float[] fitKernel(double c) {
        int n = DEGREE + 1;
        double[] f = new double[n];
        for (int k = 0; k < n; k++) {
            double u = 0.5 * (Math.cos(Math.PI * (k + 0.5) / n) + 1.0);
            double t = c * u / (1.0 - u);
            f[k] = ratio(t);
        }
        double[] cheb = new double[n];
        for (int j = 0; j < n; j++) {
            double sum = 0;
            for (int k = 0; k < n; k++) {
                sum += f[k] * Math.cos(Math.PI * j * (k + 0.5) / n);
            }
            cheb[j] = 2.0 * sum / n;
        }
        cheb[0] *= 0.5;
        // T_j to monomials by T_(j+1) = 2y T_j - T_(j-1)
        double[] mono = new double[n];
        double[] older = new double[n];
        double[] old = new double[n];
        older[0] = 1.0;
        mono[0] += cheb[0];
        old[1] = 1.0;
        mono[1] += cheb[1];
        for (int j = 2; j < n; j++) {
            double[] next = new double[n];
            for (int i = 0; i < n; i++) {
                next[i] = (i > 0 ? 2.0 * old[i - 1] : 0.0) - older[i];
                mono[i] += cheb[j] * next[i];
            }
            older = old;
            old = next;
        }
        float[] out = new float[n];
        for (int i = 0; i < n; i++) {
            out[i] = (float) mono[i];
        }
        return out;
    }

    /** {@code R(t) = theta^2 / (t (t + 2 beta_L))}, with its limit {@code 2L / beta_L^2} at the floor. */
    private double ratio(double t) {
        if (t < 1e-9) {
            return 2.0 * channels / (floor * floor);
        }
        double th = theta(floor + t);
        return th * th / (t * (t + 2.0 * floor));
    }

    /** Largest relative error of the kernel for {@code theta >= 0.1}, on a fixed grid of amplitudes. */
    private double kernelError(float[] k, float c) {
        int n = 2000;
        float[] x = new float[n];
        double[] exact = new double[n];
        for (int i = 0; i < n; i++) {
            double th = i < n / 2 ? 0.1 + 6.0 * i / (n / 2.0) : 6.0 * Math.pow(1000.0, (i - n / 2.0) / (n / 2.0));
            x[i] = (float) ChiMoments.mean(channels, th);
            exact[i] = theta(x[i]);
        }
        float[] out = new float[n];
        run(k, c, x, out, 0, n, 1f, 1f);
        double worst = 0;
        for (int i = 0; i < n; i++) {
            worst = Math.max(worst, Math.abs(out[i] - exact[i]) / exact[i]);
        }
        return worst;
    }

    /** The shared inverse for {@code channels} (built once, thread-safe). */
    public static MeanInverse of(int channels) {
        ChiMoments.requireChannels(channels);
        return CACHE.computeIfAbsent(channels, MeanInverse::new);
    }

    public int channels() {
        return channels;
    }

    /** {@code beta_L}, the mean of pure noise: inputs at or below it give 0. */
    public double floor() {
        return floor;
    }

    /**
     * {@code theta} with {@code mean_L(theta) = x}; 0 for {@code x <= beta_L}; NaN for NaN.
     *
     * @param x a magnitude in units of sigma
     */
    public double theta(double x) {
        double t = x - floor;
        if (!(t > 0)) {
            return Double.isNaN(x) ? Double.NaN : 0.0;
        }
        double s = Math.sqrt(t) * (1.0 / STEP);
        int j = (int) s;
        if (j >= intervals) {
            return beyondTable(x);
        }
        double f = s - j;
        int k = 4 * j;
        return poly[k] + f * (poly[k + 1] + f * (poly[k + 2] + f * poly[k + 3]));
    }

    /**
     * Writes {@code sigma * theta(in[i] / sigma)} to {@code out[i]} for {@code i} in {@code [from, to)}:
     * the per-pixel mean inversion of a magnitude image with noise SD {@code sigma}. Values at or below
     * {@code beta_L sigma} (negative ones included) give 0; NaN and infinite values give NaN (as do values
     * beyond about {@code 1e19 sigma}, where {@code theta^2} leaves the float range). Relative error at most
     * {@value #KERNEL_TOLERANCE} for {@code theta >= 0.1} (checked at setup), otherwise the table's.
     */
    public void apply(float[] in, float[] out, int from, int to, double sigma) {
        if (kernel == null) {
            double scale = 1.0 / sigma;
            for (int i = from; i < to; i++) {
                out[i] = (float) (sigma * theta(in[i] * scale));
            }
            return;
        }
        run(kernel, kernelScale, in, out, from, to, (float) (1.0 / sigma), (float) sigma);
    }

    /** The kernel's largest relative error at setup, and whether the table is used instead. */
    public double kernelError() {
        return kernelError;
    }

    public boolean usesKernel() {
        return kernel != null;
    }

    private void run(float[] k, float c, float[] in, float[] out, int from, int to, float scale, float sigma) {
        // the floor in the image's units, split in two floats: near the floor in - hi is exact (Sterbenz),
        // so t = x - beta keeps full relative precision however close to the floor the pixel is
        double floorUnits = floor * sigma;
        float hi = (float) floorUnits;
        float lo = (float) (floorUnits - hi);
        float twoFloor = (float) (2 * floor);
        for (int s = from; s < to; s += CHUNK) {
            pass(in, out, s, Math.min(to, s + CHUNK), k[0], k[1], k[2], k[3], k[4], k[5], k[6], k[7], k[8], k[9],
                    k[10], k[11], k[12], k[13], k[14], k[15], k[16], hi, lo, twoFloor, c, scale, sigma);
        }
    }

    /**
     * Three short loops over one chunk, each small enough for the JIT to vectorise (a longer loop body
     * is not unrolled, and a loop that is not unrolled is not vectorised): {@code t}, then
     * {@code theta^2 = R(t) t (t + 2 beta)}, then {@code sigma theta}.
     */
    private static void pass(float[] in, float[] out, int s, int e, float k0, float k1, float k2, float k3, float k4,
                             float k5, float k6, float k7, float k8, float k9, float k10, float k11, float k12,
                             float k13, float k14, float k15, float k16, float hi, float lo, float twoFloor, float c,
                             float scale, float sigma) {
        for (int i = s; i < e; i++) {
            out[i] = Math.max((in[i] - hi) - lo, 0f) * scale;
        }
        for (int i = s; i < e; i++) {
            float t = out[i];
            float y = 2f * t / (t + c) - 1f;
            float h = Math.fma(k16, y, k15);
            h = Math.fma(h, y, k14);
            h = Math.fma(h, y, k13);
            h = Math.fma(h, y, k12);
            h = Math.fma(h, y, k11);
            h = Math.fma(h, y, k10);
            h = Math.fma(h, y, k9);
            h = Math.fma(h, y, k8);
            h = Math.fma(h, y, k7);
            h = Math.fma(h, y, k6);
            h = Math.fma(h, y, k5);
            h = Math.fma(h, y, k4);
            h = Math.fma(h, y, k3);
            h = Math.fma(h, y, k2);
            h = Math.fma(h, y, k1);
            h = Math.fma(h, y, k0);
            out[i] = t * h * (t + twoFloor);
        }
        for (int i = s; i < e; i++) {
            out[i] = sigma * (float) Math.sqrt(out[i]);
        }
    }

    /** The exact inverse by Newton's method from a starting value (also used for the table's nodes). */
    private double solve(double x, double guess) {
        double th = Math.max(guess, 0.0);
        for (int it = 0; it < 60; it++) {
            double d = ChiMoments.meanDerivative(channels, th);
            if (!(d > 0)) {
                th = Math.max(th, 1e-6);
                continue;
            }
            double next = th - (ChiMoments.mean(channels, th) - x) / d;
            if (next <= 0) {
                next = 0.5 * th;
            }
            if (Math.abs(next - th) <= 1e-15 * (1.0 + next)) {
                return next;
            }
            th = next;
        }
        return th;
    }

    private double beyondTable(double x) {
        if (Double.isInfinite(x)) {
            return x;
        }
        return solve(x, Math.sqrt(x * x - (2.0 * channels - 1.0)));
    }
}
