package org.noisewise.measure;

import ij.ImagePlus;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.StackPlanes;
import org.noisewise.report.CnrRows;
import org.noisewise.report.MethodRows;
import org.noisewise.report.ResultRow;

/** The two-acquisition (NEMA difference) method: two images, or two frames of one stack. */
public final class DifferenceMeasure {

    private DifferenceMeasure() {
    }

    /** Two images of the same shape, plane by plane; one row per plane and signal region. */
    public static Measurement images(ImagePlus first, String firstTitle, ImagePlus second, String secondTitle,
                                     Roles roles, int channels, int[] planes, Progress progress) throws InputException {
        ImagePlanes.requireGrayscale(first);
        ImagePlanes.requireGrayscale(second);
        if (first == second) {
            throw new InputException("the same image was chosen twice: choose two separate acquisitions");
        }
        ImagePlanes.requireSameShape(first, firstTitle, second, secondTitle);
        if (first.getBitDepth() != second.getBitDepth()) {
            throw new InputException("'" + firstTitle + "' is " + first.getBitDepth() + "-bit and '" + secondTitle
                    + "' is " + second.getBitDepth() + "-bit: choose two acquisitions of the same type");
        }
        List<Region> regions = roles.signals();
        Region contrast = roles.oneContrast();
        String unit = ImagePlanes.valueUnit(first);
        List<ResultRow> rows = new ArrayList<>();
        for (int k = 0; k < planes.length; k++) {
            int n = planes[k];
            progress.report((double) k / planes.length, "SNR (difference): slice " + n);
            float[] a = ImagePlanes.calibratedPixels(first, n);
            float[] b = ImagePlanes.calibratedPixels(second, n);
            for (Region reg : regions) {
                double step = BackgroundValues.storage(first, n).step();
                DifferenceSnrResult r = DifferenceSnr.analyze(a, b, first.getWidth(), reg, channels, step);
                rows.add(row(MethodRows.difference(firstTitle, secondTitle, n, unit, r), r, a, b, first.getWidth(),
                        reg, contrast, unit, step));
            }
        }
        progress.report(1.0, "");
        List<String> notes = Measurement.imageNotes(first, second);
        Acquisition.addEfficiency(rows, first, notes);
        return new Measurement(rows, List.of(), List.of(), notes);
    }

    /** Frames {@code a} and {@code b} (1-based) of one stack or hyperstack, per z slice. */
    public static Measurement frames(ImagePlus imp, String title, int a, int b, Roles roles, int channels, int[] zs,
                                     Progress progress) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        if (a == b) {
            throw new InputException("both frames are " + a + ": choose two different frames");
        }
        if (StackPlanes.repeatCount(imp) < 2) {
            throw new InputException("'" + title + "' holds a single frame: the difference method needs two "
                    + "acquisitions (two images, or a stack of two or more)");
        }
        List<Region> regions = roles.signals();
        Region contrast = roles.oneContrast();
        String unit = ImagePlanes.valueUnit(imp);
        List<ResultRow> rows = new ArrayList<>();
        for (int k = 0; k < zs.length; k++) {
            int z = zs[k];
            progress.report((double) k / zs.length, "SNR (difference): z " + z);
            float[] pa = ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, a));
            float[] pb = ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, b));
            for (Region reg : regions) {
                double step = Planes.step(imp, z);
                DifferenceSnrResult r = DifferenceSnr.analyze(pa, pb, imp.getWidth(), reg, channels, step);
                rows.add(row(MethodRows.difference(title + " frame " + a, title + " frame " + b, z, unit, r), r, pa,
                        pb, imp.getWidth(), reg, contrast, unit, step));
            }
        }
        progress.report(1.0, "");
        List<String> notes = Measurement.imageNotes(imp);
        Acquisition.addEfficiency(rows, imp, notes);
        return new Measurement(rows, List.of(), List.of(), notes);
    }

    /** A region's row, with its region name and, given a contrast region, the CNR cells. */
    private static ResultRow row(ResultRow methodRow, DifferenceSnrResult r, float[] a, float[] b, int width,
                                 Region reg, Region contrast, String unit, double step) throws InputException {
        ResultRow row = methodRow.add("region", "Region", reg.name());
        if (contrast == null) {
            return row;
        }
        return CnrRows.with(row, Contrast.difference(a, b, width, reg, contrast, r, r.channels(), step), contrast.name(),
                unit);
    }
}
