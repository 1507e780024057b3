package org.noisewise.imagej;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Plot;
import ij.gui.Roi;
import ij.plugin.PlugIn;
import ij.plugin.frame.RoiManager;
import java.awt.geom.Rectangle2D;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.HistogramPlot;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.QaImages;
import org.noisewise.io.RoiRegions;
import org.noisewise.measure.QaMeasure;
import org.noisewise.phantom.PlacedRegion;
import org.noisewise.phantom.QaRegions;
import org.noisewise.report.QaRows;

/**
 * {@code Plugins>Noisewise>Phantom QA...}: the whole phantom QA on the current image, a stack of
 * repeats, or two open acquisitions. The regions it places are added to the ROI Manager (named signal,
 * bg ..., ghost top/bottom/left/right, uniformity high/low) beside whatever is there, and drawn on the
 * image; running again with {@code regions=[ROI Manager]} uses them as adjusted. Regions of an earlier
 * automatic run that were not moved are replaced; anything else in the ROI Manager stays.
 *
 * <p>Macro keys: {@code second} (title of a second acquisition, or [None]), {@code regions}
 * ([Automatic] or [ROI Manager]), {@code background} ([Placed regions] or [Automatic (all air)]: the
 * background from all the air found in the slice), {@code fraction}, {@code channels} (L or auto), {@code phase},
 * {@code limits} (apply published action limits), {@code field} (tesla, 0 = from DICOM),
 * {@code scanner}, {@code coil}, {@code protocol}, {@code baseline}, {@code log} and {@code report}
 * (file paths, optional), {@code trends} (a folder for one trend PNG per metric; needs a log),
 * {@code replace} (replace an existing report and trend files), {@code slice},
 * {@code repeats} (a plain stack holds repeats of one slice, not z slices), {@code append}.
 */
public class PhantomQaCommand implements PlugIn {

