package org.noisewise.testing;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.complex.Complex;
import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;

/**
 * Simulated magnitude data with known truth for the statistical tests: exact single-pixel samples of
 * the L-channel noncentral chi, and images whose complex channel noise is white, smoothed by a 3x3
 * box, or zero-filled 2x in k-space before the magnitude is taken.
 */
public final class NoiseFields {

    /** How the complex noise of each channel is made. */
    public enum Kind {
        /** Independent pixels. */
        WHITE,
        /** Complex noise averaged over 3x3 pixels: rho(h) = (3-|hx|)(3-|hy|)/9 (references.md section 9). */
        BOX,
        /** Complex noise of half the matrix, zero-filled 2x in k-space (ideal sinc interpolation). */
        ZERO_FILLED
    }

    private static final FastFourierTransformer FFT = new FastFourierTransformer(DftNormalization.UNITARY);

    private NoiseFields() {
    }

    /**
     * One magnitude of amplitude {@code a} with L channels, exactly: the signal in one channel's real
     * part, so {@code M^2 = (a + sigma Z1)^2 + sigma^2 Z2^2 + sigma^2 chi^2_(2(L-1))}, the last term
     * {@code -2 ln(U_1 ... U_(L-1))} (a sum of L-1 unit exponentials, doubled).
     */
    public static double magnitude(SplittableRandom rng, double a, double sigma, int channels) {
        double re = a + sigma * rng.nextGaussian();
        double im = sigma * rng.nextGaussian();
        double product = 1.0;
        for (int c = 1; c < channels; c++) {
            product *= 1.0 - rng.nextDouble();
        }
        return Math.sqrt(re * re + im * im - 2.0 * sigma * sigma * Math.log(product));
    }

    /**
     * A {@code w x h} magnitude image: amplitude {@code a} where {@code signal[i]}, 0 elsewhere, L
     * channels each with complex noise of per-component SD {@code sigma} made as {@code kind} says,
     * combined by root sum of squares (the signal split equally over the channels).
     */
    public static float[] image(SplittableRandom rng, Kind kind, int w, int h, boolean[] signal, double a,
                                double sigma, int channels) {
        double[] sum = new double[w * h];
        double per = a / Math.sqrt(channels);
        for (int c = 0; c < channels; c++) {
            double[][] f = complex(rng, kind, w, h);
            for (int i = 0; i < w * h; i++) {
                double re = (signal != null && signal[i] ? per : 0.0) + sigma * f[0][i];
                double im = sigma * f[1][i];
                sum[i] += re * re + im * im;
            }
        }
        float[] out = new float[w * h];
        for (int i = 0; i < out.length; i++) {
            out[i] = (float) Math.sqrt(sum[i]);
        }
        return out;
    }

    /** Unit-variance complex noise (real and imaginary parts), correlated as {@code kind} says. */
    public static double[][] complex(SplittableRandom rng, Kind kind, int w, int h) {
        double[] re = new double[w * h];
        double[] im = new double[w * h];
        switch (kind) {
            case WHITE -> {
                for (int i = 0; i < w * h; i++) {
                    re[i] = rng.nextGaussian();
                    im[i] = rng.nextGaussian();
                }
            }
            case BOX -> {
                int wp = w + 2;
                double[] a = new double[wp * (h + 2)];
                double[] b = new double[wp * (h + 2)];
                for (int i = 0; i < a.length; i++) {
                    a[i] = 3 * rng.nextGaussian();
                    b[i] = 3 * rng.nextGaussian();
                }
                for (int y = 0; y < h; y++) {
                    for (int x = 0; x < w; x++) {
                        double s = 0;
                        double t = 0;
                        for (int dy = 0; dy < 3; dy++) {
                            for (int dx = 0; dx < 3; dx++) {
                                s += a[(y + dy) * wp + x + dx];
                                t += b[(y + dy) * wp + x + dx];
                            }
                        }
                        re[y * w + x] = s / 9;
                        im[y * w + x] = t / 9;
                    }
                }
            }
            case ZERO_FILLED -> zeroFilled(rng, w, h, re, im);
            default -> throw new IllegalArgumentException(kind.toString());
        }
        return new double[][] {re, im};
    }

    /** Complex white noise of w/2 x h/2, zero-filled to w x h in k-space; unitary transforms, rescaled to unit SD. */
    private static void zeroFilled(SplittableRandom rng, int w, int h, double[] re, double[] im) {
        int n = w / 2;
        int m = h / 2;
        Complex[][] small = new Complex[m][n];
        for (int y = 0; y < m; y++) {
            for (int x = 0; x < n; x++) {
                small[y][x] = new Complex(rng.nextGaussian(), rng.nextGaussian());
            }
        }
        Complex[][] k = fft2(small, TransformType.FORWARD);
        Complex[][] big = new Complex[h][w];
        for (Complex[] row : big) {
            Arrays.fill(row, Complex.ZERO);
        }
        for (int y = 0; y < m; y++) {
            for (int x = 0; x < n; x++) {
                big[y < m / 2 ? y : y + m][x < n / 2 ? x : x + n] = k[y][x];
            }
        }
        Complex[][] img = fft2(big, TransformType.INVERSE);
        // unitary transforms keep the total power: the fourfold larger image needs a factor 2 in amplitude
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                re[y * w + x] = 2.0 * img[y][x].getReal();
                im[y * w + x] = 2.0 * img[y][x].getImaginary();
            }
        }
    }

    private static Complex[][] fft2(Complex[][] a, TransformType type) {
        int h = a.length;
        int w = a[0].length;
        Complex[][] r = new Complex[h][];
        for (int y = 0; y < h; y++) {
            r[y] = FFT.transform(a[y], type);
        }
        for (int x = 0; x < w; x++) {
            Complex[] col = new Complex[h];
            for (int y = 0; y < h; y++) {
                col[y] = r[y][x];
            }
            col = FFT.transform(col, type);
            for (int y = 0; y < h; y++) {
                r[y][x] = col[y];
            }
        }
        return r;
    }
}
