package org.noisewise.imagej;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Overlay;
import ij.gui.Roi;
import ij.gui.TextRoi;
import ij.measure.ResultsTable;
import java.awt.Color;
import java.awt.Font;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.io.Arrangement;
import org.noisewise.io.QaImages;
import org.noisewise.io.StackPlanes;
import org.noisewise.report.ResultRow;

/**
 * What every ImageJ command does around its measurement: check the image before asking anything,
 * show the rows in a named table (or append them to one table across images), draw the regions used
 * as an overlay on the source image, write the values chosen for the user to the Log, and give the
 * source image back the focus.
 */
final class Face {

    /** Overlay colours by role. */
    static final Color SIGNAL = Color.yellow;
    static final Color BACKGROUND = Color.cyan;
    static final Color CONTRAST = Color.red;
    /** Property that marks overlay elements drawn by Noisewise (only these are replaced on a rerun). */
    static final String MARK = "noisewise.overlay";

    /** How a Fiji user measures one echo of a multi-echo series. */
    static final String ECHO_HINT = "make a stack of one echo with Plugins > Noisewise > Arrange Series... (choose "
            + "the echo), then measure that stack";
    /** What a Fiji user does with a stack of Siemens mosaics before measuring. */
    static final String MOSAIC_HINT = "cut it into its slices with Plugins > Noisewise > Arrange Series..., draw the "
            + "regions on the new image and measure that";
    /** The same, inside Arrange Series itself. */
    static final String ECHO_HINT_ARRANGE = "choose one in the Echo field";

    private Face() {
    }

    /**
     * The image as a series of z slices and repeats: a stack that ImageJ opened from DICOM (File > Import >
     * Image Sequence, or an enhanced multi-frame file) arranged from its headers as a view that shares the
     * pixels; otherwise the image itself. The user's image is not changed.
     */
    static ImagePlus series(ImagePlus imp) throws InputException {
        return Arrangement.of(imp, null, ECHO_HINT, MOSAIC_HINT);
    }

    /** The z slice the user is looking at, in the series made from {@code imp}. */
    static int currentZ(ImagePlus series, ImagePlus imp) {
        return series == imp ? (StackPlanes.zCount(imp) == 1 ? 1 : imp.getSlice())
                : Arrangement.zOf(series, imp.getCurrentSlice());
    }

    /** The current image, or an error dialog in ImageJ's words and null. */
    static ImagePlus currentImage(String title) {
        ImagePlus imp = WindowManager.getCurrentImage();
        if (imp == null) {
            IJ.error(title, "There is no image open. Open an MR magnitude image (File > Open), then run "
                    + "Plugins > Noisewise > " + title + " again.");
        }
        return imp;
    }

    /**
     * Checks the image type before any dialog, in ImageJ's words: RGB and indexed-colour images are
     * refused (an image with a colour lookup table is measured on its stored values, with a note).
     */
    static void checkImage(ImagePlus imp, String title) throws InputException {
        int type = imp.getType();
        if (type == ImagePlus.COLOR_RGB || type == ImagePlus.COLOR_256) {
            throw new InputException("'" + imp.getTitle() + "' is a colour image (" + (type == ImagePlus.COLOR_RGB
                    ? "RGB" : "8-bit indexed colour") + "). Noisewise measures grayscale magnitude images (8, 16 or 32 "
                    + "bit): open the original data, not a screenshot or a colour export.");
        }
    }

    /** A regions-needed check in ImageJ's words. */
    static void requireRegions(RegionRoles regions, String what) throws InputException {
        if (regions.isEmpty()) {
            throw new InputException("There are no regions. " + what + " Add regions with the ROI Manager "
                    + "(Analyze > Tools > ROI Manager, Add), naming them by role: 'signal' for the signal region, "
                    + "'background', 'bg', 'air' or 'noise' for regions in air.");
        }
    }

    /** The table checkbox: append rows to one table for every image (macro key {@code append}). */
    static void addAppend(GenericDialog gd) {
        gd.addCheckbox("Append rows to one table for all images", false);
    }

    /**
     * Shows the rows: in a new table named for the command and image (a unique title), or appended to
     * the command's one table when {@code append} is set.
     */
    static ResultsTable show(String command, ImagePlus imp, List<ResultRow> rows, boolean append) {
        if (append) {
            String title = "Noisewise " + command;
            ResultsTable rt = ResultsTable.getResultsTable(title);
            if (rt == null) {
                rt = new ResultsTable();
            }
            Tables.append(rt, rows);
            rt.show(title);
            return rt;
        }
        ResultsTable rt = Tables.toResultsTable(rows);
        rt.show(uniqueTitle(command + " - " + imp.getTitle()));
        return rt;
    }

    /** Writes notes (values chosen for the user) to the Log window. */
    static void log(String command, List<String> notes) {
        for (String n : notes) {
            IJ.log(command + ": " + n);
        }
    }

