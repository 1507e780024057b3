package org.noisewise.imagej;

import ij.ImagePlus;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.io.StackPlanes;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Planes;
import org.noisewise.measure.RepeatedMeasure;

/**
 * {@code Plugins>Noisewise>SNR Map (Repeated Acquisitions)...}: pixel-by-pixel temporal mean, SD and
 * SNR maps from K repeats (stack slices, or a hyperstack's time frames per z slice), as one 3-slice
 * image per z, and a region summary corrected for magnitude bias (Koay and Basser 2006).
 *
 * <p>Macro keys: {@code channels} (L), {@code slices} ([Current slice] or [All slices], z slices of a
 * hyperstack), {@code maps} (show the maps), {@code rician} (accepted, changes nothing: the summary is
 * always corrected), {@code append}, {@code role_<name>}. The summary uses signal regions: ROI Manager
 * regions named {@code signal...}, else the selection, else every ROI Manager region; with none, only
 * maps are made.
 */
public class RepeatedSnrCommand implements PlugIn {

    static final String TITLE = "SNR Map (Repeated Acquisitions)";

    /** What one run produced. */
    public record Output(List<ImagePlus> maps, ResultsTable table) {
    }

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, imp -> {
            Face.checkImage(imp, TITLE);
            if (StackPlanes.repeatCount(Face.series(imp)) < 2) {
                throw new InputException("'" + imp.getTitle() + "' is a single image: the repeated-acquisition method "
                        + "needs a stack of at least 2 repeats of the same slice (or a hyperstack with time frames).");
            }
            RegionRoles regions = RegionRoles.of(imp);
            GenericDialog gd = new GenericDialog(TITLE);
            gd.addNumericField("Channels (L):", 1, 0, 4, "(receive channels)");
            gd.addChoice("Slices:", new String[] {BackgroundSnrCommand.CURRENT, BackgroundSnrCommand.ALL},
                    BackgroundSnrCommand.CURRENT);
            gd.addCheckbox("Maps (mean, SD, SNR)", true);
            gd.addCheckbox("Rician correction (always applied; kept for old macros)", true);
            regions.addFields(gd);
            Face.addAppend(gd);
            gd.addHelp(Face.help("SNR Map (Repeated Acquisitions)"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            int channels = (int) Math.round(gd.getNextNumber());
            boolean all = BackgroundSnrCommand.ALL.equals(gd.getNextChoice());
            boolean showMaps = gd.getNextBoolean();
            gd.getNextBoolean();
            regions.readFields(gd);
            boolean append = gd.getNextBoolean();
            if (gd.invalidNumber() || channels < 1) {
                throw new InputException("The channel count must be a whole number of at least 1.");
            }
            List<Roi> signal = regions.signalRegions();
            if (signal.isEmpty() && !showMaps) {
                throw new InputException("Nothing to do: there is no signal region for a summary and the maps are off. "
                        + "Add a region named 'signal' to the ROI Manager, or tick Maps.");
            }
            Roi contrast = regions.contrastRegion();
            Measurement m = measure(imp, signal, contrast, channels, all, showMaps);
            m.images().forEach(Face::showNew);
            Face.log(TITLE, m.notes());
            if (!m.rows().isEmpty()) {
                Face.show(TITLE, imp, m.rows(), append);
                Face.overlay(imp, signal, List.of(), contrast);
            }
            Face.reactivate(imp);
        });
    }

    /**
     * Computes the maps (new images, not shown) and, when signal regions are given, the summary table.
     * Never modifies {@code imp}.
     */
    public static Output process(ImagePlus imp, List<Roi> signal, int channels, boolean allSlices) throws InputException {
        return process(imp, signal, null, channels, allSlices);
    }

    /** As {@code process} above, with a contrast region (may be null) for the contrast-to-noise ratio. */
    public static Output process(ImagePlus imp, List<Roi> signal, Roi contrast, int channels, boolean allSlices)
            throws InputException {
        Measurement m = measure(imp, signal, contrast, channels, allSlices, true);
        return new Output(m.images(), m.rows().isEmpty() ? null : Tables.toResultsTable(m.rows()));
    }

    static Measurement measure(ImagePlus imp, List<Roi> signal, Roi contrast, int channels, boolean allSlices,
                               boolean maps) throws InputException {
        Face.checkImage(imp, TITLE);
        ImagePlus series = Face.series(imp);
        int[] planes = allSlices ? Planes.allZ(series) : new int[] {Face.currentZ(series, imp)};
        return RepeatedMeasure.run(series, imp.getTitle(), RegionRoles.roles(signal == null ? List.of() : signal,
                List.of(), contrast, imp), channels, planes, maps, ImageJProgress.INSTANCE);
    }

    /** The title of the table a first run on {@code imp} shows (later runs get unique titles). */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
