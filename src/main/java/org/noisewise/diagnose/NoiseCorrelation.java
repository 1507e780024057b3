package org.noisewise.diagnose;

import java.util.List;
import org.noisewise.estimate.Region;

/**
 * Spatial autocorrelation of noise in x and y, and the effective pixel count it implies.
 *
 * <p>For each lag {@code d = 1..}{@value #MAX_LAG} the correlation is taken over pixel pairs
 * {@code d} apart that both lie in the same region (and row or column), after subtracting each
 * region's mean. Background regions are measured on {@code M^2} — the quantity the maximum-likelihood
 * sigma sums — whose correlation is {@code |rho|^2} for complex noise correlation {@code rho}; so the
 * reported neighbour correlation of the noise is {@code sqrt(rho_{M^2})}. A difference image is
 * Gaussian: its values give the noise correlation and the effective count for means, its squares
 * ({@code rho^2}) the effective count for its variance.
 *
 * <p>Effective count: {@code n_eff = n / (S_x S_y)} with {@code S = 1 + 2 sum_d rho(d)} over lags
 * 1..{@value #MAX_LAG} in a direction whose neighbour correlation exceeds twice its standard error,
 * else {@code S = 1} (white noise keeps {@code n_eff = n}); summing every lag rather than only the
 * significant ones keeps the weak long-range tail of interpolation kernels. The separable form holds
 * for interpolation and filtering applied along rows and columns. Zero-filling
 * k-space 2x in both directions gives {@code |rho(1)| = 1/(N sin(pi/2N))}, about {@code 2/pi}, in each
 * direction, and halves the independent samples per direction.
 */
public final class NoiseCorrelation {

    /** The largest lag measured. */
    public static final int MAX_LAG = 16;
    /** Neighbour correlation above this is worth a warning (common practice). */
    public static final double WARN_ABOVE = 0.1;

    private NoiseCorrelation() {
    }

    /**
     * @param x          correlation of the measured quantity at lags 1..MAX_LAG along x (index 0 = lag 1)
     * @param y          the same along y
     * @param neighbourX noise correlation between horizontal neighbours
     * @param neighbourY noise correlation between vertical neighbours
     * @param factor     {@code S_x S_y}: how many pixels make one independent sample ({@code >= 1})
     */
    public record Result(double[] x, double[] y, double neighbourX, double neighbourY, double factor,
                         boolean significantX, boolean significantY) {
        /** True when a neighbour correlation is both significant and above {@link #WARN_ABOVE}. */
        public boolean worthWarning() {
            return (significantX && neighbourX > WARN_ABOVE) || (significantY && neighbourY > WARN_ABOVE);
        }

        public double effective(int n) {
            return n / factor;
        }

        /** Neighbour correlation at lag {@code d} (1 or 2) of the noise itself. */
        public double noiseX(int d, boolean squared) {
            return toNoise(x[d - 1], squared);
        }

        public double noiseY(int d, boolean squared) {
            return toNoise(y[d - 1], squared);
        }
    }

    /**
     * Correlation of squared values: {@code M^2} in background regions, or {@code d^2} of a difference
     * image; the effective count then fits the intervals of estimates built on sums of squares.
     */
    public static Result ofSquares(float[] pixels, int width, List<Region> regions) {
        return measure(pixels, width, regions, true);
    }

    /**
     * Correlation of the values themselves (a difference image, Gaussian noise); the effective count
     * then fits the standard error of a mean.
     */
    public static Result ofValues(float[] difference, int width, List<Region> regions) {
        return measure(difference, width, regions, false);
    }

    private static Result measure(float[] pixels, int width, List<Region> regions, boolean squared) {
        double[] sxx = new double[MAX_LAG];
        double[] syy = new double[MAX_LAG];
        long[] cx = new long[MAX_LAG];
        long[] cy = new long[MAX_LAG];
        double var = 0;
        long n = 0;
        int height = pixels.length / width;
        for (Region r : regions) {
            int[] idx = r.indices();
            boolean[] in = new boolean[pixels.length];
            double mean = 0;
            for (int i : idx) {
                in[i] = true;
                mean += value(pixels[i], squared);
            }
            mean /= idx.length;
            for (int i : idx) {
                double a = value(pixels[i], squared) - mean;
                var += a * a;
                n++;
                int xx = i % width;
                int yy = i / width;
                for (int d = 1; d <= MAX_LAG; d++) {
                    if (xx + d < width && in[i + d]) {
                        sxx[d - 1] += a * (value(pixels[i + d], squared) - mean);
                        cx[d - 1]++;
                    }
                    if (yy + d < height && in[i + d * width]) {
                        syy[d - 1] += a * (value(pixels[i + d * width], squared) - mean);
                        cy[d - 1]++;
                    }
                }
            }
        }
        var /= Math.max(1, n);
        double[] rx = new double[MAX_LAG];
        double[] ry = new double[MAX_LAG];
        for (int d = 0; d < MAX_LAG; d++) {
            rx[d] = cx[d] > 0 && var > 0 ? sxx[d] / cx[d] / var : 0.0;
            ry[d] = cy[d] > 0 && var > 0 ? syy[d] / cy[d] / var : 0.0;
        }
        boolean sigX = cx[0] > 0 && rx[0] > 2.0 / Math.sqrt(cx[0]);
        boolean sigY = cy[0] > 0 && ry[0] > 2.0 / Math.sqrt(cy[0]);
        double factor = sum(rx, sigX) * sum(ry, sigY);
        return new Result(rx, ry, toNoise(rx[0], squared), toNoise(ry[0], squared), factor, sigX, sigY);
    }

    /** {@code S = 1 + 2 sum of lags 1..MAX_LAG} once neighbours correlate significantly, else 1 (white noise). */
    private static double sum(double[] rho, boolean significant) {
        if (!significant) {
            return 1.0;
        }
        double s = 0;
        for (double r : rho) {
            s += r;
        }
        return Math.max(1.0, 1 + 2 * s);
    }

    private static double value(float v, boolean squared) {
        return squared ? (double) v * v : v;
    }

    private static double toNoise(double rho, boolean squared) {
        return squared ? Math.sqrt(Math.max(0.0, rho)) : rho;
    }
}
