package org.noisewise.measure;

import ij.ImagePlus;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.estimate.RepeatedSnrResult;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.RepeatedMaps;
import org.noisewise.io.ResultImages;
import org.noisewise.io.StackPlanes;
import org.noisewise.report.CnrRows;
import org.noisewise.report.MethodRows;
import org.noisewise.report.ResultRow;

/**
 * The repeated-acquisition method: per z slice, the temporal mean, SD and SNR maps (one 3-slice
 * image each, when asked for) and a corrected region summary per signal region, with a contrast
 * region its contrast-to-noise ratio.
 */
public final class RepeatedMeasure {

    private RepeatedMeasure() {
    }

    /**
     * @param zs   1-based z slices
     * @param maps return the map images
     */
    public static Measurement run(ImagePlus imp, String title, Roles roles, int channels, int[] zs, boolean maps,
                                  Progress progress) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        int k = StackPlanes.repeatCount(imp);
        if (k < 2) {
            throw new InputException("'" + title + "' holds a single frame: the repeated-acquisition method needs a "
                    + "stack of at least 2 repeats of the same slice");
        }
        if (roles.signal().isEmpty() && !maps) {
            throw new InputException("nothing to do: give a signal region for the summary, or ask for the maps");
        }
        Region contrast = roles.oneContrast();
        String unit = ImagePlanes.valueUnit(imp);
        int zCount = StackPlanes.zCount(imp);
        // the map images are made afterwards, in slice order: ImageJ numbers new images from one counter
        record Slice(int z, RepeatedAcquisitions.Maps maps, List<ResultRow> rows) {
        }
        List<Slice> slices = PerSlice.run(imp, zs, progress, "Repeated acquisitions", (i, z, part) -> {
            RepeatedAcquisitions.Maps m = RepeatedMaps.compute(imp, z,
                    f -> part.report(f, "Repeated acquisitions: z " + z + " of " + zCount));
            RepeatedAcquisitions.Frames frames = RepeatedMaps.frames(imp, z);
            double step = Planes.step(imp, z);
            List<ResultRow> sliceRows = new ArrayList<>();
            for (Region reg : roles.signal()) {
                RepeatedSnrResult r = RepeatedAcquisitions.summarize(m, frames, reg, channels, step);
                ResultRow row = MethodRows.repeated(title, z, unit, r).add("region", "Region", reg.name());
                if (contrast != null) {
                    row = CnrRows.with(row, Contrast.repeated(m, frames, reg, contrast, r, channels, step), contrast.name(),
                            unit);
                }
                sliceRows.add(row);
            }
            return new Slice(z, maps ? m : null, sliceRows);
        });
        List<ImagePlus> images = new ArrayList<>();
        List<ResultRow> rows = new ArrayList<>();
        for (Slice s : slices) {
            if (s.maps() != null) {
                images.add(ResultImages.mapStack(title + " repeat maps" + (zCount > 1 ? " z" + s.z() : ""), s.maps(), imp,
                        unit));
            }
            rows.addAll(s.rows());
        }
        progress.report(1.0, "");
        List<String> notes = Measurement.imageNotes(imp);
        Acquisition.addEfficiency(rows, imp, notes);
        return new Measurement(rows, images, List.of(), notes);
    }
}
