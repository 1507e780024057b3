package org.noisewise.io;

import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileInfo;
import ij.measure.Calibration;
import ij.process.FloatProcessor;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.estimate.InputException;

/**
 * How a series' planes are laid out as Z slices x T repeats, for images as ImageJ holds them. Series
 * read by Noisewise are arranged when read ({@link DicomSeries}, NIfTI) and carry a note saying so.
 * A plain stack that ImageJ opened from DICOM (File > Import > Image Sequence keeps each file's header
 * in its slice label; an enhanced multi-frame file keeps its per-frame functional groups in the file)
 * is arranged here by the same {@link SeriesLayout} rules, as a new view of the same pixel arrays (the
 * user's image is never changed). Hyperstacks with time frames are taken as ImageJ holds them, and a
 * plain stack without DICOM headers keeps the rule of {@link StackPlanes}.
 */
public final class Arrangement {

    /** Image property with the sentence saying how the series was arranged (its presence: Z x T are known). */
    public static final String PROPERTY = "noisewise.arrangement";
    /** Image property of an arranged view: the z slice (1-based) of each plane of the image it was made from. */
    static final String PLANE_Z = "noisewise.planeZ";
    static final String PLANE_T = "noisewise.planeT";

    private Arrangement() {
    }

    /** True when the image's Z x T layout was read from its headers. */
    public static boolean known(ImagePlus imp) {
        return imp.getProperty(PROPERTY) instanceof String;
    }

    /** The arrangement note, or null. */
    public static String note(ImagePlus imp) {
        return imp.getProperty(PROPERTY) instanceof String s ? s : null;
    }

    static void mark(ImagePlus imp, String note) {
        imp.setProperty(PROPERTY, note);
    }

    /**
     * The image as a Z x T series: itself when its layout is known or it is a hyperstack with time
     * frames or no DICOM headers say otherwise, else an arranged view (never shown, sharing the pixel
     * arrays where the rescale allows).
     *
     * @param echo     the echo to keep (1-based) when the series holds several, or null
     * @param echoHint what the user does to choose an echo, in the face's words
     * @param mosaicHint what the user does with a stack of Siemens mosaics (each image the tiled slices of one
     *                   volume), in the face's words; null to cut them into their slices (copies) instead, since
     *                   regions drawn on a mosaic cannot be placed on its slices
     */
    public static ImagePlus of(ImagePlus imp, Integer echo, String echoHint, String mosaicHint) throws InputException {
        if (known(imp) || imp.getNFrames() > 1 || imp.getNChannels() > 1) {
            return imp;
        }
        if (imp.getStackSize() < 2) {
            // one image: only a Siemens mosaic (one volume's slices, its header in the image's Info) has a layout
            String header = singleImageHeader(imp);
            if (header == null || !Mosaic.named(value(header, "0008,0008"))) {
                return imp;
            }
            return mosaics(imp, new String[] {header}, echo, echoHint, mosaicHint);
        }
        ImageStack stack = imp.getStack();
        int n = stack.getSize();
        String[] headers = new String[n];
        boolean labelled = true;
        for (int i = 1; i <= n && labelled; i++) {
            String label = stack.getSliceLabel(i);
            labelled = label != null && label.indexOf('\n') > 0 && label.contains("0020,0032");
            headers[i - 1] = labelled ? label : null;
        }
        if (labelled) {
            if (Mosaic.named(value(headers[0], "0008,0008"))) {
                return mosaics(imp, headers, echo, echoHint, mosaicHint);
            }
            return fromLabels(imp, headers, echo, echoHint);
        }
        DicomFile file = enhancedSource(imp);
        if (file != null) {
            return fromFrames(imp, file, echo, echoHint);
        }
        return imp;
    }

    /**
     * The z slice and repeat (1-based) of plane {@code plane} (1-based) of the image the view was made from,
     * or null for a plane the view left out (another echo) or a view that does not say.
     */
    public static int[] positionOf(ImagePlus view, int plane) {
        if (view.getProperty(PLANE_Z) instanceof int[] z && view.getProperty(PLANE_T) instanceof int[] t
                && plane >= 1 && plane <= z.length && z[plane - 1] > 0) {
            return new int[] {z[plane - 1], t[plane - 1]};
        }
        return null;
    }

    /** The z slice (1-based) that plane {@code plane} (1-based) of the image the view was made from lies in. */
    public static int zOf(ImagePlus view, int plane) {
        if (view.getProperty(PLANE_Z) instanceof int[] z && plane >= 1 && plane <= z.length) {
            // 0: a plane the view left out (another echo)
            return Math.max(1, z[plane - 1]);
        }
        return view.getNFrames() > 1 ? view.getSlice() : plane;
    }

