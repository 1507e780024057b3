package org.noisewise.sample;

import java.util.SplittableRandom;

/**
 * The bundled noise-only-scan pair, in the samples' invented scenario: the Fernhollow Institute's
 * 4-channel array on "Bramble" scans the disk phantom with parallel imaging (reduction 2 along x), so
 * the noise is amplified by a g-factor that peaks in the middle columns; the same protocol is then run
 * with the RF transmitter off, giving the noise-only scan. Both 128 x 128 pixels of 2 mm, 32-bit.
 *
 * <p>Truth: amplitude {@value #AMPLITUDE} in a disk of radius {@value #RADIUS} pixels, sigma per
 * channel {@code SIGMA * g(x)} with {@code g(x) = 1 + 0.8 exp(-(x - 64)^2 / (2 * 20^2))} (1.8 in the
 * middle columns, 1.0-1.1 in the corners); each pixel's complex noise is independent in each channel, the signal
 * split equally over the channels and combined by root sum of squares. Air drawn in the corners sees
 * sigma about 5.2; the middle of the disk has about 8.9.
 */
public final class NoiseScanSample {

    public static final String IMAGE = "bramble_accel_image.tif";
    public static final String NOISE = "bramble_accel_noise.tif";
    public static final int SIZE = 128;
    public static final int CHANNELS = 4;
    public static final double SIGMA = 5;
    public static final double AMPLITUDE = 120;
    public static final double RADIUS = 50;
    public static final long SEED = 20261201L;
    public static final long NOISE_SEED = 20261202L;
    /** A region in the middle of the disk, where the g-factor peaks. */
    public static final SampleCatalog.Rect CENTRE = new SampleCatalog.Rect(56, 56, 16, 16);
    /** A region near the disk's left edge, where the g-factor is about 1.1. */
    public static final SampleCatalog.Rect EDGE = new SampleCatalog.Rect(18, 56, 12, 16);

    private NoiseScanSample() {
    }

    /** The g-factor at pixel column {@code x}. */
    public static double g(int x) {
        double d = x + 0.5 - SIZE / 2.0;
        return 1 + 0.8 * Math.exp(-d * d / (2 * 20.0 * 20.0));
    }

    /** The true local sigma of a region: the RMS of {@code SIGMA g(x)} over its pixels. */
    public static double trueSigma(SampleCatalog.Rect r) {
        double s = 0;
        for (int x = r.x(); x < r.x() + r.w(); x++) {
            s += g(x) * g(x);
        }
        return SIGMA * Math.sqrt(s / r.w());
    }

    /** The true SNR of a region inside the disk. */
    public static double trueSnr(SampleCatalog.Rect r) {
        return AMPLITUDE / trueSigma(r);
    }

    /** The accelerated image. */
    public static float[] image() {
        return generate(SEED, AMPLITUDE);
    }

    /** The noise-only scan (transmitter off). */
    public static float[] noise() {
        return generate(NOISE_SEED, 0.0);
    }

    private static float[] generate(long seed, double amplitude) {
        SplittableRandom rng = new SplittableRandom(seed);
        double[] sum = new double[SIZE * SIZE];
        double per = amplitude / Math.sqrt(CHANNELS);
        for (int c = 0; c < CHANNELS; c++) {
            for (int y = 0; y < SIZE; y++) {
                for (int x = 0; x < SIZE; x++) {
                    double dx = x + 0.5 - SIZE / 2.0;
                    double dy = y + 0.5 - SIZE / 2.0;
                    double a = dx * dx + dy * dy <= RADIUS * RADIUS ? per : 0.0;
                    double s = SIGMA * g(x);
                    double re = a + s * rng.nextGaussian();
                    double im = s * rng.nextGaussian();
                    sum[y * SIZE + x] += re * re + im * im;
                }
            }
        }
        float[] out = new float[sum.length];
        for (int i = 0; i < out.length; i++) {
            out[i] = (float) Math.sqrt(sum[i]);
        }
        return out;
    }
}
