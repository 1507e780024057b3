package org.noisewise.sample;

import java.util.SplittableRandom;

/**
 * The bundled stability series, in the samples' invented scenario: the Fernhollow Institute's
 * scanner "Aster" runs a 102-frame echo-planar series of the disk phantom every week (one slice,
 * 64 x 64 pixels of 4 mm, a frame every 2 s), stored as 16-bit values.
 *
 * <p>What is in it, per frame {@code t = 0 .. 101}: inside the disk the amplitude is
 * {@code A + c(t) + D t / 101}, plus 5% in the first two frames (not yet at steady state), with
 * {@code c(t)} a fluctuation shared by every voxel (SD {@code S}), and complex white noise of SD
 * {@code SIGMA} per voxel, so (frames 3 .. 102 used): SFNR {@code = A / sqrt(SIGMA^2 + S^2)}, static
 * SNR {@code = A / SIGMA}, percent fluctuation {@code = 100 sqrt(S^2 + SIGMA^2 / 441) / A} over the
 * 21 x 21 square, drift about {@code 100 D / A}, and radius of decorrelation
 * {@code sqrt(SIGMA^2 + S^2) / sqrt(S^2 + SIGMA^2 / 441)}.
 */
public final class StabilitySample {

    public static final String FILE = "aster_epi_stability.tif";
    public static final int SIZE = 64;
    public static final int FRAMES = 102;
    public static final double PIXEL_MM = 4.0;
    public static final double FRAME_SECONDS = 2.0;
    public static final double RADIUS = 20;
    public static final double A = 800;
    public static final double SIGMA = 8;
    public static final double S = 2;
    public static final double DRIFT = 4;
    public static final long SEED = 20261108L;

    private StabilitySample() {
    }

    /** The frames as stored (16-bit, rounded). */
    public static short[][] generate() {
        SplittableRandom rng = new SplittableRandom(SEED);
        short[][] out = new short[FRAMES][SIZE * SIZE];
        for (int t = 0; t < FRAMES; t++) {
            double amp = A + S * rng.nextGaussian() + DRIFT * t / (FRAMES - 1.0);
            if (t < 2) {
                amp *= 1.05;
            }
            for (int y = 0; y < SIZE; y++) {
                for (int x = 0; x < SIZE; x++) {
                    double dx = x + 0.5 - SIZE / 2.0;
                    double dy = y + 0.5 - SIZE / 2.0;
                    double a = dx * dx + dy * dy <= RADIUS * RADIUS ? amp : 0.0;
                    long v = Math.round(Phantoms.magnitude(rng, a, SIGMA, 1));
                    out[t][y * SIZE + x] = (short) Math.min(65535, v);
                }
            }
        }
        return out;
    }

    /** The true SFNR over the frames used. */
    public static double trueSfnr() {
        return signal() / Math.sqrt(SIGMA * SIGMA + S * S);
    }

    /** The true static-noise SNR. */
    public static double trueSnr() {
        return signal() / SIGMA;
    }

    /** The mean amplitude over the frames used (3 .. 102). */
    public static double signal() {
        return A + DRIFT * ((2 + FRAMES - 1) / 2.0) / (FRAMES - 1.0);
    }

    public static double truePercentFluctuation() {
        return 100 * Math.sqrt(S * S + SIGMA * SIGMA / 441) / signal();
    }

    public static double trueRdc() {
        return Math.sqrt(SIGMA * SIGMA + S * S) / Math.sqrt(S * S + SIGMA * SIGMA / 441);
    }

    /** The fitted drift over the frames used, percent: the linear ramp's rise over frames 3 .. 102. */
    public static double trueDriftPercent() {
        return 100 * DRIFT * (FRAMES - 3.0) / (FRAMES - 1.0) / signal();
    }
}
