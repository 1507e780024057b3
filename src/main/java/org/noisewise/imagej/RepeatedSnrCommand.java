package org.noisewise.imagej;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.ResultImages;
import org.noisewise.io.StackPlanes;
import org.noisewise.report.MethodRows;
import org.noisewise.report.ResultRow;

/**
 * {@code Plugins>Noisewise>SNR Map (Repeated Acquisitions)...}: pixel-by-pixel temporal mean, SD and
 * SNR maps from K repeats (stack slices, or a hyperstack's time frames per z slice), and a region
 * summary with pooled sigma, optionally Rician-corrected (Koay and Basser 2006).
 *
 * <p>Macro keys: {@code channels} (L), {@code slices} ([Current slice] or [All slices], z slices of a
 * hyperstack), {@code maps} (show the maps), {@code rician} (Koay-Basser correction of the region
 * summary), {@code region_N} roles. The summary uses signal regions: ROI Manager regions named
 * {@code signal...}, else the selection, else every ROI Manager region; with none, only maps are made.
 */
public class RepeatedSnrCommand implements PlugIn {

    static final String TITLE = "SNR Map (Repeated Acquisitions)";

    /** What one run produced. */
    public record Output(List<ImagePlus> maps, ResultsTable table) {
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
        gd.addNumericField("Channels (L):", 1, 0);
        gd.addChoice("Slices:", new String[] {BackgroundSnrCommand.CURRENT, BackgroundSnrCommand.ALL},
                BackgroundSnrCommand.CURRENT);
        gd.addCheckbox("Maps (mean, SD, SNR)", true);
        gd.addCheckbox("Rician correction (Koay-Basser) of the region summary", false);
        regions.addFields(gd);
        gd.addHelp("<html><b>SNR Map (Repeated Acquisitions)</b><br>A stack of K identical acquisitions "
                + "(or a hyperstack's time frames). Per pixel: temporal mean, SD (K-1) and SNR = mean/SD.<br>"
                + "Region summary: sigma = sqrt(mean of per-pixel variances); the mean of the SNR map is biased "
                + "high for small K and is shown only for comparison.</html>");
        gd.showDialog();
        if (gd.wasCanceled()) {
            return;
        }
        int channels = (int) Math.round(gd.getNextNumber());
        boolean all = BackgroundSnrCommand.ALL.equals(gd.getNextChoice());
        boolean showMaps = gd.getNextBoolean();
        boolean rician = gd.getNextBoolean();
        regions.readFields(gd);
        try {
            if (gd.invalidNumber() || channels < 1) {
                throw new InputException("the channel count must be a whole number of at least 1");
            }
            Output out = process(imp, regions.signalRegions(), channels, all, rician);
            if (showMaps) {
                out.maps().forEach(ImagePlus::show);
            }
            if (out.table() != null) {
                out.table().show(tableTitle(imp));
            }
        } catch (InputException e) {
            IJ.error(TITLE, e.getMessage());
        } catch (RuntimeException e) {
            Errors.unexpected(TITLE, e);
        }
    }

    public static String tableTitle(ImagePlus imp) {
        return "SNR repeated - " + imp.getTitle();
    }

    /**
     * Computes the maps (new images, not shown) and, when signal regions are given, the summary table.
     * Never modifies {@code imp}.
     */
    public static Output process(ImagePlus imp, List<Roi> signal, int channels, boolean allSlices, boolean rician)
            throws InputException {
        ImagePlanes.requireGrayscale(imp);
        int k = StackPlanes.repeatCount(imp);
        if (k < 2) {
            throw new InputException("'" + imp.getTitle() + "' has a single frame: the repeated-acquisition method "
                    + "needs a stack of at least 2 repeats of the same slice");
        }
        List<Region> regions = signal == null || signal.isEmpty() ? List.of()
                : RegionRoles.toRegions(signal, "signal", imp.getWidth(), imp.getHeight());
        int zs = StackPlanes.zCount(imp);
        int lo = allSlices || zs == 1 ? 1 : imp.getSlice();
        int hi = allSlices ? zs : lo;
        String unit = ImagePlanes.valueUnit(imp);
        List<ImagePlus> maps = new ArrayList<>();
        List<ResultRow> rows = new ArrayList<>();
        for (int z = lo; z <= hi; z++) {
            final int done = z - lo;
            final int total = hi - lo + 1;
            IJ.showStatus("Repeated acquisitions: z " + z + " of " + zs);
            RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(StackPlanes.repeats(imp, z), imp.getWidth(),
                    imp.getHeight(), f -> IJ.showProgress((done + f) / total));
            String suffix = zs > 1 ? " z" + z : "";
            maps.add(ResultImages.floatImage(imp.getTitle() + " temporal mean" + suffix, m.width(), m.height(),
                    m.mean(), imp, unit));
            maps.add(ResultImages.floatImage(imp.getTitle() + " temporal SD" + suffix, m.width(), m.height(),
                    m.sd(), imp, unit));
            maps.add(ResultImages.floatImage(imp.getTitle() + " SNR map" + suffix, m.width(), m.height(),
                    m.snr(), imp, null));
            for (Region reg : regions) {
                rows.add(MethodRows.repeated(imp.getTitle(), z, unit,
                        RepeatedAcquisitions.summarize(m, reg, rician, channels)).add("region", "Region", reg.name()));
            }
        }
        IJ.showProgress(1.0);
        IJ.showStatus("");
        return new Output(maps, rows.isEmpty() ? null : Tables.toResultsTable(rows));
    }
}
