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
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.StackPlanes;
import org.noisewise.report.MethodRows;
import org.noisewise.report.ResultRow;

/**
 * {@code Plugins>Noisewise>SNR (Two Acquisitions)...}: the NEMA difference method,
 * {@code sigma = SD(I1 - I2)/sqrt(2)}, {@code SNR = mean(I1)/sigma}, over each signal region.
 *
 * <p>Macro keys: {@code source} ([Two images] or [Two frames of one stack]); {@code first},
 * {@code second} (image titles); {@code frame_a}, {@code frame_b} (1-based frames, or slices of a
 * stack without a time axis); {@code channels} (L, for the low-SNR statement);
 * {@code slices} ([Current slice] or [All slices]); {@code region_N} roles as in the background
 * command. Signal regions: ROI Manager regions named {@code signal...}, else the selection on the
 * first image, else every ROI Manager region.
 */
public class DifferenceSnrCommand implements PlugIn {

    static final String TITLE = "SNR (Two Acquisitions)";
    static final String TWO_IMAGES = "Two images";
    static final String TWO_FRAMES = "Two frames of one stack";

    @Override
    public void run(String arg) {
        int[] ids = WindowManager.getIDList();
        ImagePlus current = WindowManager.getCurrentImage();
        if (ids == null || current == null) {
            IJ.noImage();
            return;
        }
        RegionRoles regions = RegionRoles.of(current);
        GenericDialog gd = new GenericDialog(TITLE);
        gd.addChoice("Source:", new String[] {TWO_IMAGES, TWO_FRAMES}, ids.length >= 2 ? TWO_IMAGES : TWO_FRAMES);
        gd.addImageChoice("First image:", current.getTitle());
        gd.addImageChoice("Second image:", secondTitle(ids, current));
        gd.addNumericField("Frame_a:", 1, 0);
        gd.addNumericField("Frame_b:", 2, 0);
        gd.addNumericField("Channels (L):", 1, 0);
        gd.addChoice("Slices:", new String[] {BackgroundSnrCommand.CURRENT, BackgroundSnrCommand.ALL},
                BackgroundSnrCommand.CURRENT);
        regions.addFields(gd);
        gd.addHelp("<html><b>SNR (Two Acquisitions)</b><br>Two identical acquisitions made close in time: "
                + "sigma = SD(I1 - I2) / sqrt(2) over the signal region, SNR = mean(I1) / sigma (NEMA MS 1).<br>"
                + "Valid with array coils, parallel imaging, filters and masked backgrounds.</html>");
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
        try {
            if (gd.invalidNumber() || channels < 1) {
                throw new InputException("frames and channel count must be whole numbers (channels at least 1)");
            }
            List<Roi> signal = regions.withSelectionOf(first).signalRegions();
            ResultsTable rt = frames ? processFrames(first, a, b, signal, channels, all)
                    : processImages(first, second, signal, channels, all);
            rt.show(tableTitle(first));
        } catch (InputException e) {
            IJ.error(TITLE, e.getMessage());
        } catch (RuntimeException e) {
            Errors.unexpected(TITLE, e);
        }
    }

    private static String secondTitle(int[] ids, ImagePlus current) {
        for (int id : ids) {
            ImagePlus imp = WindowManager.getImage(id);
            if (imp != null && imp != current) {
                return imp.getTitle();
            }
        }
        return current.getTitle();
    }

    public static String tableTitle(ImagePlus imp) {
        return "SNR difference - " + imp.getTitle();
    }

    /** Two images of the same size; per slice when they are stacks. Never modifies them. */
    public static ResultsTable processImages(ImagePlus first, ImagePlus second, List<Roi> signal, int channels,
                                             boolean allSlices) throws InputException {
        ImagePlanes.requireGrayscale(first);
        ImagePlanes.requireGrayscale(second);
        if (first == second) {
            throw new InputException("the same image was chosen twice: choose two separate acquisitions");
        }
        if (first.getWidth() != second.getWidth() || first.getHeight() != second.getHeight()
                || first.getStackSize() != second.getStackSize()) {
            throw new InputException(String.format("'%s' (%dx%dx%d) and '%s' (%dx%dx%d) differ in size: "
                            + "choose two acquisitions of the same matrix and slices", first.getTitle(),
                    first.getWidth(), first.getHeight(), first.getStackSize(), second.getTitle(), second.getWidth(),
                    second.getHeight(), second.getStackSize()));
        }
        if (first.getBitDepth() != second.getBitDepth()) {
            throw new InputException("'" + first.getTitle() + "' is " + first.getBitDepth() + "-bit and '"
                    + second.getTitle() + "' is " + second.getBitDepth() + "-bit: choose two acquisitions of the same type");
        }
        List<Region> regions = regions(first, signal);
        int lo = allSlices ? 1 : first.getCurrentSlice();
        int hi = allSlices ? first.getStackSize() : first.getCurrentSlice();
        String unit = ImagePlanes.valueUnit(first);
        List<ResultRow> rows = new ArrayList<>();
        for (int n = lo; n <= hi; n++) {
            float[] a = ImagePlanes.calibratedPixels(first, n);
            float[] b = ImagePlanes.calibratedPixels(second, n);
            for (Region reg : regions) {
                rows.add(MethodRows.difference(first.getTitle(), second.getTitle(), n, unit,
                        DifferenceSnr.analyze(a, b, first.getWidth(), reg, channels)).add("region", "Region", reg.name()));
            }
        }
        return Tables.toResultsTable(rows);
    }

    /** Frames {@code a} and {@code b} of one stack or hyperstack (per z slice). */
    public static ResultsTable processFrames(ImagePlus imp, int a, int b, List<Roi> signal, int channels,
                                             boolean allSlices) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        if (a == b) {
            throw new InputException("frame_a and frame_b are both " + a + ": choose two different frames");
        }
        if (StackPlanes.repeatCount(imp) < 2) {
            throw new InputException("'" + imp.getTitle() + "' has a single frame: the difference method needs "
                    + "two acquisitions (two images, or a stack of two or more)");
        }
        List<Region> regions = regions(imp, signal);
        int zs = StackPlanes.zCount(imp);
        int lo = allSlices || zs == 1 ? 1 : imp.getSlice();
        int hi = allSlices ? zs : lo;
        String unit = ImagePlanes.valueUnit(imp);
        List<ResultRow> rows = new ArrayList<>();
        for (int z = lo; z <= hi; z++) {
            float[] pa = ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, a));
            float[] pb = ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, b));
            for (Region reg : regions) {
                rows.add(MethodRows.difference(imp.getTitle() + " frame " + a, imp.getTitle() + " frame " + b, z, unit,
                        DifferenceSnr.analyze(pa, pb, imp.getWidth(), reg, channels)).add("region", "Region", reg.name()));
            }
        }
        return Tables.toResultsTable(rows);
    }

    private static List<Region> regions(ImagePlus imp, List<Roi> signal) throws InputException {
        if (signal == null || signal.isEmpty()) {
            throw new InputException("no signal region: draw one on the first image or add regions named "
                    + "'signal' to the ROI Manager");
        }
        return RegionRoles.toRegions(signal, "signal", imp.getWidth(), imp.getHeight());
    }
}
