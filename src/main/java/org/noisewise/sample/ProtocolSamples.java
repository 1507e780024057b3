package org.noisewise.sample;

import java.util.List;
import java.util.SplittableRandom;

/**
 * The bundled protocol samples, in the samples' invented scenario: the Fernhollow bench scans its disk
 * phantom on the fictional Aster scanner (1.5 T) with protocols that differ in averages and in
 * parallel-imaging acceleration, each repeated so that the repeated-acquisition method applies. Every
 * series is 64 x 64 pixels of 4 mm, 5 mm slices, stored as 32-bit values with DICOM-style header lines
 * (as ImageJ keeps a DICOM header with an image), so the protocol is read as from a scanner's files.
 *
 * <p>Truth: {@code avg2} has sigma 8 and {@code avg8} sigma 4 at amplitude 100 (true SNR 12.5 and 25,
 * ratio 2, as four times the averages predicts); {@code full} has sigma 4 at amplitude 200 and
 * {@code accel2} sigma {@code 4 sqrt(2) g(x)} with {@code g(x) = 1 + 0.5 x / 63} (R = 2).
 */
public final class ProtocolSamples {

    public static final int SIZE = 64;
    public static final double PIXEL_MM = 4.0;
    public static final double RADIUS = 26;

    /** One series. */
    public record Series(String file, String description, int repeats, double amplitude, double sigma,
                         boolean gRamp, int averages, double acceleration, long seed) {

        /** The frames, each {@code SIZE x SIZE}. */
        public float[][] generate() {
            SplittableRandom rng = new SplittableRandom(seed);
            float[][] f = new float[repeats][SIZE * SIZE];
            double c = (SIZE - 1) / 2.0;
            for (int t = 0; t < repeats; t++) {
                for (int y = 0; y < SIZE; y++) {
                    for (int x = 0; x < SIZE; x++) {
                        boolean in = Math.hypot(x - c, y - c) <= RADIUS;
                        double s = sigma * (gRamp ? Math.sqrt(acceleration) * g(x) : 1.0);
                        double re = (in ? amplitude : 0) + s * rng.nextGaussian();
                        double im = s * rng.nextGaussian();
                        f[t][y * SIZE + x] = (float) Math.hypot(re, im);
                    }
                }
            }
            return f;
        }

        /** DICOM-style header lines stating the protocol. */
        public String header() {
            StringBuilder sb = new StringBuilder();
            sb.append("Noisewise generated sample (invented scenario): ").append(description).append('\n');
            sb.append("0008,0070  Manufacturer: Fernhollow Institute (fictional)\n");
            sb.append("0008,1090  Manufacturers Model Name: Aster\n");
            sb.append("0018,0023  MR Acquisition Type: 2D\n");
            sb.append("0018,0050  Slice Thickness: 5\n");
            sb.append("0018,0083  Number of Averages: ").append(averages).append('\n');
            sb.append("0018,0087  Magnetic Field Strength: 1.5\n");
            sb.append("0018,0089  Number of Phase Encoding Steps: 64\n");
            sb.append("0018,0095  Pixel Bandwidth: 130\n");
            sb.append("0018,1310  Acquisition Matrix: 64 0 0 64\n");
            sb.append("0018,1312  In-plane Phase Encoding Direction: COL\n");
            if (acceleration > 1) {
                sb.append("0018,9069  Parallel Reduction Factor In-plane: ").append(acceleration).append('\n');
            }
            sb.append("0028,0030  Pixel Spacing: 4\\4\n");
            return sb.toString();
        }
    }

    /** The g-factor profile of the accelerated sample. */
    public static double g(int x) {
        return 1 + 0.5 * x / (SIZE - 1.0);
    }

    public static final Series AVG2 = new Series("aster_avg2_series.tif", "Aster, 2 averages, 8 repeats", 8, 100, 8,
            false, 2, 1, 20261201L);
    public static final Series AVG8 = new Series("aster_avg8_series.tif", "Aster, 8 averages, 8 repeats", 8, 100, 4,
            false, 8, 1, 20261202L);
    public static final Series FULL = new Series("aster_full_series.tif", "Aster, unaccelerated, 12 repeats", 12, 200, 4,
            false, 1, 1, 20261203L);
    public static final Series ACCEL2 = new Series("aster_accel2_series.tif",
            "Aster, parallel imaging R = 2 with a g-factor ramp 1 to 1.5 from left to right, 12 repeats", 12, 200, 4,
            true, 1, 2, 20261204L);

    public static final List<Series> ALL = List.of(AVG2, AVG8, FULL, ACCEL2);

    private ProtocolSamples() {
    }
}
