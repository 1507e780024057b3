package org.noisewise.imagej;

import ij.ImagePlus;
import ij.gui.GenericDialog;
import ij.gui.Plot;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.StackPlanes;
import org.noisewise.measure.Planes;
import org.noisewise.measure.StabilityMeasure;
import org.noisewise.phantom.QaLog;
import org.noisewise.series.Stability;
import org.noisewise.series.StabilityResult;

/**
 * {@code Plugins>Noisewise>Stability (Time Series)...}: SFNR, static-noise SNR, percent fluctuation,
 * drift and the radius of decorrelation of a phantom series (Friedman and Glover 2006; Weisskoff 1996),
 * per z slice, with maps, plots, an optional QA log row and report.
 *
 * <p>The series is a hyperstack's time frames (per z slice) or a plain stack (its slices are the frames
 * of one slice). The region is a ROI Manager region named {@code signal...} or the selection, else a
 * square centred on the phantom. Macro keys: {@code slices} ([Current slice] or [All slices]),
 * {@code skip} (frames), {@code square} (side, pixels), {@code maps}, {@code plots}, {@code log},
 * {@code report}, {@code replace}, {@code scanner}, {@code coil}, {@code protocol}, {@code baseline},
 * {@code append}, {@code role_<name>}.
 */
public class StabilityCommand implements PlugIn {

    static final String TITLE = "Stability (Time Series)";

    /** What one run produced. */
    public record Output(List<StabilityResult> results, ResultsTable table, List<ImagePlus> maps, List<Plot> plots) {
    }

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, imp -> {
            Face.checkImage(imp, TITLE);
            ImagePlus series = Face.series(imp);
            int frames = StackPlanes.repeatCount(series);
            if (frames < Stability.MIN_FRAMES) {
                throw new InputException("'" + imp.getTitle() + "' has " + frames + " frame" + (frames == 1 ? "" : "s")
                        + ": the stability figures need a series of at least " + Stability.MIN_FRAMES + " frames (200 or "
                        + "more are usual): open a hyperstack with time frames, or a stack of the repeated frames.");
            }
            RegionRoles regions = RegionRoles.of(imp);
            GenericDialog gd = new GenericDialog(TITLE);
            gd.addChoice("Slices:", new String[] {BackgroundSnrCommand.CURRENT, BackgroundSnrCommand.ALL},
                    BackgroundSnrCommand.CURRENT);
            gd.addNumericField("Skip the first frames:", Stability.DEFAULT_SKIP, 0, 4, "frames (steady state)");
            gd.addNumericField("Square side (when no signal region):", Stability.DEFAULT_ROI, 0, 4, "pixels");
            gd.addCheckbox("Maps (signal, fluctuation noise, SFNR, static noise)", true);
            gd.addCheckbox("Plots (series, spectrum, Weisskoff curve)", true);
            gd.addFileField("Log file (CSV, optional):", "", 30);
            gd.addFileField("Report file (HTML, optional):", "", 30);
            gd.addCheckbox("Replace existing files (report)", false);
            gd.addStringField("Scanner (blank = from DICOM):", "", 20);
            gd.addStringField("Coil (blank = from DICOM):", "", 20);
            gd.addStringField("Protocol (blank = from DICOM):", "", 20);
            gd.addNumericField("Baseline sessions:", QaLog.DEFAULT_BASELINE, 0, 4, "(sessions)");
            regions.addFields(gd);
            Face.addAppend(gd);
            gd.addHelp(Face.help("Stability (Time Series)"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            boolean all = BackgroundSnrCommand.ALL.equals(gd.getNextChoice());
            int skip = (int) Math.round(gd.getNextNumber());
            int side = (int) Math.round(gd.getNextNumber());
            boolean maps = gd.getNextBoolean();
            boolean plots = gd.getNextBoolean();
            String log = gd.getNextString().trim();
            String report = gd.getNextString().trim();
            boolean replace = gd.getNextBoolean();
            String scanner = blankToNull(gd.getNextString());
            String coil = blankToNull(gd.getNextString());
            String protocol = blankToNull(gd.getNextString());
            int baseline = (int) Math.round(gd.getNextNumber());
            regions.readFields(gd);
            boolean append = gd.getNextBoolean();
            if (gd.invalidNumber() || skip < 0 || side < 1 || baseline < 2) {
                throw new InputException("Skip must be a whole number of frames (0 or more), the square side a whole "
                        + "number of at least 1, and Baseline sessions at least 2.");
            }
            List<Roi> signal = regions.signalRegions();
            if (signal.size() > 1) {
                throw new InputException("There are " + signal.size() + " signal regions: the stability figures use "
                        + "one. Select one region in the ROI Manager, or name only one 'signal'.");
            }
            int[] zs = all ? Planes.allZ(series) : new int[] {Face.currentZ(series, imp)};
            StabilityMeasure.Options o = new StabilityMeasure.Options(zs, skip, side, maps, plots,
                    log.isEmpty() ? null : Path.of(log), report.isEmpty() ? null : Path.of(report), replace, scanner,
                    coil, protocol, baseline);
            StabilityMeasure.Outcome out = measure(imp, signal.isEmpty() ? null : signal.get(0), o);
            out.measurement().images().forEach(Face::showNew);
            if (plots) {
                for (Plot p : out.measurement().plots()) {
                    p.show();
                    if (p.getImagePlus() != null) {
                        p.getImagePlus().setTitle(Face.uniqueTitle(p.getTitle()));
                    }
                }
            }
            Face.show(TITLE, imp, out.measurement().rows(), append);
            Face.log(TITLE, out.measurement().notes());
            Face.overlay(imp, List.of(squareOf(out, signal)), List.of());
            Face.reactivate(imp);
        });
    }

    private static String blankToNull(String s) {
        return s == null || s.isBlank() ? null : s.trim();
    }

    /** The region drawn on the image: the user's, or the square the figures used. */
    private static Roi squareOf(StabilityMeasure.Outcome out, List<Roi> signal) {
        if (!signal.isEmpty()) {
            return signal.get(0);
        }
        Stability.Placement p = out.placements().get(0);
        return new Roi(p.x0(), p.y0(), p.side(), p.side());
    }

    /**
     * Measures without dialogs; never modifies {@code imp}. The maps and plots (when the options ask for them)
     * are returned, not shown.
     *
     * @param signal the signal region, or null for the square centred on the phantom
     */
    public static Output process(ImagePlus imp, Roi signal, StabilityMeasure.Options o) throws InputException {
        StabilityMeasure.Outcome out = measure(imp, signal, o);
        return new Output(out.results(), Tables.toResultsTable(out.measurement().rows()), out.measurement().images(),
                out.measurement().plots());
    }

    static StabilityMeasure.Outcome measure(ImagePlus imp, Roi signal, StabilityMeasure.Options o)
            throws InputException {
        Face.checkImage(imp, TITLE);
        List<Region> sig = new ArrayList<>(RegionRoles.roles(signal == null ? List.of() : List.of(signal), List.of(), imp)
                .signal());
        return StabilityMeasure.run(Face.series(imp), imp.getTitle(), sig.isEmpty() ? null : sig.get(0), o,
                DialogFields.sourceFile(imp), ImageJProgress.INSTANCE);
    }

    /** The title of the table a first run on {@code imp} shows (later runs get unique titles). */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
