package org.noisewise.sample;

import java.util.SplittableRandom;

/**
 * Synthetic MR magnitude images with known truth: a uniform disk of amplitude {@code A} on an air
 * background, each of {@code L} receive channels carrying complex Gaussian noise of SD
 * {@code sigma} per component, combined by root sum of squares. The signal is split equally over
 * the channels, so the combined noise-free amplitude is {@code A} and the true SNR is
 * {@code A / sigma}. Used for the bundled samples, the demo and the tests.
 */
public final class Phantoms {

    private Phantoms() {
    }

    /**
     * @param width   image width
     * @param height  image height
     * @param cx      disk centre x (pixel coordinates, centres at +0.5)
     * @param cy      disk centre y
     * @param radius  disk radius in pixels
     * @param amplitude  true amplitude A inside the disk
     * @param sigma   per-component noise SD of each channel
     * @param channels number of channels L
     * @param seed    random seed
     */
    public static float[] disk(int width, int height, double cx, double cy, double radius, double amplitude,
                               double sigma, int channels, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        float[] out = new float[width * height];
        double perChannel = amplitude / Math.sqrt(channels);
        for (int y = 0; y < height; y++) {
            for (int x = 0; x < width; x++) {
                double dx = x + 0.5 - cx;
                double dy = y + 0.5 - cy;
                double a = dx * dx + dy * dy <= radius * radius ? perChannel : 0.0;
                out[y * width + x] = (float) magnitude(rng, a, sigma, channels);
            }
        }
        return out;
    }

    /** One L-channel root-sum-of-squares magnitude with per-channel amplitude {@code a}. */
    public static double magnitude(SplittableRandom rng, double a, double sigma, int channels) {
        double sum = 0;
        for (int c = 0; c < channels; c++) {
            double re = a + sigma * rng.nextGaussian();
            double im = sigma * rng.nextGaussian();
            sum += re * re + im * im;
        }
        return Math.sqrt(sum);
    }
}
