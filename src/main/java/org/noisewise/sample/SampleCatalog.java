package org.noisewise.sample;

import java.util.List;

/**
 * The bundled demo images and their truth. The scenario is invented: the imaging-physics bench of
 * the fictional Fernhollow Institute, whose two fictional scanners "Aster" (single-channel
 * head coil) and "Bramble" (8-channel array) scan a uniform disk phantom every week.
 */
public final class SampleCatalog {

    /** Image size of every sample. */
    public static final int SIZE = 128;
    /** Pixel size of the samples in mm (a 256 mm field of view); slices are 5 mm thick. */
    public static final double PIXEL_MM = 2.0;
    /** Disk phantom radius in pixels. */
    public static final double RADIUS = 40;
    /** Radius outside which a masked sample's reconstruction set the background to zero. */
    public static final double MASK_RADIUS = 52;

    /** A rectangle in pixels: top-left corner and size. */
    public record Rect(int x, int y, int w, int h) {
        @Override
        public String toString() {
            return x + "," + y + "," + w + "," + h;
        }
    }

    /** What the demo does with a sample. */
    public enum Use { BACKGROUND, PAIR_FIRST, PAIR_SECOND, REPEATS, MASKED }

    /**
     * One sample file and what is known about it.
     *
     * @param frames number of repeated acquisitions stored as stack slices (1 for a single image)
     */
    public record Sample(String file, String description, Use use, int channels, double amplitude, double sigma,
                         long seed, int frames, Rect signal, List<Rect> background) {
        /** The true SNR, {@code A / sigma}. */
        public double trueSnr() {
            return amplitude / sigma;
        }

        /** The frames, each generated from its own seed. */
        public float[][] generate() {
            float[][] out = new float[frames][];
            for (int f = 0; f < frames; f++) {
                out[f] = Phantoms.disk(SIZE, SIZE, SIZE / 2.0, SIZE / 2.0, RADIUS, amplitude, sigma, channels,
                        seed * 1000 + f);
                if (use == Use.MASKED) {
                    mask(out[f]);
                }
            }
            return out;
        }

        private static void mask(float[] px) {
            double c = SIZE / 2.0;
            for (int y = 0; y < SIZE; y++) {
                for (int x = 0; x < SIZE; x++) {
                    double dx = x + 0.5 - c;
                    double dy = y + 0.5 - c;
                    if (dx * dx + dy * dy > MASK_RADIUS * MASK_RADIUS) {
                        px[y * SIZE + x] = 0f;
                    }
                }
            }
        }
    }

    /** The centred signal region: 30 x 30 pixels, inside the disk. */
    public static final Rect SIGNAL = new Rect(49, 49, 30, 30);
    /** Background regions in the four corners, clear of the disk. */
    public static final List<Rect> BACKGROUND = List.of(new Rect(2, 2, 24, 24), new Rect(102, 2, 24, 24),
            new Rect(2, 102, 24, 24), new Rect(102, 102, 24, 24));

    public static final List<Sample> SAMPLES = List.of(
            new Sample("aster_disk_1ch.tif",
                    "Aster, single-channel head coil, uniform disk phantom, weekly check",
                    Use.BACKGROUND, 1, 120.0, 5.0, 20261101L, 1, SIGNAL, BACKGROUND),
            new Sample("bramble_disk_8ch.tif",
                    "Bramble, 8-channel array combined by root sum of squares, same phantom",
                    Use.BACKGROUND, 8, 120.0, 5.0, 20261102L, 1, SIGNAL, BACKGROUND),
            new Sample("aster_disk_low-snr.tif",
                    "Aster, thin-slice high-resolution scan: low SNR where the magnitude mean is biased",
                    Use.BACKGROUND, 1, 8.0, 4.0, 20261103L, 1, SIGNAL, BACKGROUND),
            new Sample("aster_disk_acq1.tif",
                    "Aster, first of two identical acquisitions a minute apart",
                    Use.PAIR_FIRST, 1, 120.0, 5.0, 20261104L, 1, SIGNAL, BACKGROUND),
            new Sample("aster_disk_acq2.tif",
                    "Aster, second of the two identical acquisitions",
                    Use.PAIR_SECOND, 1, 120.0, 5.0, 20261105L, 1, SIGNAL, BACKGROUND),
            new Sample("aster_disk_repeats.tif",
                    "Aster, 24 repeats of a low-SNR slice (true SNR 2) for the repeated-acquisition method",
                    Use.REPEATS, 1, 20.0, 10.0, 20261106L, 24, SIGNAL, BACKGROUND),
            new Sample("bramble_disk_masked.tif",
                    "Bramble, exported with the background zeroed outside a circular mask",
                    Use.MASKED, 8, 120.0, 5.0, 20261107L, 1, SIGNAL, BACKGROUND));

    private SampleCatalog() {
    }

    /** The first sample with this use. */
    public static Sample first(Use use) {
        return SAMPLES.stream().filter(s -> s.use() == use).findFirst().orElseThrow();
    }
}
