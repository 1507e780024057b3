package org.noisewise.sample;

/**
 * The bundled DICOM series, in the samples' invented scenario: the fictional Aster scanner exports a
 * 4-slice scan of the disk phantom repeated 10 times as one MR Image Storage file per image, the way
 * scanners write them (Image Position and Orientation (Patient), Instance Numbers running through all
 * slices of repeat 1, then repeat 2, ..., a Temporal Position Identifier per repeat, rescale slope 0.1).
 * The slices differ in amplitude, as the slices of any real phantom do: slice z (1 to 4, feet to head)
 * has {@code A = 80 + 20 z} with noise sigma 1, so the true SNRs are 100, 120, 140 and 160.
 */
public final class DicomSample {

    /** The sample's folder under sample-images/. */
    public static final String FOLDER = "aster_multislice_dicom";
    public static final int SIZE = 64;
    public static final int SLICES = 4;
    public static final int REPEATS = 10;
    public static final double SIGMA = 1.0;
    /** Rescale slope: values are stored in tenths. */
    public static final double SLOPE = 0.1;
    public static final double PIXEL_MM = 4.0;
    public static final double THICKNESS_MM = 5.0;
    /** Distance between slice centres along the normal. */
    public static final double STEP_MM = 6.0;
    public static final double RADIUS = 22;
    public static final long SEED = 20261119L;
    /** Signal region inside the disk, x,y,w,h. */
    public static final SampleCatalog.Rect SIGNAL = new SampleCatalog.Rect(24, 24, 16, 16);
    public static final String DESCRIPTION = "Aster, 4 slices x 10 repeats of the disk phantom as the scanner exports "
            + "them: one MR Image Storage file per image, Temporal Position Identifier per repeat, rescale slope 0.1";

    private DicomSample() {
    }

    /** The true amplitude of slice {@code z} (1-based, in increasing position along the normal). */
    public static double amplitude(int z) {
        return 80 + 20 * z;
    }

    /** The true SNR of slice {@code z} (1-based). */
    public static double trueSnr(int z) {
        return amplitude(z) / SIGMA;
    }

    /** The stored (16-bit, tenths) values of slice z, repeat t (both 1-based). */
    public static short[] stored(int z, int t) {
        float[] v = Phantoms.disk(SIZE, SIZE, SIZE / 2.0, SIZE / 2.0, RADIUS, amplitude(z), SIGMA, 1,
                SEED * 1000 + z * 100 + t);
        short[] s = new short[v.length];
        for (int i = 0; i < v.length; i++) {
            s[i] = (short) Math.round(v[i] / SLOPE);
        }
        return s;
    }
}