    // ---- Image Sequence stacks: one header per slice label ------------------------------------------------------

    private static ImagePlus fromLabels(ImagePlus imp, String[] headers, Integer echo, String echoHint) throws InputException {
        int n = headers.length;
        List<SeriesLayout.Item> items = new ArrayList<>();
        double[] slope = new double[n];
        double[] intercept = new double[n];
        boolean[] signed = new boolean[n];
        String uid = null;
        for (int i = 0; i < n; i++) {
            String h = headers[i];
            String name = h.substring(0, h.indexOf('\n')).trim();
            String u = value(h, "0020,000E");
            if (uid == null) {
                uid = u;
            } else if (u != null && !u.equals(uid)) {
                throw new InputException("'" + imp.getTitle() + "' mixes images of more than one DICOM series (Series "
                        + "Instance UID 0020,000E differs at '" + name + "'): open one series at a time");
            }
            String sop = value(h, "0008,0018");
            items.add(new SeriesLayout.Item(name, sop, numbers(value(h, "0020,0032"), 3),
                    numbers(value(h, "0020,0037"), 6), integer(value(h, "0020,0100")),
                    "Temporal Position Identifier (0020,0100)", integer(value(h, "0020,0012")),
                    number(value(h, "0020,0013")), number(value(h, "0018,0086")), "Echo Numbers (0018,0086)"));
            Double s = number(value(h, "0028,1053"));
            Double c = number(value(h, "0028,1052"));
            slope[i] = s == null ? 1.0 : s;
            intercept[i] = c == null ? 0.0 : c;
            signed[i] = "1".equals(value(h, "0028,0103"));
        }
        String h0 = headers[0];
        Double gap = smaller(number(value(h0, "0018,0050")), number(value(h0, "0018,0088")));
        SeriesLayout.Layout layout = SeriesLayout.arrange(items, echo, echoHint, gap,
                integer(value(h0, "0020,0105")));
        String info = h0.substring(h0.indexOf('\n') + 1);
        return view(imp, layout, slope, intercept, signed, info, "the DICOM headers in its slice labels");
    }

    // ---- Image Sequence stacks of Siemens mosaics ----------------------------------------------------------------

    /**
     * For a Siemens mosaic measured as the image it is (a single-plane command on a mosaic, or a stack of
     * them, as ImageJ opened it): a note that its regions lie on the whole mosaic, or null for any other image.
     *
     * @param cutHint what the user does to measure the mosaic's slices, in the face's words
     */
    public static String mosaicNote(ImagePlus imp, String cutHint) {
        if (known(imp) || imp.getNFrames() > 1 || imp.getNChannels() > 1) {
            return null;
        }
        String header;
        if (imp.getStackSize() > 1) {
            String label = imp.getStack().getSliceLabel(1);
            header = label != null && label.indexOf('\n') > 0 ? label : null;
        } else {
            header = singleImageHeader(imp);
        }
        if (header == null || !Mosaic.named(value(header, "0008,0008"))) {
            return null;
        }
        Mosaic m;
        try {
            m = Mosaic.of(mosaicSlices(imp, header), imp.getWidth(), imp.getHeight(), imp.getTitle());
        } catch (InputException e) {
            return null;
        }
        return m == null ? null : "'" + imp.getTitle() + "' " + (imp.getStackSize() > 1 ? "is a stack of Siemens "
                + "mosaics, measured mosaic by mosaic" : "is a Siemens mosaic, measured as one image") + ": its regions "
                + "and automatic air lie on the whole mosaic of " + m.slices() + " slices (" + m.grid() + " x " + m.grid()
                + " tiles of " + m.tileWidth() + " x " + m.tileHeight() + "); to measure slice by slice, " + cutHint;
    }

    /**
     * One image's DICOM header as a slice label holds it (its file name, then ImageJ's header text from
     * the image's Info), or null when it was not opened from a DICOM file.
     */
    private static String singleImageHeader(ImagePlus imp) {
        FileInfo fi = imp.getOriginalFileInfo();
        String info = imp.getInfoProperty();
        return fi == null || fi.fileName == null || info == null ? null : fi.fileName + "\n" + info;
    }

