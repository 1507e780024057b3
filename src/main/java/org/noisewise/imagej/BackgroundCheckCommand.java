package org.noisewise.imagej;

import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Plot;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import java.nio.file.Path;
import java.util.List;
import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.CheckMeasure;
import org.noisewise.measure.Measurement;

/**
 * {@code Plugins>Noisewise>Background Noise Check...}: does the background behave like magnitude
 * noise? Histogram with the fitted Rayleigh / chi(2L) curve and a Gaussian, bootstrap goodness of
 * fit, agreement of the four sigma estimators, zeros, clipping and quantisation, and a verdict.
 *
 * <p>Macro keys: {@code channels} (L or auto), {@code phase} (as in the background command),
 * {@code noise-only} (title of a noise-only scan to compare with, or [None]),
 * {@code plot} (show the histogram plot), {@code png} (a file to save the plot to, optional),
 * {@code replace} (replace an existing PNG file), {@code append}, {@code role_<name>}. Background
 * regions: ROI Manager regions named {@code background/bg/air/noise...}, else every ROI Manager region
 * when none has a role, else the selection.
 */
public class BackgroundCheckCommand implements PlugIn {

    static final String TITLE = "Background Noise Check";

    /** What one run produced. */
    public record Output(BackgroundDiagnostics.Diagnosis result, ResultsTable table, Plot plot) {
    }

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, imp -> {
            Face.checkImage(imp, TITLE);
            RegionRoles regions = RegionRoles.of(imp);
            GenericDialog gd = new GenericDialog(TITLE);
            DialogFields.addChannels(gd);
            gd.addChoice("Background:", new String[] {BackgroundSnrCommand.AIR_REGIONS, BackgroundSnrCommand.AIR_AUTO},
                    regions.isEmpty() ? BackgroundSnrCommand.AIR_AUTO : BackgroundSnrCommand.AIR_REGIONS);
            DialogFields.addPhase(gd, imp);
            gd.addChoice("Noise-only scan:", DialogFields.otherImages(imp, BackgroundSnrCommand.NONE),
                    BackgroundSnrCommand.NONE);
            gd.addCheckbox("Plot histogram and fit", true);
            gd.addFileField("PNG file for the plot (optional):", "", 30);
            gd.addCheckbox("Replace existing files", false);
            regions.addFields(gd);
            Face.addAppend(gd);
            gd.addHelp(Face.help("Background Noise Check"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            Integer channels = DialogFields.parseChannels(gd.getNextString());
            boolean auto = BackgroundSnrCommand.AIR_AUTO.equals(gd.getNextChoice());
            PhaseDirection phase = DialogFields.nextPhase(gd);
            String scanTitle = gd.getNextChoice();
            ImagePlus scan = BackgroundSnrCommand.NONE.equals(scanTitle) ? null : WindowManager.getImage(scanTitle);
            if (scan != null) {
                Face.checkImage(scan, TITLE);
            }
            boolean plot = gd.getNextBoolean();
            String png = gd.getNextString().trim();
            boolean replace = gd.getNextBoolean();
            regions.readFields(gd);
            boolean append = gd.getNextBoolean();
            if (!png.isEmpty()) {
                ImageWriter.checkWritable(Path.of(png), replace, DialogFields.sourceFile(imp));
            }
            List<Roi> signal = auto ? regions.withRole(org.noisewise.io.RoleNames.SIGNAL) : regions.signalRegions();
            List<Roi> background = auto ? List.of() : regions.backgroundRegions();
            Measurement m = auto ? measureAutomaticAir(imp, imp.getCurrentSlice(), signal,
                    new CheckMeasure.Options(channels, phase), scan) : measure(imp, imp.getCurrentSlice(), signal,
                    background, new CheckMeasure.Options(channels, phase), scan);
            if (auto) {
                background = Face.airRegions(m, imp);
            }
            Face.show(TITLE, imp, m.rows(), append);
            Face.log(TITLE, m.notes());
            if (!png.isEmpty()) {
                ImageWriter.savePng(m.plots().get(0).getImagePlus(), Path.of(png), replace,
                        DialogFields.sourceFile(imp));
            }
            if (plot) {
                Plot p = m.plots().get(0);
                p.show();
                if (p.getImagePlus() != null) {
                    p.getImagePlus().setTitle(Face.uniqueTitle(p.getTitle()));
                }
            }
            Face.overlay(imp, signal.isEmpty() || background.contains(signal.get(0)) ? List.of() : signal, background);
            Face.reactivate(imp);
        });
    }

