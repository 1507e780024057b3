package org.noisewise.sample;

import java.util.SplittableRandom;

/**
 * The bundled two-tissue sample, in the samples' invented scenario: the Fernhollow Institute's
 * 8-channel scanner "Bramble" scans a two-compartment gel phantom (an outer gel with a darker gel
 * insert) four times in a row, for contrast-to-noise checks. 128 x 128 pixels of 2 mm, 32-bit,
 * the four repeats as stack slices.
 *
 * <p>What is in it: the outer gel (radius {@value #RADIUS} pixels, centred) has amplitude
 * {@value #OUTER}, the insert (radius {@value #INSERT_RADIUS}, centred {@value #INSERT_DY} pixels
 * below the centre) {@value #INSERT}, with white complex noise of SD {@value #SIGMA} in each of
 * {@value #CHANNELS} channels combined by root sum of squares: the true CNR is
 * {@code (50 - 10) / 5 = 8} and the plain CNR {@code (mean_8(10) - mean_8(2))} about 6.32.
 */
public final class TissueSample {

    public static final String FILE = "bramble_two_gels_repeats.tif";
    public static final int SIZE = 128;
    public static final int REPEATS = 4;
    public static final int CHANNELS = 8;
    public static final double RADIUS = 40;
    public static final double INSERT_RADIUS = 14;
    public static final double INSERT_DY = 16;
    public static final double OUTER = 50;
    public static final double INSERT = 10;
    public static final double SIGMA = 5;
    public static final long SEED = 20261110L;
    /** The signal region in the outer gel, clear of the insert. */
    public static final SampleCatalog.Rect SIGNAL = new SampleCatalog.Rect(54, 30, 20, 20);
    /** The contrast region inside the insert. */
    public static final SampleCatalog.Rect CONTRAST = new SampleCatalog.Rect(56, 72, 16, 16);

    private TissueSample() {
    }

    /** The true contrast-to-noise ratio {@code (A_outer - A_insert) / sigma}. */
    public static double trueCnr() {
        return (OUTER - INSERT) / SIGMA;
    }

    /** The repeats, each from its own seed. */
    public static float[][] generate() {
        float[][] out = new float[REPEATS][SIZE * SIZE];
        double c = SIZE / 2.0;
        for (int t = 0; t < REPEATS; t++) {
            SplittableRandom rng = new SplittableRandom(SEED * 1000 + t);
            for (int y = 0; y < SIZE; y++) {
                for (int x = 0; x < SIZE; x++) {
                    double dx = x + 0.5 - c;
                    double dy = y + 0.5 - c;
                    double di = y + 0.5 - (c + INSERT_DY);
                    double a = dx * dx + di * di <= INSERT_RADIUS * INSERT_RADIUS ? INSERT
                            : dx * dx + dy * dy <= RADIUS * RADIUS ? OUTER : 0.0;
                    out[t][y * SIZE + x] = (float) Phantoms.magnitude(rng, a / Math.sqrt(CHANNELS), SIGMA, CHANNELS);
                }
            }
        }
        return out;
    }
}