    static final String TITLE = "Phantom QA";
    static final String NONE = "None";
    static final String AUTOMATIC = "Automatic";
    static final String MANAGER = "ROI Manager";
    static final String PLACED_AIR = "Placed regions";
    /** ROI property holding the geometry a region had when the QA placed it. */
    static final String PLACED = "noisewise.qa";

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, imp -> {
            Face.checkImage(imp, TITLE);
            GenericDialog gd = new GenericDialog(TITLE);
            gd.addChoice("Second acquisition:", DialogFields.otherImages(imp, NONE), NONE);
            gd.addChoice("Regions:", new String[] {AUTOMATIC, MANAGER}, AUTOMATIC);
            gd.addChoice("Background:", new String[] {PLACED_AIR, BackgroundSnrCommand.AIR_AUTO}, PLACED_AIR);
            gd.addNumericField("Fraction of phantom area for the signal region:", QaRegions.DEFAULT_FRACTION, 2, 6,
                    "(0-1)");
            DialogFields.addChannels(gd);
            DialogFields.addPhase(gd, imp);
            gd.addCheckbox("Limits: apply the published large-phantom action limits", false);
            gd.addNumericField("Field strength (0 = from DICOM):", 0, 1, 6, "T");
            gd.addStringField("Scanner (blank = from DICOM):", "", 20);
            gd.addStringField("Coil (blank = from DICOM):", "", 20);
            gd.addStringField("Protocol (blank = from DICOM):", "", 20);
            gd.addNumericField("Baseline sessions:", 5, 0, 4, "(sessions)");
            gd.addFileField("Log file (CSV, optional):", "", 30);
            gd.addFileField("Report file (HTML, optional):", "", 30);
            gd.addDirectoryField("Trends folder (a PNG per metric, needs a log; optional):", "", 30);
            gd.addCheckbox("Replace existing files (report, trend plots)", false);
            gd.addNumericField("Slice:", Face.currentZ(Face.series(imp), imp), 0, 4, "(z, from 1)");
            gd.addCheckbox("Repeats: the stack holds repeated acquisitions of one slice", false);
            Face.addAppend(gd);
            gd.addHelp(Face.help("Phantom QA"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            String secondTitle = gd.getNextChoice();
            boolean manager = MANAGER.equals(gd.getNextChoice());
            boolean autoAir = BackgroundSnrCommand.AIR_AUTO.equals(gd.getNextChoice());
            double fraction = gd.getNextNumber();
            Integer channels = DialogFields.parseChannels(gd.getNextString());
            PhaseDirection phase = DialogFields.nextPhase(gd);
            boolean limits = gd.getNextBoolean();
            double field = gd.getNextNumber();
            String scanner = gd.getNextString().trim();
            String coil = gd.getNextString().trim();
            String protocol = gd.getNextString().trim();
            int baseline = (int) Math.round(gd.getNextNumber());
            String log = gd.getNextString().trim();
            String report = gd.getNextString().trim();
            String trends = gd.getNextString().trim();
            boolean replace = gd.getNextBoolean();
            int slice = (int) Math.round(gd.getNextNumber());
            boolean repeats = gd.getNextBoolean();
            boolean append = gd.getNextBoolean();
            if (gd.invalidNumber() || !(fraction > 0 && fraction <= 1) || baseline < 2 || slice < 1 || field < 0) {
                throw new InputException("The fraction must lie between 0 and 1, Baseline sessions be at least 2, Slice "
                        + "at least 1 and Field strength not negative.");
            }
            if (limits && field == 0 && org.noisewise.io.ImageMetadata.number(imp, "0018,0087") == null) {
                throw new InputException("The published limits depend on field strength, which '" + imp.getTitle()
                        + "' does not state (DICOM 0018,0087): type it in the dialog's Field strength (T).");
            }
            ImagePlus second = NONE.equals(secondTitle) ? null : WindowManager.getImage(secondTitle);
            QaRegions.Placement placement = manager ? fromManager(imp) : null;
            QaMeasure.Options o = new QaMeasure.Options(fraction, phase, channels, field > 0 ? field : null, limits,
                    scanner.isEmpty() ? null : scanner, coil.isEmpty() ? null : coil,
                    protocol.isEmpty() ? null : protocol, baseline, log.isEmpty() ? null : Path.of(log),
                    report.isEmpty() ? null : Path.of(report), replace, slice, trends.isEmpty() ? null : Path.of(trends),
                    repeats, autoAir);
            QaMeasure.Outcome out = process(imp, second, placement, o);
            Face.show(TITLE, imp, List.of(out.row()), append);
            Face.log(TITLE, out.notes());
            if (!manager) {
                addToManager(imp, QaRows.regions(out.result()));
            }
            drawRegions(imp, QaRows.regions(out.result()), out.result().air() == null ? null
                    : out.result().air().mask());
            if (out.result().backgroundDiagnosis() != null) {
                Plot p = HistogramPlot.build(Face.uniqueTitle("Background histogram - " + imp.getTitle()),
                        out.result().backgroundValues(), out.result().backgroundDiagnosis(), ImagePlanes.valueUnit(imp));
                p.show();
            }
            Face.reactivate(imp);
        });
    }

    /** Runs the QA without dialogs. Never modifies the images. */
    public static QaMeasure.Outcome process(ImagePlus imp, ImagePlus second, QaRegions.Placement placement,
                                            QaMeasure.Options o) throws InputException {
        Face.checkImage(imp, TITLE);
        return QaMeasure.run(Face.series(imp), second == null ? null : Face.series(second), placement, o,
                DialogFields.sourceFile(imp), ImageJProgress.INSTANCE);
    }

    /**
     * Adds the placed regions to the ROI Manager without removing the user's: only regions an earlier
     * automatic run placed and nobody moved since are replaced.
     */
    static void addToManager(ImagePlus imp, List<PlacedRegion> regions) {
        RoiManager rm = RoiManager.getRoiManager();
        Roi[] existing = rm.getRoisAsArray();
        for (int i = existing.length - 1; i >= 0; i--) {
            String placed = existing[i].getProperty(PLACED);
            if (placed != null && placed.equals(geometry(existing[i]))) {
                rm.select(i);
                rm.runCommand("Delete");
            }
        }
        for (PlacedRegion p : regions) {
            Roi r = QaImages.roi(p);
            r.setProperty(PLACED, geometry(r));
            rm.addRoi(r);
        }
        rm.deselect();
        IJ.log(TITLE + ": " + regions.size() + " regions added to the ROI Manager (the regions already there were kept)");
    }