    /** Checks slice {@code slice} (1-based) with a stated channel count. Never modifies {@code imp}. */
    public static Output process(ImagePlus imp, int slice, List<Roi> background, int channels) throws InputException {
        return process(imp, slice, List.of(), background, new CheckMeasure.Options(channels, PhaseDirection.UNKNOWN));
    }

    /**
     * Checks slice {@code slice} (1-based). The signal region, when given, tells which background
     * regions lie left/right of the object and which above/below it. Never modifies {@code imp}.
     */
    public static Output process(ImagePlus imp, int slice, List<Roi> signal, List<Roi> background,
                                 CheckMeasure.Options options) throws InputException {
        Measurement m = measure(imp, slice, signal, background, options, null);
        return new Output(null, Tables.toResultsTable(m.rows()), m.plots().get(0));
    }

    /**
     * Checks slice {@code slice} (1-based) on the air found automatically (no background regions drawn);
     * a signal region, when given, is never taken as air. Never modifies {@code imp}.
     */
    public static Output processAutomaticAir(ImagePlus imp, int slice, List<Roi> signal, CheckMeasure.Options options)
            throws InputException {
        Measurement m = measureAutomaticAir(imp, slice, signal, options, null);
        return new Output(null, Tables.toResultsTable(m.rows()), m.plots().get(0));
    }

    /**
     * Checks slice {@code slice} against a noise-only scan too: the scan's sigma in the background and at
     * the signal region, the scale check and the noise variation (see the README). Never modifies
     * either image; {@code background} empty means automatic air.
     */
    public static Output processWithNoiseScan(ImagePlus imp, int slice, List<Roi> signal, List<Roi> background,
                                              CheckMeasure.Options options, ImagePlus scan) throws InputException {
        Measurement m = background.isEmpty() ? measureAutomaticAir(imp, slice, signal, options, scan)
                : measure(imp, slice, signal, background, options, scan);
        return new Output(null, Tables.toResultsTable(m.rows()), m.plots().get(0));
    }

    static Measurement measureAutomaticAir(ImagePlus imp, int slice, List<Roi> signal, CheckMeasure.Options options,
                                           ImagePlus scan) throws InputException {
        Face.checkImage(imp, TITLE);
        List<Roi> sig = signal == null || signal.isEmpty() ? List.of() : signal.subList(0, 1);
        return CheckMeasure.run(imp, imp.getTitle(), RegionRoles.roles(sig, List.of(), imp).withAutoAir(), options,
                new int[] {slice}, scan, scan == null ? null : scan.getTitle(), ImageJProgress.INSTANCE);
    }

    static Measurement measure(ImagePlus imp, int slice, List<Roi> signal, List<Roi> background,
                               CheckMeasure.Options options, ImagePlus scan) throws InputException {
        Face.checkImage(imp, TITLE);
        if (background == null || background.isEmpty()) {
            throw new InputException("There is no background region: add regions in air to the ROI Manager and name "
                    + "them 'background', 'bg', 'air' or 'noise', or choose 'Background: Automatic (all air)'.");
        }
        List<Roi> sig = signal == null || signal.isEmpty() || background.contains(signal.get(0)) ? List.of()
                : signal.subList(0, 1);
        return CheckMeasure.run(imp, imp.getTitle(), RegionRoles.roles(sig, background, imp), options,
                new int[] {slice}, scan, scan == null ? null : scan.getTitle(), ImageJProgress.INSTANCE);
    }

    /** The title of the table a first run on {@code imp} shows (later runs get unique titles). */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
