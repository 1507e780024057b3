package org.noisewise.io;

import ij.ImagePlus;
import ij.ImageStack;
import ij.Prefs;
import ij.io.Opener;
import ij.measure.Calibration;
import ij.process.FloatProcessor;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.estimate.Blocks;
import org.noisewise.estimate.InputException;

/**
 * A DICOM series as the scanner acquired it: the files of a folder grouped by Series Instance UID
 * (0020,000E), or one multi-frame file, arranged as Z slices x T repeats by {@link SeriesLayout}
 * from their headers and returned as an ImageJ hyperstack ({@code slices = Z, frames = T}). Files
 * are read in one pass each ({@link DicomFile}: headers, per-frame functional groups and stored
 * values), on every core; ImageJ's own DICOM reader gives the first file's header text (the image's
 * {@code Info}, which the protocol and QA facts are read from). Rescale slope and intercept come
 * through ImageJ's calibration when every image shares them, otherwise each plane is converted to
 * its calibrated 32-bit values and keeps its own storage facts.
 */
public final class DicomSeries {

    private DicomSeries() {
    }

    /** One series found in a folder. */
    public record Series(String uid, List<Path> files) {
        public Series {
            files = List.copyOf(files);
        }
    }

    /** The DICOM files directly in {@code folder}, grouped by series, in a deterministic order. */
    public static List<Series> find(Path folder) throws InputException {
        return scan(folder, p -> true).series();
    }

    /**
     * What a folder holds directly: its DICOM files grouped by series (in a deterministic order), its
     * other regular files (by name), and its DICOM objects that are not images (a DICOMDIR, reports,
     * presentation states: {@link DicomFile#notAnImage}). Every file's header is read once, on every
     * core; only a file that does not parse as DICOM is asked again whether ImageJ calls it DICOM.
     */
    public record Contents(List<Series> series, List<Path> others, List<Path> nonImages) {
    }

    /** The contents of {@code folder}, leaving out the entries {@code keep} rejects (never read). */
    public static Contents scan(Path folder, java.util.function.Predicate<Path> keep) throws InputException {
        List<Path> files = new ArrayList<>();
        for (Path p : entries(folder)) {
            if (keep.test(p)) {
                files.add(p);
            }
        }
        String[] uids = new String[files.size()];
        // 1: DICOM; 2: a DICOM object that is not an image; 0: another regular file; -1: not a regular file (a
        // subfolder, a link to nothing)
        byte[] kind = new byte[files.size()];
        Blocks.tasks(files.size(), i -> {
            Path f = files.get(i);
            DicomFile d;
            try {
                d = DicomFile.read(f, false);
            } catch (InputException e) {
                kind[i] = (byte) (!Files.isRegularFile(f) ? -1 : isDicom(f) ? 1 : 0);
                return;
            }
            if (d != null) {
                kind[i] = (byte) (d.notAnImage() ? 2 : 1);
                uids[i] = d.seriesUid();
            } else {
                kind[i] = (byte) (isDicom(f) ? 1 : 0);
            }
        });
        Map<String, List<Path>> groups = new LinkedHashMap<>();
        List<Path> others = new ArrayList<>();
        List<Path> nonImages = new ArrayList<>();
        for (int i = 0; i < files.size(); i++) {
            if (kind[i] == 1) {
                groups.computeIfAbsent(uids[i] == null ? "(no series UID)" : uids[i], k -> new ArrayList<>())
                        .add(files.get(i));
            } else if (kind[i] == 2) {
                nonImages.add(files.get(i));
            } else if (kind[i] == 0) {
                others.add(files.get(i));
            }
        }
        List<Series> out = new ArrayList<>();
        groups.forEach((uid, list) -> out.add(new Series(uid, list)));
        return new Contents(out, others, nonImages);
    }