    /** A stack (or one image) of Siemens mosaics: cut, refused with the hint, or read plain when it cannot be one. */
    private static ImagePlus mosaics(ImagePlus imp, String[] headers, Integer echo, String echoHint, String mosaicHint)
            throws InputException {
        Integer slices = mosaicSlices(imp, headers[0]);
        Mosaic m = Mosaic.of(slices, imp.getWidth(), imp.getHeight(), headers[0].substring(0, headers[0].indexOf('\n'))
                .trim());
        if (m == null) {
            if (imp.getStackSize() < 2) {
                return imp;
            }
            ImagePlus plain = fromLabels(imp, headers, echo, echoHint);
            mark(plain, note(plain) + "; " + Mosaic.notCut(slices, imp.getWidth(), imp.getHeight()));
            return plain;
        }
        if (mosaicHint != null) {
            throw new InputException("'" + imp.getTitle() + "' " + (imp.getStackSize() > 1 ? "is a stack of Siemens "
                    + "mosaics (each image tiles " : "is a Siemens mosaic (it tiles ") + m.slices() + " slices of "
                    + m.tileWidth() + " x " + m.tileHeight() + ", Image Type MOSAIC): regions drawn on it and "
                    + "measurements of it would mix slices; " + mosaicHint);
        }
        return fromMosaics(imp, headers, m, echo, echoHint);
    }

    /**
     * The Number of Images in Mosaic (0019,100A) of the file a header came from. ImageJ's header text does
     * not show that private element as a number, so it is read from the file itself.
     */
    private static Integer mosaicSlices(ImagePlus imp, String header) throws InputException {
        String name = header.substring(0, header.indexOf('\n')).trim();
        FileInfo fi = imp.getOriginalFileInfo();
        DicomFile f = null;
        if (fi != null && fi.directory != null) {
            Path p = Path.of(fi.directory, name);
            if (Files.isRegularFile(p)) {
                f = DicomFile.read(p, false);
            }
        }
        if (f == null) {
            throw new InputException("'" + imp.getTitle() + "' holds Siemens mosaics (Image Type MOSAIC), but the file '"
                    + name + "' it was opened from cannot be read again to learn how many slices each mosaic tiles "
                    + "(0019,100A): open the file, or the series folder with File > Import > Image Sequence, again");
        }
        return f.mosaicSlices();
    }

    /** Cuts each mosaic of the stack into its slices (copies), then arranges them as the headers say. */
    private static ImagePlus fromMosaics(ImagePlus imp, String[] headers, Mosaic m, Integer echo, String echoHint)
            throws InputException {
        int n = headers.length;
        int tiles = n * m.slices();
        ImageStack src = imp.getStack();
        ImageStack cut = new ImageStack(m.tileWidth(), m.tileHeight());
        List<SeriesLayout.Item> items = new ArrayList<>();
        double[] slope = new double[tiles];
        double[] intercept = new double[tiles];
        boolean[] signed = new boolean[tiles];
        String h0 = headers[0];
        Double thickness = number(value(h0, "0018,0050"));
        Double between = number(value(h0, "0018,0088"));
        double step = Mosaic.step(thickness, between);
        for (int i = 0; i < n; i++) {
            String h = headers[i];
            String name = h.substring(0, h.indexOf('\n')).trim();
            double[] orientation = numbers(value(h, "0020,0037"), 6);
            orientation = orientation != null ? orientation : new double[] {1, 0, 0, 0, 1, 0};
            double[] at = numbers(value(h, "0020,0032"), 3);
            at = at != null ? at : new double[3];
            String sop = value(h, "0008,0018");
            Double s = number(value(h, "0028,1053"));
            Double c = number(value(h, "0028,1052"));
            for (int k = 0; k < m.slices(); k++) {
                int j = i * m.slices() + k;
                cut.addSlice(name + " tile " + (k + 1), m.tile(src.getPixels(i + 1), k));
                items.add(new SeriesLayout.Item(name + " tile " + (k + 1), sop == null ? null : sop + "#" + k,
                        Mosaic.position(at, orientation, k, step), orientation, integer(value(h, "0020,0100")),
                        "Temporal Position Identifier (0020,0100)", integer(value(h, "0020,0012")),
                        number(value(h, "0020,0013")), number(value(h, "0018,0086")), "Echo Numbers (0018,0086)"));
                slope[j] = s == null ? 1.0 : s;
                intercept[j] = c == null ? 0.0 : c;
                signed[j] = "1".equals(value(h, "0028,0103"));
            }
        }
        SeriesLayout.Layout l = SeriesLayout.arrange(items, echo, echoHint, smaller(thickness, between),
                integer(value(h0, "0020,0105")));
        SeriesLayout.Layout layout = new SeriesLayout.Layout(l.slices(), l.repeats(), l.order(), l.spacing(),
                m.placed(l.note()));
        ImagePlus tilesImp = new ImagePlus(imp.getTitle(), cut);
        tilesImp.setCalibration(imp.getCalibration().copy());
        return view(tilesImp, layout, slope, intercept, signed, h0.substring(h0.indexOf('\n') + 1),
                n > 1 ? "the DICOM headers in its slice labels" : "its DICOM header");
    }

