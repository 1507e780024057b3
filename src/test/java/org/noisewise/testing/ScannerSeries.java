package org.noisewise.testing;

import ij.ImagePlus;
import ij.ImageStack;
import ij.measure.Calibration;
import ij.process.ShortProcessor;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.noisewise.io.DicomSeriesWriter;
import org.noisewise.io.DicomWriter;
import org.noisewise.sample.Phantoms;

/**
 * Series of Z slices x T repeats written as a scanner exports them (invented test data with known
 * truth): a 64 x 64 disk phantom per slice whose amplitude differs between slices,
 * {@code A_z = 100 + 20 z} with noise sigma 1, so the true SNRs are 100, 120, 140, 160, ...; values
 * stored as 16-bit integers of a tenth of a unit (rescale slope 0.1, so rounding adds a negligible
 * 1/1200 of sigma squared). The same stored values make the TIFF hyperstack the results are compared
 * with.
 */
public final class ScannerSeries {

    public static final int SIZE = 64;
    /** Signal region inside the disk (radius 20 at the centre). */
    public static final String SIGNAL = "24,24,16,16";
    public static final double SIGMA = 1.0;
    public static final double SLOPE = 0.1;

    private ScannerSeries() {
    }

    /** The true amplitude of slice {@code z} (0-based, in writing order). */
    public static double amplitude(int z) {
        return 100 + 20 * z;
    }

    /** The stored values of slice z, repeat t. */
    public static short[] stored(int z, int t, long seed, double scale) {
        float[] v = Phantoms.disk(SIZE, SIZE, SIZE / 2.0, SIZE / 2.0, 20, amplitude(z) * scale, SIGMA * scale, 1,
                seed * 100_003L + z * 1009L + t);
        short[] s = new short[v.length];
        for (int i = 0; i < v.length; i++) {
            s[i] = (short) Math.round(v[i] / SLOPE);
        }
        return s;
    }

    /** A series spec with every image, rescale slope 0.1 (or per-repeat slopes when {@code perRepeatSlope}). */
    public static DicomSeriesWriter.Spec spec(String name, int slices, int repeats, long seed, boolean perRepeatSlope) {
        DicomSeriesWriter.Spec s = new DicomSeriesWriter.Spec(name, SIZE, SIZE, slices, repeats);
        for (int z = 0; z < slices; z++) {
            for (int t = 0; t < repeats; t++) {
                // with per-repeat slopes, the stored numbers scale inversely so the values stay the same physics
                double slope = perRepeatSlope ? SLOPE * (1 + 0.5 * (t % 3)) : SLOPE;
                short[] px = stored(z, t, seed, SLOPE / slope);
                s.image(z, t, px, slope, 0);
            }
        }
        s.common().text(0x00080070, "LO", "Fernhollow Test Bench").text(0x00081090, "LO", "Aster")
                .decimals(0x00180080, 2000).decimals(0x00180087, 3).text(0x00180023, "CS", "2D");
        return s;
    }

    /** Writes the single-frame files into a new folder {@code dir/name}. */
    public static Path folder(DicomSeriesWriter.Spec spec, Path dir, String name) {
        return write(DicomSeriesWriter.singleFrame(spec), dir, name);
    }

    /** Writes the series as Siemens mosaics (a file per repeat) into a new folder {@code dir/name}. */
    public static Path mosaicFolder(DicomSeriesWriter.Spec spec, Path dir, String name) {
        return write(DicomSeriesWriter.mosaic(spec), dir, name);
    }

    private static Path write(java.util.List<DicomSeriesWriter.File> files, Path dir, String name) {
        try {
            Path f = Files.createDirectories(dir.resolve(name));
            for (DicomSeriesWriter.File file : files) {
                Files.write(f.resolve(file.name()), file.bytes());
            }
            return f;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Writes one enhanced multi-frame file. */
    public static Path enhanced(DicomSeriesWriter.Spec spec, Path dir, String name) {
        try {
            Path f = dir.resolve(name);
            Files.write(f, DicomSeriesWriter.enhanced(spec));
            return f;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** The same data as a 16-bit TIFF hyperstack (z slices, time frames) with the rescale as ImageJ calibration. */
    public static Path tiff(int slices, int repeats, long seed, Path dir, String name) {
        ImageStack st = new ImageStack(SIZE, SIZE);
        for (int t = 0; t < repeats; t++) {
            for (int z = 0; z < slices; z++) {
                st.addSlice(new ShortProcessor(SIZE, SIZE, stored(z, t, seed, 1), null));
            }
        }
        ImagePlus imp = new ImagePlus(name, st);
        imp.setDimensions(1, slices, repeats);
        imp.setOpenAsHyperStack(true);
        Calibration cal = imp.getCalibration();
        cal.setFunction(Calibration.STRAIGHT_LINE, new double[] {0, SLOPE}, "Gray Value");
        return TestImages.saveTiff(imp, dir, name);
    }

    /** A DICOM UID for test objects. */
    public static String uid(String name) {
        return DicomWriter.uid(name);
    }
}
