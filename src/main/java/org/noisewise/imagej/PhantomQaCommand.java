package org.noisewise.imagej;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.plugin.PlugIn;
import ij.plugin.frame.RoiManager;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.HistogramPlot;
import org.noisewise.io.QaImages;
import org.noisewise.io.QaRunner;
import org.noisewise.io.RoiRegions;
import org.noisewise.phantom.PlacedRegion;
import org.noisewise.phantom.QaRegions;
import org.noisewise.report.QaRows;

/**
 * {@code Plugins>Noisewise>Phantom QA...}: the whole phantom QA on the current image, a stack of
 * repeats, or two open acquisitions. The regions are put in the ROI Manager (named signal, bg ...,
 * ghost top/bottom/left/right, uniformity high/low) where they can be moved; running again with
 * {@code regions=[ROI Manager]} uses the adjusted regions.
 *
 * <p>Macro keys: {@code second} (title of a second acquisition, or [None]), {@code regions}
 * ([Automatic] or [ROI Manager]), {@code fraction}, {@code channels} (L or auto), {@code phase},
 * {@code limits} (apply published action limits), {@code field} (tesla, 0 = from DICOM),
 * {@code scanner}, {@code coil}, {@code protocol}, {@code baseline}, {@code log} and {@code report}
 * (file paths, optional), {@code slice}, {@code repeats} (a plain stack holds repeats of one slice, not z slices).
 */
public class PhantomQaCommand implements PlugIn {

    static final String TITLE = "Phantom QA";
    static final String NONE = "None";
    static final String AUTOMATIC = "Automatic";
    static final String MANAGER = "ROI Manager";

    @Override
    public void run(String arg) {
        ImagePlus imp = WindowManager.getCurrentImage();
        if (imp == null) {
            IJ.noImage();
            return;
        }
        List<String> titles = new ArrayList<>();
        titles.add(NONE);
        for (int id : WindowManager.getIDList()) {
            ImagePlus other = WindowManager.getImage(id);
            if (other != null && other != imp) {
                titles.add(other.getTitle());
            }
        }
        GenericDialog gd = new GenericDialog(TITLE);
        gd.addChoice("Second acquisition:", titles.toArray(new String[0]), NONE);
        gd.addChoice("Regions:", new String[] {AUTOMATIC, MANAGER}, AUTOMATIC);
        gd.addNumericField("Fraction of phantom area for the signal region:", QaRegions.DEFAULT_FRACTION, 2);
        DialogFields.addChannels(gd);
        DialogFields.addPhase(gd, imp);
        gd.addCheckbox("Limits: apply the published large-phantom action limits", false);
        gd.addNumericField("Field strength (T, 0 = from DICOM):", 0, 1);
        gd.addStringField("Scanner (blank = from DICOM):", "", 20);
        gd.addStringField("Coil (blank = from DICOM):", "", 20);
        gd.addStringField("Protocol (blank = from DICOM):", "", 20);
        gd.addNumericField("Baseline sessions:", 5, 0);
        gd.addStringField("Log file (CSV, optional):", "", 30);
        gd.addStringField("Report file (HTML, optional):", "", 30);
        gd.addNumericField("Slice:", imp.getSlice(), 0);
        gd.addCheckbox("Repeats: the stack holds repeated acquisitions of one slice", false);
        gd.addHelp("<html><b>Phantom QA</b><br>Finds the phantom, places the signal, background, ghosting and "
                + "uniformity regions, measures SNR (difference method with a second acquisition, repeated acquisitions "
                + "for a stack of repeats, else background), PIU, NEMA non-uniformity and ghosting.<br>"
                + "A QA measurement, not an acceptance test by itself.</html>");
        gd.showDialog();
        if (gd.wasCanceled()) {
            return;
        }
        String secondTitle = gd.getNextChoice();
        boolean manager = MANAGER.equals(gd.getNextChoice());
        double fraction = gd.getNextNumber();
        String channelText = gd.getNextString();
        PhaseDirection phase = DialogFields.nextPhase(gd);
        boolean limits = gd.getNextBoolean();
        double field = gd.getNextNumber();
        String scanner = gd.getNextString().trim();
        String coil = gd.getNextString().trim();
        String protocol = gd.getNextString().trim();
        int baseline = (int) Math.round(gd.getNextNumber());
        String log = gd.getNextString().trim();
        String report = gd.getNextString().trim();
        int slice = (int) Math.round(gd.getNextNumber());
        boolean repeats = gd.getNextBoolean();
        try {
            if (gd.invalidNumber() || !(fraction > 0 && fraction <= 1) || baseline < 2 || slice < 1) {
                throw new InputException("the fraction must lie in (0, 1], the baseline be at least 2 sessions and the "
                        + "slice at least 1");
            }
            ImagePlus second = NONE.equals(secondTitle) ? null : WindowManager.getImage(secondTitle);
            QaRegions.Placement placement = manager ? fromManager(imp) : null;
            QaRunner.Options o = new QaRunner.Options(fraction, phase, DialogFields.parseChannels(channelText),
                    field > 0 ? field : null, limits, scanner.isEmpty() ? null : scanner, coil.isEmpty() ? null : coil,
                    protocol.isEmpty() ? null : protocol, baseline, log.isEmpty() ? null : Path.of(log),
                    report.isEmpty() ? null : Path.of(report), true, slice, null, repeats);
            QaRunner.Outcome out = process(imp, second, placement, o);
            Tables.toResultsTable(List.of(out.row())).show(tableTitle(imp));
            if (!manager) {
                RoiManager rm = RoiManager.getRoiManager();
                rm.reset();
                for (PlacedRegion p : QaRows.regions(out.result())) {
                    rm.addRoi(QaImages.roi(p));
                }
                rm.runCommand(imp, "Show All with labels");
            }
            if (out.result().backgroundDiagnosis() != null) {
                HistogramPlot.build("Background histogram - " + imp.getTitle(), out.result().backgroundValues(),
                        out.result().backgroundDiagnosis(), org.noisewise.io.ImagePlanes.valueUnit(imp)).show();
            }
        } catch (InputException e) {
            IJ.error(TITLE, e.getMessage());
        } catch (RuntimeException e) {
            Errors.unexpected(TITLE, e);
        }
    }