    /**
     * Draws the regions used as an overlay on {@code imp}, one colour per role, with a legend; the
     * user's own overlay elements stay, earlier Noisewise elements are replaced. Pixels are not touched
     * (Image > Overlay > Remove Overlay takes it away).
     */
    static void overlay(ImagePlus imp, List<Roi> signal, List<Roi> background) {
        overlay(imp, signal, background, null);
    }

    /**
     * The automatic air of a measurement (its air mask image, first measured slice) as one ROI for the
     * overlay, or none.
     */
    static List<Roi> airRegions(org.noisewise.measure.Measurement m, ImagePlus imp) {
        for (ImagePlus mask : m.images()) {
            if (mask.getTitle().endsWith(" air mask")) {
                Roi r = QaImages.outline(mask.getStack().getProcessor(1));
                if (r != null) {
                    r.setName("air (automatic)");
                    return List.of(r);
                }
            }
        }
        return List.of();
    }

    /** The regions in their role colours with a key; {@code contrast} (red) may be null. */
    static void overlay(ImagePlus imp, List<Roi> signal, List<Roi> background, Roi contrast) {
        List<Roi> all = new java.util.ArrayList<>();
        for (Roi r : signal) {
            all.add(coloured(r, SIGNAL));
        }
        for (Roi r : background) {
            all.add(coloured(r, BACKGROUND));
        }
        List<QaImages.KeyEntry> key = new java.util.ArrayList<>();
        if (!signal.isEmpty()) {
            key.add(new QaImages.KeyEntry("signal", SIGNAL, "yellow"));
        }
        if (!background.isEmpty()) {
            key.add(new QaImages.KeyEntry("background", BACKGROUND, "cyan"));
        }
        if (contrast != null) {
            all.add(coloured(contrast, CONTRAST));
            key.add(new QaImages.KeyEntry("contrast", CONTRAST, "red"));
        }
        overlayWithKey(imp, all, key);
    }

    /**
     * Draws regions in their own stroke colours with a colour key (one line per entry, top left); the
     * user's own overlay elements stay, earlier Noisewise elements are replaced.
     */
    static void overlayWithKey(ImagePlus imp, List<Roi> regions, List<QaImages.KeyEntry> key) {
        Overlay ov = imp.getOverlay() == null ? new Overlay() : imp.getOverlay().duplicate();
        for (int i = ov.size() - 1; i >= 0; i--) {
            if (ov.get(i).getProperty(MARK) != null) {
                ov.remove(i);
            }
        }
        for (Roi r : regions) {
            ov.add(marked(r, r.getStrokeColor() == null ? SIGNAL : r.getStrokeColor()));
        }
        if (!regions.isEmpty()) {
            Font font = new Font("SansSerif", Font.PLAIN, Math.max(6, Math.min(imp.getWidth(), imp.getHeight()) / 32));
            for (int i = 0; i < key.size(); i++) {
                TextRoi t = new TextRoi(2, 2 + i * (font.getSize() + 2), key.get(i).label(), font);
                t.setStrokeColor(key.get(i).colour());
                t.setProperty(MARK, "legend");
                ov.add(t);
            }
        }
        imp.setOverlay(ov);
    }

    private static Roi coloured(Roi r, Color c) {
        Roi copy = (Roi) r.clone();
        copy.setStrokeColor(c);
        return copy;
    }

    private static Roi marked(Roi r, Color c) {
        Roi copy = (Roi) r.clone();
        copy.setStrokeColor(c);
        copy.setProperty(MARK, "region");
        return copy;
    }

    /** Gives {@code imp} the focus again (after tables, plots and new images were shown). */
    static void reactivate(ImagePlus imp) {
        if (imp.getWindow() != null) {
            WindowManager.setCurrentWindow(imp.getWindow());
            imp.getWindow().toFront();
        } else {
            WindowManager.setTempCurrentImage(imp);
        }
    }

    /** Shows a new image under a unique title. */
    static void showNew(ImagePlus out) {
        out.setTitle(uniqueTitle(out.getTitle()));
        out.show();
    }

    /** {@code title}, or {@code title (2)}, {@code (3)} ... when a window already has it. */
    static String uniqueTitle(String title) {
        String t = title;
        for (int k = 2; taken(t); k++) {
            t = title + " (" + k + ")";
        }
        return t;
    }

    private static boolean taken(String title) {
        if (WindowManager.getImage(title) != null) {
            return true;
        }
        for (java.awt.Frame f : WindowManager.getNonImageWindows()) {
            if (title.equals(f.getTitle())) {
                return true;
            }
        }
        return false;
    }

    /** The command's help: its README section, readable in full in a scrolling window. */
    static String help(String readmeHeading) {
        return HelpPages.html(readmeHeading);
    }
}
