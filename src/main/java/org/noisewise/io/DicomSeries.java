package org.noisewise.io;

import ij.ImagePlus;
import ij.ImageStack;
import ij.Prefs;
import ij.io.Opener;
import ij.measure.Calibration;
import ij.process.FloatProcessor;
import ij.process.ImageProcessor;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.noisewise.estimate.InputException;

/**
 * A DICOM series from a folder: files grouped by Series Instance UID (0020,000E), sorted by
 * Instance Number (0020,0013), then by position along the slice direction (0020,0032), then by
 * name; read through ImageJ's DICOM reader with {@code Prefs.fixedDicomScaling} so rescale slope
 * and intercept and signed data come through ImageJ's calibration. Slices that share one calibration
 * stay in their stored type; otherwise each slice is converted to its calibrated 32-bit values.
 */
public final class DicomSeries {

    private DicomSeries() {
    }

    /** One series found in a folder. */
    public record Series(String uid, List<Path> files) {
    }

    /** The DICOM files directly in {@code folder}, grouped by series, in a deterministic order. */
    public static List<Series> find(Path folder) throws InputException {
        List<Path> files;
        try (Stream<Path> s = Files.list(folder)) {
            files = s.filter(Files::isRegularFile).sorted().toList();
        } catch (IOException e) {
            throw new InputException("cannot list folder '" + folder + "': " + e.getMessage());
        }
        Map<String, List<Path>> groups = new LinkedHashMap<>();
        for (Path f : files) {
            if (!isDicom(f)) {
                continue;
            }
            ImagePlus header = openSilently(f);
            String uid = header == null ? null : ImageMetadata.tag(header, "0020,000E");
            groups.computeIfAbsent(uid == null ? "(no series UID)" : uid, k -> new ArrayList<>()).add(f);
        }
        List<Series> out = new ArrayList<>();
        groups.forEach((uid, list) -> out.add(new Series(uid, list)));
        return out;
    }

    /** True when the file carries the DICOM preamble ("DICM" at byte 128) or ImageJ calls it DICOM. */
    public static boolean isDicom(Path f) {
        try (var in = Files.newInputStream(f)) {
            byte[] head = in.readNBytes(132);
            if (head.length == 132 && head[128] == 'D' && head[129] == 'I' && head[130] == 'C' && head[131] == 'M') {
                return true;
            }
        } catch (IOException e) {
            return false;
        }
        return new Opener().getFileType(f.toString()) == Opener.DICOM;
    }

    /** Opens one series as a stack. */
    public static ImagePlus open(Series series, String title) throws InputException {
        Prefs.fixedDicomScaling = true;
        List<ImagePlus> slices = new ArrayList<>();
        for (Path f : series.files()) {
            FileChecks.requireDecodableDicom(f);
            ImagePlus imp = read(f);
            if (imp == null) {
                throw new InputException("cannot read DICOM file '" + f + "': ImageJ does not recognise its contents "
                        + "(damaged, or not an image); remove it from the folder or export the series again");
            }
            FileChecks.requireWhole(f, imp);
            ImagePlanes.requireGrayscale(imp);
            slices.add(imp);
        }
        if (slices.isEmpty()) {
            throw new InputException("no DICOM files in series " + series.uid());
        }
        slices.sort(Comparator.comparingDouble((ImagePlus i) -> number(ImageMetadata.tag(i, "0020,0013")))
                .thenComparingDouble(i -> position(ImageMetadata.tag(i, "0020,0032"))));
        ImagePlus first = slices.get(0);
        int w = first.getWidth();
        int h = first.getHeight();
        boolean sameCalibration = true;
        for (ImagePlus s : slices) {
            if (s.getWidth() != w || s.getHeight() != h) {
                throw new InputException("the series mixes image sizes (" + w + "x" + h + " and " + s.getWidth() + "x"
                        + s.getHeight() + "): put each series in its own folder");
            }
            sameCalibration &= s.getBitDepth() == first.getBitDepth()
                    && Arrays.equals(s.getCalibration().getCTable(), first.getCalibration().getCTable());
        }
        if (slices.size() == 1) {
            return first;
        }
        ImageStack stack = new ImageStack(w, h);
        List<org.noisewise.diagnose.BackgroundCheck.Storage> storage = new ArrayList<>();
        for (ImagePlus s : slices) {
            for (int n = 1; n <= s.getStackSize(); n++) {
                ImageProcessor ip = s.getStack().getProcessor(n);
                storage.add(BackgroundValues.storage(s));
                if (sameCalibration) {
                    stack.addSlice(s.getTitle(), ip);
                } else {
                    stack.addSlice(s.getTitle(), new FloatProcessor(w, h, ImagePlanes.calibratedPixels(s, n)));
                }
            }
        }
        ImagePlus out = new ImagePlus(title, stack);
        Calibration cal = first.getCalibration().copy();
        if (!sameCalibration) {
            // the slices were stored with different scaling: keep each slice's storage facts
            cal.disableDensityCalibration();
            out.setProperty(BackgroundValues.PER_SLICE_PROPERTY,
                    storage.toArray(new org.noisewise.diagnose.BackgroundCheck.Storage[0]));
        }
        out.setCalibration(cal);
        out.setProperty("Info", first.getProperty("Info"));
        return out;
    }

    /** Opens any ImageJ-readable file with DICOM rescaling fixed and no dialogs; null when it cannot. */
    static ImagePlus openSilently(Path f) {
        try {
            return read(f);
        } catch (InputException e) {
            return null;
        }
    }

    /**
     * Opens any ImageJ-readable file with DICOM rescaling fixed and no dialogs: null when ImageJ does
     * not recognise the file, an error naming the cause when its reader fails on it.
     */
    static ImagePlus read(Path f) throws InputException {
        Prefs.fixedDicomScaling = true;
        Opener o = new Opener();
        o.setSilentMode(true);
        try {
            return o.openImage(f.toString());
        } catch (RuntimeException e) {
            throw new InputException("cannot read '" + f + "': ImageJ's reader failed on it (" + e.getClass()
                    .getSimpleName() + (e.getMessage() == null ? "" : ": " + e.getMessage()) + "); the file is damaged or "
                    + "in a form ImageJ does not support: export it again as TIFF or uncompressed DICOM");
        }
    }

    private static double number(String s) {
        try {
            return s == null ? Double.MAX_VALUE : Double.parseDouble(s.trim());
        } catch (NumberFormatException e) {
            return Double.MAX_VALUE;
        }
    }

    private static double position(String s) {
        if (s == null) {
            return 0;
        }
        String[] p = s.trim().split("\\\\");
        return p.length == 3 ? number(p[2]) : 0;
    }
}
