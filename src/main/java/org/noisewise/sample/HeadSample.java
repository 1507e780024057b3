package org.noisewise.sample;

import java.util.SplittableRandom;

/**
 * The bundled head-like sample, in the samples' invented scenario: the Fernhollow Institute's
 * single-channel scanner "Aster" scans a head-shaped gel phantom (an ellipse with a darker inner
 * ellipse) whose reconstruction carries an 8% Nyquist ghost along the phase-encoding direction (up
 * and down) and a zero-filled band of {@value #ZERO_BAND} columns at each side, stored as 16-bit
 * integers. 128 x 128 pixels of 2 mm.
 *
 * <p>Truth: sigma {@value #SIGMA} per channel, outer amplitude {@value #OUTER}, inner
 * {@value #INNER}; the ghost is the object shifted by half the field of view, at 8% of its
 * amplitude, added before the magnitude. Air drawn in the four corners takes in ghost; the
 * automatic air leaves it out.
 */
public final class HeadSample {

    public static final String FILE = "aster_head_ghost.tif";
    public static final int SIZE = 128;
    public static final double SIGMA = 4;
    public static final double OUTER = 100;
    public static final double INNER = 60;
    public static final double GHOST = 0.08;
    public static final int ZERO_BAND = 6;
    public static final long SEED = 20261111L;
    /** A signal region in the outer part of the head, in the band of rows the ghost does not reach. */
    public static final SampleCatalog.Rect SIGNAL = new SampleCatalog.Rect(24, 56, 16, 16);

    private HeadSample() {
    }

    /** The true SNR of the signal region, {@code OUTER / SIGMA}. */
    public static double trueSnr() {
        return OUTER / SIGMA;
    }

    /** The object's amplitude at pixel centre (x, y) before the ghost. */
    static double object(double x, double y) {
        double dx = (x - SIZE / 2.0) / 44;
        double dy = (y - SIZE / 2.0) / 54;
        double ix = (x - SIZE / 2.0) / 16;
        double iy = (y - SIZE / 2.0 - 6) / 20;
        if (ix * ix + iy * iy <= 1) {
            return INNER;
        }
        return dx * dx + dy * dy <= 1 ? OUTER : 0;
    }

    /** The slice as stored (16-bit values). */
    public static short[] generate() {
        SplittableRandom rng = new SplittableRandom(SEED);
        short[] out = new short[SIZE * SIZE];
        for (int y = 0; y < SIZE; y++) {
            for (int x = 0; x < SIZE; x++) {
                double a = object(x + 0.5, y + 0.5) + GHOST * object(x + 0.5, (y + SIZE / 2) % SIZE + 0.5);
                double re = a + SIGMA * rng.nextGaussian();
                double im = SIGMA * rng.nextGaussian();
                long v = Math.round(Math.sqrt(re * re + im * im));
                out[y * SIZE + x] = x < ZERO_BAND || x >= SIZE - ZERO_BAND ? 0 : (short) Math.min(65535, v);
            }
        }
        return out;
    }
}
