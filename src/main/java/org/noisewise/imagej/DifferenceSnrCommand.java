package org.noisewise.imagej;

import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.io.StackPlanes;
import org.noisewise.measure.DifferenceMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Planes;
import org.noisewise.measure.Roles;

/**
 * {@code Plugins>Noisewise>SNR (Two Acquisitions)...}: the NEMA difference method over each signal
 * region, corrected for magnitude bias (Koay-Basser), NEMA's plain {@code sqrt(2) S / SD(diff)} beside it.
 *
 * <p>Macro keys: {@code source} ([Two images] or [Two frames of one stack]); {@code first},
 * {@code second} (image titles); {@code frame_a}, {@code frame_b} (1-based frames, or slices of a
 * stack without a time axis); {@code channels} (L); {@code slices} ([Current slice] or [All slices]);
 * {@code append}; {@code role_<name>} for regions whose name implies no role. Signal regions: ROI
 * Manager regions named {@code signal...}, else the selection on the first image, else every ROI
 * Manager region.
 */
public class DifferenceSnrCommand implements PlugIn {

    static final String TITLE = "SNR (Two Acquisitions)";
    static final String TWO_IMAGES = "Two images";
    static final String TWO_FRAMES = "Two frames of one stack";

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, current -> {
            Face.checkImage(current, TITLE);
            int[] ids = WindowManager.getIDList();
            boolean twoImages = ids != null && ids.length >= 2;
            if (!twoImages && StackPlanes.repeatCount(Face.series(current)) < 2) {
                throw new InputException("The difference method needs two identical acquisitions: open both images, "
                        + "or one stack (or hyperstack time series) that holds both.");
            }
            RegionRoles regions = RegionRoles.of(current);
            Face.requireRegions(regions, "The difference method measures inside signal regions (draw a selection, "
                    + "or add regions named 'signal' to the ROI Manager).");
            GenericDialog gd = new GenericDialog(TITLE);
            gd.addChoice("Source:", new String[] {TWO_IMAGES, TWO_FRAMES}, twoImages ? TWO_IMAGES : TWO_FRAMES);
            gd.addImageChoice("First image:", current.getTitle());
            gd.addImageChoice("Second image:", DialogFields.otherTitle(current));
            gd.addNumericField("Frame_a:", 1, 0, 4, "(frame)");
            gd.addNumericField("Frame_b:", 2, 0, 4, "(frame)");
            gd.addNumericField("Channels (L):", 1, 0, 4, "(receive channels)");
            gd.addChoice("Slices:", new String[] {BackgroundSnrCommand.CURRENT, BackgroundSnrCommand.ALL},
                    BackgroundSnrCommand.CURRENT);
            regions.addFields(gd);
            Face.addAppend(gd);
            gd.addHelp(Face.help("SNR (Two Acquisitions)"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            boolean frames = TWO_FRAMES.equals(gd.getNextChoice());
            ImagePlus first = gd.getNextImage();
            ImagePlus second = gd.getNextImage();
            int a = (int) Math.round(gd.getNextNumber());
            int b = (int) Math.round(gd.getNextNumber());
            int channels = (int) Math.round(gd.getNextNumber());
            boolean all = BackgroundSnrCommand.ALL.equals(gd.getNextChoice());
            regions.readFields(gd);
            boolean append = gd.getNextBoolean();
            if (gd.invalidNumber() || channels < 1) {
                throw new InputException("The frames and the channel count must be whole numbers (Channels at least 1).");
            }
            List<Roi> signal = regions.withSelectionOf(first).signalRegions();
            Roi contrast = regions.contrastRegion();
            Measurement m = frames ? measureFrames(first, a, b, signal, contrast, channels, all)
                    : measureImages(first, second, signal, contrast, channels, all);
            Face.show(TITLE, first, m.rows(), append);
            Face.log(TITLE, m.notes());
            Face.overlay(first, signal, List.of(), contrast);
            Face.reactivate(first);
        });
    }

    /** Two images of the same size; per slice when they are stacks. Never modifies them. */
    public static ResultsTable processImages(ImagePlus first, ImagePlus second, List<Roi> signal, int channels,
                                             boolean allSlices) throws InputException {
        return Tables.toResultsTable(measureImages(first, second, signal, null, channels, allSlices).rows());
    }

    /** As {@code processImages} above, with a contrast region (may be null) for the contrast-to-noise ratio. */
    public static ResultsTable processImages(ImagePlus first, ImagePlus second, List<Roi> signal, Roi contrast,
                                             int channels, boolean allSlices) throws InputException {
        return Tables.toResultsTable(measureImages(first, second, signal, contrast, channels, allSlices).rows());
    }

    /** Frames {@code a} and {@code b} of one stack or hyperstack (per z slice). Never modifies it. */
    public static ResultsTable processFrames(ImagePlus imp, int a, int b, List<Roi> signal, int channels,
                                             boolean allSlices) throws InputException {
        return Tables.toResultsTable(measureFrames(imp, a, b, signal, null, channels, allSlices).rows());
    }

    /** As {@code processFrames} above, with a contrast region (may be null) for the contrast-to-noise ratio. */
    public static ResultsTable processFrames(ImagePlus imp, int a, int b, List<Roi> signal, Roi contrast, int channels,
                                             boolean allSlices) throws InputException {
        return Tables.toResultsTable(measureFrames(imp, a, b, signal, contrast, channels, allSlices).rows());
    }

    static Measurement measureImages(ImagePlus first, ImagePlus second, List<Roi> signal, Roi contrast, int channels,
                                     boolean allSlices) throws InputException {
        Face.checkImage(first, TITLE);
        Face.checkImage(second, TITLE);
        int[] planes = allSlices ? Planes.all(first) : new int[] {first.getCurrentSlice()};
        return DifferenceMeasure.images(first, first.getTitle(), second, second.getTitle(), roles(first, signal,
                contrast), channels, planes, ImageJProgress.INSTANCE);
    }

    static Measurement measureFrames(ImagePlus imp, int a, int b, List<Roi> signal, Roi contrast, int channels,
                                     boolean allSlices) throws InputException {
        Face.checkImage(imp, TITLE);
        ImagePlus series = Face.series(imp);
        int[] planes = allSlices ? Planes.allZ(series) : new int[] {Face.currentZ(series, imp)};
        return DifferenceMeasure.frames(series, imp.getTitle(), a, b, roles(imp, signal, contrast), channels, planes,
                ImageJProgress.INSTANCE);
    }

    private static Roles roles(ImagePlus imp, List<Roi> signal, Roi contrast) throws InputException {
        if (signal == null || signal.isEmpty()) {
            throw new InputException("There is no signal region: draw one on the first image, or add regions named "
                    + "'signal' to the ROI Manager.");
        }
        return RegionRoles.roles(signal, List.of(), contrast, imp);
    }

    /** The title of the table a first run on {@code imp} shows (later runs get unique titles). */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