    // ---- one multi-frame file -----------------------------------------------------------------------------------

    private static DicomFile enhancedSource(ImagePlus imp) {
        FileInfo fi = imp.getOriginalFileInfo();
        if (fi == null || fi.fileFormat != FileInfo.DICOM || fi.fileName == null || fi.directory == null) {
            return null;
        }
        Path p = Path.of(fi.directory, fi.fileName);
        if (!Files.isRegularFile(p)) {
            return null;
        }
        try {
            DicomFile f = DicomFile.read(p, false);
            return f != null && f.enhanced() && f.frames().size() == imp.getStackSize() ? f : null;
        } catch (InputException e) {
            return null;
        }
    }

    private static ImagePlus fromFrames(ImagePlus imp, DicomFile f, Integer echo, String echoHint) throws InputException {
        int n = f.frames().size();
        List<SeriesLayout.Item> items = new ArrayList<>();
        double[] slope = new double[n];
        double[] intercept = new double[n];
        boolean[] signed = new boolean[n];
        for (DicomFile.Frame fr : f.frames()) {
            int i = fr.index();
            items.add(new SeriesLayout.Item(f.path().getFileName() + " frame " + (i + 1), null, fr.position(),
                    fr.orientation(), fr.temporalIndex(), "Temporal Position Index (0020,9128)", null, i + 1.0,
                    fr.echoTime(), "Effective Echo Time (0018,9082), ms:"));
            slope[i] = fr.slope();
            intercept[i] = fr.intercept();
            signed[i] = f.signed();
        }
        Double gap = smaller(f.thickness(), f.spacingBetween());
        SeriesLayout.Layout layout = SeriesLayout.arrange(items, echo, echoHint, gap, null);
        Object info = imp.getProperty("Info");
        return view(imp, layout, slope, intercept, signed, info instanceof String s ? s : null,
                "the per-frame functional groups of '" + f.path().getFileName() + "'");
    }

    // ---- the view -----------------------------------------------------------------------------------------------