    /**
     * The entries directly in a folder, by name. Whether each is a file is not asked here (one call
     * per entry, slow for thousands): an entry that cannot be read as a file is left out where it is
     * read, when it is not a regular file.
     */
    static List<Path> entries(Path folder) throws InputException {
        String[] names = folder.toFile().list();
        if (names == null) {
            throw new InputException("cannot list folder '" + folder + "': check that it exists and can be read");
        }
        java.util.Arrays.sort(names);
        List<Path> out = new ArrayList<>(names.length);
        for (String n : names) {
            out.add(folder.resolve(n));
        }
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

    /**
     * Opens the one series a folder holds as a Z x T hyperstack, reading each file once (headers and
     * pixels together); an error names the number of series when there are several.
     */
    public static ImagePlus openFolder(Path folder, String title, Integer echo, String echoHint)
            throws InputException {
        List<Path> all = entries(folder);
        if (all.isEmpty()) {
            throw new InputException("folder '" + folder + "' holds no DICOM files: give an image file or a folder of "
                    + "one DICOM series");
        }
        DicomFile[] files = new DicomFile[all.size()];
        InputException[] failed = new InputException[all.size()];
        boolean[] dicom = new boolean[all.size()];
        // task 0 makes ImageJ's header text of the first file (its Info) while the others parse the files;
        // one of the same tasks, so that its failure (a full heap) is reported like theirs
        String[] info = new String[1];
        Blocks.tasks(all.size() + 1, task -> {
            if (task == 0) {
                info[0] = headerText(all.get(0));
                return;
            }
            int i = task - 1;
            try {
                files[i] = DicomFile.read(all.get(i), true);
                dicom[i] = files[i] != null || isDicom(all.get(i));
            } catch (InputException e) {
                // a subfolder (or a link to nothing) is not part of the series
                dicom[i] = Files.isRegularFile(all.get(i));
                failed[i] = dicom[i] ? e : null;
            }
        });
        for (InputException e : failed) {
            if (e != null) {
                // a damaged file cannot be placed in any series: say what is wrong with it
                throw e;
            }
        }
        Map<String, List<Integer>> groups = new LinkedHashMap<>();
        List<String> nonImages = new ArrayList<>();
        for (int i = 0; i < all.size(); i++) {
            if (dicom[i] && files[i] != null && files[i].notAnImage()) {
                nonImages.add(all.get(i).getFileName().toString());
            } else if (dicom[i]) {
                String uid = files[i] == null ? null : files[i].seriesUid();
                groups.computeIfAbsent(uid == null ? "(no series UID)" : uid, k -> new ArrayList<>()).add(i);
            }
        }
        if (groups.isEmpty() && !nonImages.isEmpty()) {
            throw new InputException("folder '" + folder + "' holds no DICOM images, only " + nonImages.size()
                    + " DICOM file(s) that are not images (" + firstNames(nonImages) + "): give the folder of one series (an export keeps its "
                    + "images in sub-folders), or run batch on the whole export");
        }
        if (groups.isEmpty()) {
            throw new InputException("folder '" + folder + "' holds no DICOM files: give an image file or a folder of "
                    + "one DICOM series");
        }
        if (groups.size() > 1) {
            throw new InputException("folder '" + folder + "' holds " + groups.size() + " DICOM series: give a folder "
                    + "with one series, or use batch");
        }
        List<Integer> members = groups.values().iterator().next();
        List<DicomFile> read = new ArrayList<>();
        for (int i : members) {
            if (files[i] == null) {
                throw new InputException("cannot read DICOM file '" + all.get(i) + "': it does not look like DICOM "
                        + "(damaged, or not an image); remove it from the folder or export the series again");
            }
            read.add(files[i]);
        }
        String text = members.get(0) == 0 ? info[0] : headerText(read.get(0).path());
        ImagePlus out = assemble(read.toArray(new DicomFile[0]), title, echo, echoHint, text);
        if (!nonImages.isEmpty()) {
            Arrangement.mark(out, Arrangement.note(out) + "; left out " + nonImages.size() + " DICOM file"
                    + (nonImages.size() == 1 ? "" : "s") + " that " + (nonImages.size() == 1 ? "is" : "are")
                    + " not an image (no pixel data: a DICOMDIR, a report or a presentation state): "
                    + firstNames(nonImages));
        }
        return out;
    }

    /**
     * Opens one series as a Z x T hyperstack.
     *
     * @param echo     the echo to keep (1-based) when the series holds several, or null
     * @param echoHint what the user does to choose an echo, in the face's words
     */
    public static ImagePlus open(Series series, String title, Integer echo, String echoHint) throws InputException {
        List<Path> paths = series.files();
        if (paths.isEmpty()) {
            throw new InputException("no DICOM files in series " + series.uid());
        }
        DicomFile[] files = new DicomFile[paths.size()];
        InputException[] failed = new InputException[paths.size()];
        Blocks.tasks(paths.size(), i -> {
            try {
                files[i] = DicomFile.read(paths.get(i), true);
                if (files[i] == null) {
                    failed[i] = new InputException("cannot read DICOM file '" + paths.get(i) + "': it does not look "
                            + "like DICOM (damaged, or not an image); remove it from the folder or export the series "
                            + "again");
                }
            } catch (InputException e) {
                failed[i] = e;
            }
        });
        for (InputException e : failed) {
            if (e != null) {
                throw e;
            }
        }
        return assemble(files, title, echo, echoHint, headerText(files[0].path()));
    }

    /** Opens one DICOM file (single- or multi-frame), arranged the same way. */
    public static ImagePlus openFile(Path file, Integer echo, String echoHint) throws InputException {
        DicomFile f = DicomFile.read(file, true);
        if (f == null) {
            return null;
        }
        return assemble(new DicomFile[] {f}, file.getFileName().toString(), echo, echoHint, headerText(file));
    }

    private static ImagePlus assemble(DicomFile[] files, String title, Integer echo, String echoHint, String info)
            throws InputException {
        DicomFile first = files[0];
        requirePixels(first, files.length);
        Mosaic mosaic = Mosaic.of(first);
        int w = mosaic == null ? first.columns() : mosaic.tileWidth();
        int h = mosaic == null ? first.rows() : mosaic.tileHeight();
        // a mosaic's slices are placed one step apart along the normal, in their stored order
        double step = Mosaic.step(first.thickness(), first.spacingBetween());
        List<SeriesLayout.Item> items = new ArrayList<>();
        List<Object> planes = new ArrayList<>();
        List<DicomFile.Frame> facts = new ArrayList<>();
        List<DicomFile> owners = new ArrayList<>();
        for (DicomFile f : files) {
            requirePixels(f, files.length);
            if (f.columns() != first.columns() || f.rows() != first.rows()) {
                throw new InputException("the series mixes image sizes (" + first.columns() + "x" + first.rows()
                        + " and " + f.columns() + "x" + f.rows() + "): put each series in its own folder");
            }
            if (!java.util.Objects.equals(Mosaic.of(f), mosaic)) {
                throw new InputException("the series mixes Siemens mosaics and other images ('" + first.path()
                        .getFileName() + "' and '" + f.path().getFileName() + "' differ in Image Type MOSAIC or "
                        + "Number of Images in Mosaic, 0019,100A): put each series in its own folder");
            }
            boolean multi = f.frames().size() > 1;
            if (mosaic != null) {
                DicomFile.Frame fr = f.frames().get(0);
                double[] orientation = fr.orientation() != null ? fr.orientation() : new double[] {1, 0, 0, 0, 1, 0};
                double[] at = fr.position() != null ? fr.position() : new double[3];
                for (int k = 0; k < mosaic.slices(); k++) {
                    items.add(new SeriesLayout.Item(f.path().getFileName() + " tile " + (k + 1),
                            f.sopInstance() == null ? null : f.sopInstance() + "#" + k,
                            Mosaic.position(at, orientation, k, step), orientation, f.temporal(),
                            "Temporal Position Identifier (0020,0100)", f.acquisition(), f.instance(), f.echoNumber(),
                            "Echo Numbers (0018,0086)"));
                    planes.add(mosaic.tile(f.pixels().get(0), k));
                    facts.add(fr);
                    owners.add(f);
                }
                continue;
            }
            for (DicomFile.Frame fr : f.frames()) {
                String name = f.path().getFileName() + (multi ? " frame " + (fr.index() + 1) : "");
                String key = f.sopInstance() == null ? null : f.sopInstance() + "#" + fr.index();
                Integer temporal = f.enhanced() ? fr.temporalIndex() : f.temporal();
                String temporalTag = f.enhanced() ? "Temporal Position Index (0020,9128)"
                        : "Temporal Position Identifier (0020,0100)";
                Double instance = multi ? (f.instance() == null ? 0 : f.instance()) * 1e6 + fr.index() + 1
                        : f.instance();
                Double echoValue = f.enhanced() ? fr.echoTime() : f.echoNumber();
                String echoTag = f.enhanced() ? "Effective Echo Time (0018,9082), ms:" : "Echo Numbers (0018,0086)";
                items.add(new SeriesLayout.Item(name, key, fr.position(), fr.orientation(), temporal, temporalTag,
                        f.enhanced() ? null : f.acquisition(), instance, echoValue, echoTag));
                planes.add(f.pixels().get(fr.index()));
                facts.add(fr);
                owners.add(f);
            }
        }
        Double gap = smaller(first.thickness(), first.spacingBetween());
        SeriesLayout.Layout layout = SeriesLayout.arrange(items, echo, echoHint, gap, first.statedRepeats());
        int[] order = layout.order();
        boolean sameStorage = true;
        DicomFile.Frame f0 = facts.get(order[0]);
        for (int idx : order) {
            DicomFile.Frame fr = facts.get(idx);
            DicomFile o = owners.get(idx);
            sameStorage &= fr.slope() == f0.slope() && fr.intercept() == f0.intercept()
                    && o.bitsAllocated() == owners.get(order[0]).bitsAllocated() && o.signed() == owners.get(order[0])
                    .signed();
        }
        ImageStack stack = new ImageStack(w, h);
        List<BackgroundCheck.Storage> storage = new ArrayList<>();
        for (int idx : order) {
            DicomFile.Frame fr = facts.get(idx);
            DicomFile o = owners.get(idx);
            Object px = planes.get(idx);
            if (sameStorage) {
                stack.addSlice(items.get(idx).name(), px);
            } else {
                stack.addSlice(items.get(idx).name(), new FloatProcessor(w, h, calibrated(px, fr, o.signed())));
                storage.add(storageOf(fr, o));
            }
        }
        ImagePlus out = new ImagePlus(title, stack);
        out.setDimensions(1, layout.slices(), layout.repeats());
        out.setOpenAsHyperStack(layout.slices() > 1 && layout.repeats() > 1);
        Calibration cal = new Calibration();
        double[] ps = first.pixelSpacing();
        if (ps != null) {
            cal.pixelHeight = ps[0];
            cal.pixelWidth = ps[1];
            cal.setUnit("mm");
        }
        double depth = Double.isFinite(layout.spacing()) ? layout.spacing()
                : first.spacingBetween() != null ? first.spacingBetween()
                : first.thickness() != null ? first.thickness() : 1.0;
        cal.pixelDepth = depth;
        if (sameStorage) {
            DicomFile o = owners.get(order[0]);
            double shift = o.signed() && o.bitsAllocated() == 16 ? 32768 : 0;
            if (shift != 0 || f0.slope() != 1 || f0.intercept() != 0) {
                cal.setFunction(Calibration.STRAIGHT_LINE, new double[] {f0.intercept() - shift * f0.slope(),
                        f0.slope()}, "Gray Value");
            }
        } else {
            out.setProperty(BackgroundValues.PER_SLICE_PROPERTY, storage.toArray(new BackgroundCheck.Storage[0]));
        }
        out.setCalibration(cal);
        if (info != null) {
            out.setProperty("Info", info);
        }
        String note = "'" + title + "': " + (mosaic == null ? layout.note() : mosaic.placed(layout.note()));
        if (mosaic == null && first.mosaicType()) {
            note += "; " + Mosaic.notCut(first.mosaicSlices(), first.columns(), first.rows());
        }
        if (!sameStorage) {
            note += "; rescale slope and intercept differ between images, so each image's own rescale was applied "
                    + "(32-bit values)";
        }
        Arrangement.mark(out, note);
        return out;
    }

    /** The first three names, then "..." when there are more. */
    private static String firstNames(List<String> names) {
        return String.join(", ", names.stream().limit(3).toList()) + (names.size() > 3 ? ", ..." : "");
    }

    /** Refuses a file without pixel data, saying whether it is a damaged image or no image at all. */
    private static void requirePixels(DicomFile f, int filesInSeries) throws InputException {
        if (f.hasPixels()) {
            return;
        }
        if (!f.notAnImage()) {
            throw new InputException("'" + f.path() + "' states an image size (" + f.columns() + "x" + f.rows()
                    + ") but holds no pixel data: the file is damaged or was exported without its pixels; export the "
                    + "image again");
        }
        throw new InputException("'" + f.path() + "' holds no pixel data: it is not an image" + (filesInSeries > 1
                ? "; remove it from the folder" : " (a report, a directory or another non-image DICOM object); give an "
                + "image file or a folder of one series"));
    }

    private static Double smaller(Double a, Double b) {
        if (a == null || a <= 0) {
            return b == null || b <= 0 ? null : b;
        }
        return b == null || b <= 0 ? a : Math.min(a, b);
    }

    private static float[] calibrated(Object px, DicomFile.Frame fr, boolean signed) {
        int n = px instanceof short[] s ? s.length : ((byte[]) px).length;
        float[] out = new float[n];
        double shift = signed && px instanceof short[] ? 32768 : 0;
        for (int i = 0; i < n; i++) {
            int raw = px instanceof short[] s ? s[i] & 0xffff : ((byte[]) px)[i] & 0xff;
            out[i] = (float) (fr.intercept() + fr.slope() * (raw - shift));
        }
        return out;
    }

    private static BackgroundCheck.Storage storageOf(DicomFile.Frame fr, DicomFile o) {
        double lo = o.signed() ? o.bitsAllocated() == 16 ? -32768 : -128 : 0;
        double hi = o.bitsAllocated() == 16 ? (o.signed() ? 32767 : 65535) : (o.signed() ? 127 : 255);
        double a = fr.intercept() + fr.slope() * lo;
        double b = fr.intercept() + fr.slope() * hi;
        return new BackgroundCheck.Storage(Math.abs(fr.slope()), fr.intercept(), Math.min(a, b), Math.max(a, b));
    }

    /** ImageJ's text of a DICOM header (the {@code Info} users see in Image > Show Info), or null. */
    static String headerText(Path f) {
        try {
            String s = new ij.plugin.DICOM().getInfo(f.toAbsolutePath().toString());
            return s == null || s.isBlank() ? null : s;
        } catch (RuntimeException e) {
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

}
