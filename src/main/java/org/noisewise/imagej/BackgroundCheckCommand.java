package org.noisewise.imagej;

import ij.IJ;
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
import org.noisewise.estimate.Region;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.HistogramPlot;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.ImageWriter;
import org.noisewise.report.MethodRows;

/**
 * {@code Plugins>Noisewise>Background Noise Check...}: does the background behave like magnitude
 * noise? Histogram with the fitted Rayleigh / chi(2L) curve and a Gaussian, bootstrap goodness of
 * fit, agreement of the four sigma estimators, zeros and clipping, and a verdict with reasons.
 *
 * <p>Macro keys: {@code channels} (L or auto), {@code phase} (as in the background command), {@code plot} (show the histogram plot), {@code png} (a file
 * to save the plot to, optional), {@code region_N} roles. Background regions: ROI Manager regions
 * named {@code background/bg/air/noise...}, else every ROI Manager region when none has a role, else
 * the selection.
 */
public class BackgroundCheckCommand implements PlugIn {

    static final String TITLE = "Background Noise Check";

    /** What one run produced. */
    public record Output(BackgroundDiagnostics.Diagnosis result, ResultsTable table, Plot plot) {
    }

    @Override
    public void run(String arg) {
        ImagePlus imp = WindowManager.getCurrentImage();
        if (imp == null) {
            IJ.noImage();
            return;
        }
        RegionRoles regions = RegionRoles.of(imp);
        GenericDialog gd = new GenericDialog(TITLE);
        DialogFields.addChannels(gd);
        DialogFields.addPhase(gd, imp);
        gd.addCheckbox("Plot histogram and fit", true);
        gd.addStringField("PNG file for the plot (optional):", "", 30);
        regions.addFields(gd);
        gd.addHelp("<html><b>Background Noise Check</b><br>Tests whether the background regions hold "
                + "unprocessed magnitude noise (Rayleigh, or chi(2L) for L channels): masking, clipping, "
                + "quantisation, goodness of fit (bootstrap p-value) and agreement of the sigma estimators.</html>");
        gd.showDialog();
        if (gd.wasCanceled()) {
            return;
        }
        String channelText = gd.getNextString();
        PhaseDirection phase = DialogFields.nextPhase(gd);
        boolean plot = gd.getNextBoolean();
        String png = gd.getNextString().trim();
        regions.readFields(gd);
        try {
            Integer channels = DialogFields.parseChannels(channelText);
            Output out = process(imp, imp.getCurrentSlice(), regions.signalRegions(), regions.backgroundRegions(),
                    new BackgroundDiagnostics.Options(channels, phase, BackgroundValues.storage(imp)));
            out.table().show(tableTitle(imp));
            if (!png.isEmpty()) {
                ImageWriter.savePng(out.plot().getImagePlus(), Path.of(png), true);
            }
            if (plot) {
                out.plot().show();
            }
        } catch (InputException e) {
            IJ.error(TITLE, e.getMessage());
        } catch (RuntimeException e) {
            Errors.unexpected(TITLE, e);
        }
    }

    public static String tableTitle(ImagePlus imp) {
        return "Background check - " + imp.getTitle();
    }

    /** Checks slice {@code slice} (1-based) with a stated channel count. Never modifies {@code imp}. */
    public static Output process(ImagePlus imp, int slice, List<Roi> background, int channels) throws InputException {
        return process(imp, slice, List.of(), background,
                new BackgroundDiagnostics.Options(channels, PhaseDirection.UNKNOWN, BackgroundValues.storage(imp)));
    }

    /**
     * Checks slice {@code slice} (1-based). The signal region, when given, tells which background
     * regions lie left/right of the object and which above/below it. Never modifies {@code imp}.
     */
    public static Output process(ImagePlus imp, int slice, List<Roi> signal, List<Roi> background,
                                 BackgroundDiagnostics.Options options) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        if (background == null || background.isEmpty()) {
            throw new InputException("no background region: add regions in air to the ROI Manager and name them "
                    + "'background', 'bg', 'air' or 'noise'");
        }
        List<Region> regions = RegionRoles.toRegions(background, "background", imp.getWidth(), imp.getHeight());
        float[] px = ImagePlanes.calibratedPixels(imp, slice);
        double[] values = Region.pooledMagnitudes(px, regions);
        Region sig = signal == null || signal.isEmpty() || background.contains(signal.get(0)) ? null
                : RegionRoles.toRegions(signal.subList(0, 1), "signal", imp.getWidth(), imp.getHeight()).get(0);
        BackgroundDiagnostics.Diagnosis r = BackgroundDiagnostics.diagnose(px, imp.getWidth(), imp.getHeight(), sig,
                regions, options);
        String unit = ImagePlanes.valueUnit(imp);
        ResultsTable rt = Tables.toResultsTable(List.of(MethodRows.check(imp.getTitle(), slice, unit, r)));
        Plot plot = HistogramPlot.build("Background histogram - " + imp.getTitle(), values, r, unit);
        return new Output(r, rt, plot);
    }
}