    public static String tableTitle(ImagePlus imp) {
        return "Phantom QA - " + imp.getTitle();
    }

    /** Runs the QA without dialogs. Never modifies the images. */
    public static QaRunner.Outcome process(ImagePlus imp, ImagePlus second, QaRegions.Placement placement,
                                           QaRunner.Options o) throws InputException {
        return QaRunner.run(imp, second, placement, o, null);
    }

    /**
     * The regions as adjusted in the ROI Manager, recognised by their names: signal, ghost top/bottom/
     * left/right, bg ... (background), uniformity windows are searched again inside the signal region.
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
        int window = 0;
        for (int i = 0; i < rois.length; i++) {
            Roi r = rois[i];
            String name = RoiRegions.nameOf(r, i);
            Region reg = RoiRegions.toRegion(r, name, w, h);
            java.awt.geom.Rectangle2D b = r.getFloatBounds();
            PlacedRegion p = new PlacedRegion(name, r.getType() == Roi.OVAL ? PlacedRegion.Kind.OVAL
                    : PlacedRegion.Kind.RECTANGLE, b.getX(), b.getY(), b.getWidth(), b.getHeight(), reg);
            String n = name.toLowerCase(java.util.Locale.ROOT);
            if (n.startsWith("signal")) {
                signal = p;
            } else if (n.startsWith("uniformity")) {
                window = Math.max(window, (int) Math.round(b.getWidth()));
            } else if (n.startsWith("bg") || n.startsWith("background") || n.startsWith("air") || n.startsWith("noise")) {
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
            throw new InputException("the ROI Manager has no region named 'signal': run with regions=Automatic first, "
                    + "then adjust the regions it adds");
        }
        if (window < 2) {
            window = (int) Math.max(2, Math.round(Math.sqrt(0.01 * signal.region().size())));
        }
        return new QaRegions.Placement(signal, bg, sides[0], sides[1], sides[2], sides[3], window, List.of());
    }
}