    private static ImagePlus view(ImagePlus imp, SeriesLayout.Layout layout, double[] slope, double[] intercept,
                                  boolean[] signed, String info, String source) throws InputException {
        int[] order = layout.order();
        int w = imp.getWidth();
        int h = imp.getHeight();
        ImageStack src = imp.getStack();
        boolean same = true;
        for (int idx : order) {
            same &= slope[idx] == slope[order[0]] && intercept[idx] == intercept[order[0]]
                    && signed[idx] == signed[order[0]];
        }
        Calibration cal = imp.getCalibration().copy();
        boolean rescaled = false;
        ImageStack out = new ImageStack(w, h);
        List<BackgroundCheck.Storage> storage = new ArrayList<>();
        String recalibrated = null;
        if (same) {
            // one rescale for every plane: the same arrays, calibrated by the headers' rescale
            for (int idx : order) {
                out.addSlice(src.getSliceLabel(idx + 1), src.getPixels(idx + 1));
            }
            int depth = imp.getBitDepth();
            if (depth == 8 || depth == 16) {
                int k = order[0];
                double shift = signed[k] && depth == 16 ? 32768 : 0;
                double c0 = intercept[k] - shift * slope[k];
                double c1 = slope[k];
                double[] have = cal.getFunction() == Calibration.STRAIGHT_LINE ? cal.getCoefficients() : null;
                boolean identity = c0 == 0 && c1 == 1;
                boolean agrees = have != null && have.length >= 2 ? Math.abs(have[0] - c0) <= 1e-9 * Math.max(1,
                        Math.abs(c0)) && Math.abs(have[1] - c1) <= 1e-12 * Math.max(1, Math.abs(c1))
                        : identity && !cal.calibrated();
                if (!agrees) {
                    if (identity) {
                        cal.disableDensityCalibration();
                    } else {
                        cal.setFunction(Calibration.STRAIGHT_LINE, new double[] {c0, c1}, "Gray Value");
                    }
                    recalibrated = String.format(Locale.ROOT, "the headers' rescale (slope %s, intercept %s) was applied, "
                            + "where ImageJ's calibration of the stack differs", mm(c1), mm(intercept[k]));
                }
            }
        } else {
            if (imp.getBitDepth() == 32 || imp.getBitDepth() == 24) {
                throw new InputException("the images of '" + imp.getTitle() + "' were stored with different rescale "
                        + "slopes or intercepts (0028,1053 / 0028,1052), which a 32-bit stack no longer shows: open the "
                        + "folder again with File > Import > Image Sequence without conversion to 32-bit");
            }
            rescaled = true;
            for (int idx : order) {
                Object px = src.getPixels(idx + 1);
                int len = w * h;
                float[] v = new float[len];
                double shift = signed[idx] && px instanceof short[] ? 32768 : 0;
                for (int i = 0; i < len; i++) {
                    int raw = px instanceof short[] s ? s[i] & 0xffff : ((byte[]) px)[i] & 0xff;
                    v[i] = (float) (intercept[idx] + slope[idx] * (raw - shift));
                }
                out.addSlice(src.getSliceLabel(idx + 1), new FloatProcessor(w, h, v));
                double lo = signed[idx] ? -32768 : 0;
                double hi = px instanceof short[] ? (signed[idx] ? 32767 : 65535) : 255;
                double a = intercept[idx] + slope[idx] * lo;
                double b = intercept[idx] + slope[idx] * hi;
                storage.add(new BackgroundCheck.Storage(Math.abs(slope[idx]), intercept[idx], Math.min(a, b),
                        Math.max(a, b)));
            }
            cal.disableDensityCalibration();
        }
        ImagePlus v = new ImagePlus(imp.getTitle(), out);
        v.setDimensions(1, layout.slices(), layout.repeats());
        v.setOpenAsHyperStack(layout.slices() > 1 && layout.repeats() > 1);
        if (Double.isFinite(layout.spacing())) {
            cal.pixelDepth = layout.spacing();
        }
        v.setCalibration(cal);
        if (rescaled) {
            v.setProperty(BackgroundValues.PER_SLICE_PROPERTY, storage.toArray(new BackgroundCheck.Storage[0]));
        }
        if (info != null) {
            v.setProperty("Info", info);
        }
        int[] planeZ = new int[src.getSize()];
        int[] planeT = new int[src.getSize()];
        for (int k = 0; k < order.length; k++) {
            planeZ[order[k]] = k % layout.slices() + 1;
            planeT[order[k]] = k / layout.slices() + 1;
        }
        v.setProperty(PLANE_Z, planeZ);
        v.setProperty(PLANE_T, planeT);
        String note = "'" + imp.getTitle() + "' is arranged as " + layout.note() + ", read from " + source;
        if (recalibrated != null) {
            note += "; " + recalibrated;
        }
        if (rescaled) {
            note += "; its images were stored with different rescale slopes or intercepts, so each image's own rescale "
                    + "was applied (ImageJ shows the stack with one)";
        }
        mark(v, note);
        return v;
    }

    // ---- header text as ImageJ writes it ("gggg,eeee  Name: value", nested lines marked '>') --------------------

    /** The value of a top-level element in ImageJ's header text, or null. */
    static String value(String header, String tag) {
        int from = 0;
        while (true) {
            int at = header.indexOf(tag, from);
            if (at < 0) {
                return null;
            }
            boolean lineStart = at == 0 || header.charAt(at - 1) == '\n';
            int colon = header.indexOf(':', at);
            int eol = header.indexOf('\n', at);
            if (eol < 0) {
                eol = header.length();
            }
            int nameStart = at + tag.length();
            while (nameStart < eol && header.charAt(nameStart) == ' ') {
                nameStart++;
            }
            if (lineStart && colon > 0 && colon < eol && nameStart < eol && header.charAt(nameStart) != '>') {
                String v = header.substring(colon + 1, eol).trim();
                return v.isEmpty() ? null : v;
            }
            from = at + tag.length();
        }
    }

    private static double[] numbers(String v, int n) {
        if (v == null) {
            return null;
        }
        String[] p = v.split("\\\\");
        if (p.length != n) {
            return null;
        }
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            try {
                out[i] = Double.parseDouble(p[i].trim());
            } catch (NumberFormatException e) {
                return null;
            }
        }
        return out;
    }

    private static Double number(String v) {
        if (v == null) {
            return null;
        }
        try {
            return Double.parseDouble(v.split("\\\\")[0].trim());
        } catch (NumberFormatException e) {
            return null;
        }
    }

    private static Integer integer(String v) {
        Double d = number(v);
        return d == null ? null : (int) Math.round(d);
    }

    static Double smaller(Double a, Double b) {
        if (a == null || a <= 0) {
            return b == null || b <= 0 ? null : b;
        }
        return b == null || b <= 0 ? a : Math.min(a, b);
    }

    static String mm(double v) {
        return String.format(Locale.ROOT, "%.3g", v);
    }
}