    /** The QA's regions as an overlay on the image (Image > Overlay > Remove Overlay takes it away). */
    static void drawRegions(ImagePlus imp, List<PlacedRegion> regions) {
        drawRegions(imp, regions, null);
    }

    /** As above, with the automatic air (a mask, or null) outlined in the background colour. */
    static void drawRegions(ImagePlus imp, List<PlacedRegion> regions, boolean[] air) {
        List<Roi> rois = new ArrayList<>();
        for (PlacedRegion p : regions) {
            rois.add(QaImages.roi(p));
        }
        if (air != null) {
            Roi outline = QaImages.outline(QaImages.maskProcessor(air, imp.getWidth(), imp.getHeight()));
            if (outline != null) {
                outline.setName("air (automatic)");
                outline.setStrokeColor(QaImages.KEY.get(2).colour());
                rois.add(outline);
            }
        }
        // the report's and the ROI Manager's colour key
        Face.overlayWithKey(imp, rois, QaImages.KEY);
    }

    private static String geometry(Roi r) {
        Rectangle2D b = r.getFloatBounds();
        return String.format(Locale.ROOT, "%d %.4f %.4f %.4f %.4f", r.getType(), b.getX(), b.getY(), b.getWidth(),
                b.getHeight());
    }

    /**
     * The regions as adjusted in the ROI Manager, recognised by their names: signal, ghost top/bottom/
     * left/right, bg ... (background); the uniformity windows are searched again inside the signal region.
     * When a name occurs more than once, the region added last is used.
     */
    public static QaRegions.Placement fromManager(ImagePlus imp) throws InputException {
        RoiManager rm = RoiManager.getInstance();
        Roi[] rois = rm == null ? new Roi[0] : rm.getRoisAsArray();
        PlacedRegion signal = null;
        PlacedRegion[] sides = new PlacedRegion[4];
        String[] sideNames = {"ghost top", "ghost bottom", "ghost left", "ghost right"};
        List<PlacedRegion> bg = new ArrayList<>();
        int w = imp.getWidth();
        int h = imp.getHeight();
        int windowW = 0;
        int windowH = 0;
        for (int i = 0; i < rois.length; i++) {
            Roi r = rois[i];
            String name = RoiRegions.nameOf(r, i);
            Region reg = RoiRegions.toRegion(r, name, w, h);
            Rectangle2D b = r.getFloatBounds();
            PlacedRegion p = new PlacedRegion(name, r.getType() == Roi.OVAL ? PlacedRegion.Kind.OVAL
                    : PlacedRegion.Kind.RECTANGLE, b.getX(), b.getY(), b.getWidth(), b.getHeight(), reg);
            String n = name.toLowerCase(Locale.ROOT);
            if (n.startsWith("signal")) {
                signal = p;
            } else if (n.startsWith("uniformity")) {
                windowW = Math.max(windowW, (int) Math.round(b.getWidth()));
                windowH = Math.max(windowH, (int) Math.round(b.getHeight()));
            } else if (n.startsWith("bg") || n.startsWith("background") || n.startsWith("air") || n.startsWith("noise")) {
                bg.removeIf(x -> x.name().equals(p.name()));
                bg.add(p);
            } else {
                for (int k = 0; k < 4; k++) {
                    if (n.startsWith(sideNames[k])) {
                        sides[k] = p;
                    }
                }
            }
        }
        if (signal == null) {
            throw new InputException("The ROI Manager has no region named 'signal': run Phantom QA with Regions: "
                    + "Automatic first, then adjust the regions it adds.");
        }
        if (windowW < 2 || windowH < 2) {
            windowW = QaRegions.fallbackWindow(signal.region().size());
            windowH = windowW;
        }
        return new QaRegions.Placement(signal, bg, sides[0], sides[1], sides[2], sides[3], windowW, windowH, List.of());
    }

    /** The title of the table a first run on {@code imp} shows (later runs get unique titles). */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
