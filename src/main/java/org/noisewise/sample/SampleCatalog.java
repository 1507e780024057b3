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

    /** A rectangle in pixels: top-left corner and size. */
    public record Rect(int x, int y, int w, int h) {
        @Override
        public String toString() {
            return x + "," + y + "," + w + "," + h;
        }
    }

    /** One sample image and what is known about it. */
    public record Sample(String file, String description, int channels, double amplitude, double sigma,
                        long seed, Rect signal, List<Rect> background) {
        /** The true SNR, {@code A / sigma}. */
        public double trueSnr() {
            return amplitude / sigma;
        }

        public float[] generate() {
            return Phantoms.disk(SIZE, SIZE, SIZE / 2.0, SIZE / 2.0, 40, amplitude, sigma, channels, seed);
        }
    }

    private static final Rect SIGNAL = new Rect(49, 49, 30, 30);
    private static final List<Rect> BACKGROUND = List.of(new Rect(2, 2, 24, 24), new Rect(102, 2, 24, 24),
            new Rect(2, 102, 24, 24), new Rect(102, 102, 24, 24));

    public static final List<Sample> SAMPLES = List.of(
            new Sample("aster_disk_1ch.tif",
                    "Aster, single-channel head coil, uniform disk phantom, weekly check",
                    1, 120.0, 5.0, 20261101L, SIGNAL, BACKGROUND),
            new Sample("bramble_disk_8ch.tif",
                    "Bramble, 8-channel array combined by root sum of squares, same phantom",
                    8, 120.0, 5.0, 20261102L, SIGNAL, BACKGROUND),
            new Sample("aster_disk_low-snr.tif",
                    "Aster, thin-slice high-resolution scan: low SNR where the magnitude mean is biased",
                    1, 8.0, 4.0, 20261103L, SIGNAL, BACKGROUND));

    private SampleCatalog() {
    }
}
