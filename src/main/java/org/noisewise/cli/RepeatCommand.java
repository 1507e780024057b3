package org.noisewise.cli;

import ij.ImagePlus;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.ImageWriter;
import org.noisewise.io.ResultImages;
import org.noisewise.io.StackPlanes;
import org.noisewise.report.MethodRows;
import org.noisewise.report.ResultRow;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise repeat}: SNR from K repeated acquisitions, with maps. */
@Command(name = "repeat", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Repeated-acquisition SNR: per-pixel temporal mean, SD and SNR maps from a stack of K >= 2 "
                + "repeats (or a hyperstack's time frames, per z slice); region summary with pooled sigma.",
                "--rician applies Koay-Basser correction of the magnitude bias to the summary (for SNR below ~4)."})
public class RepeatCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "STACK", description = "Stack of repeats (TIFF, DICOM series file, ...).")
    Path image;

    @Mixin
    RegionOptions regions;

    @Option(names = "--rician", description = "Koay-Basser correction of the region summary.")
    boolean rician;

    @Mixin
    ChannelsOption channelOption;

    @Option(names = "--slice", paramLabel = "N", description = "1-based z slice of a hyperstack (default: every one).")
    Integer slice;

    @Option(names = "--map", paramLabel = "OUT.tif", description = "Write the mean, SD and SNR maps as a 3-slice TIFF "
            + "(one file per z slice: OUT_z2.tif ... when there are several).")
    Path map;

    @Option(names = "--force", description = "Replace output files that exist.")
    boolean force;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        int channels = channelOption.get();
        ImagePlus imp = ImageFiles.open(image);
        int k = StackPlanes.repeatCount(imp);
        if (k < 2) {
            throw new InputException("'" + image.getFileName() + "' holds a single frame: the repeated-acquisition "
                    + "method needs a stack of at least 2 repeats of the same slice");
        }
        RegionOptions.Resolved reg = regions.resolve(imp.getWidth(), imp.getHeight());
        if (reg.signal() == null && map == null) {
            throw new InputException("nothing to do: give --signal x,y,w,h for a summary and/or --map OUT.tif for maps");
        }
        int zs = StackPlanes.zCount(imp);
        int[] zList = slice == null ? java.util.stream.IntStream.rangeClosed(1, zs).toArray() : new int[] {slice};
        if (slice != null && (slice < 1 || slice > zs)) {
            throw new InputException("--slice " + slice + " does not exist: the stack has " + zs + " z slice(s)");
        }
        if (map != null) {
            for (int z : zList) {
                ImageWriter.checkWritable(mapPath(z, zList.length), force);
            }
        }
        String unit = ImagePlanes.valueUnit(imp);
        List<ResultRow> rows = new ArrayList<>();
        PrintWriter err = spec.commandLine().getErr();
        long start = System.nanoTime();
        for (int z : zList) {
            RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(StackPlanes.repeats(imp, z), imp.getWidth(),
                    imp.getHeight(), null);
            if (zList.length > 1) {
                err.printf(Locale.ROOT, "repeat: z %d of %d done (%.1f s)%n", z, zList.length,
                        (System.nanoTime() - start) / 1e9);
                err.flush();
            }
            if (map != null) {
                ImageWriter.saveTiff(ResultImages.mapStack(image.getFileName() + " maps z" + z, m, imp),
                        mapPath(z, zList.length), force);
            }
            if (reg.signal() != null) {
                rows.add(MethodRows.repeated(image.getFileName().toString(), z, unit,
                        RepeatedAcquisitions.summarize(m, reg.signal(), rician, channels)));
            }
        }
        if (!rows.isEmpty()) {
            Output.print(spec.commandLine().getOut(), rows, json);
        }
        return 0;
    }

    /** The region summary on one opened stack of repeats: one row per z slice. */
    static List<ResultRow> summaryRows(ImagePlus imp, String name, RegionOptions regions, boolean rician, int channels,
                                       Integer slice) throws InputException {
        if (StackPlanes.repeatCount(imp) < 2) {
            throw new InputException("'" + name + "' holds a single frame: the repeated-acquisition method needs a "
                    + "stack of at least 2 repeats of the same slice");
        }
        RegionOptions.Resolved reg = regions.resolve(imp.getWidth(), imp.getHeight());
        if (reg.signal() == null) {
            throw RegionOptions.noSignal();
        }
        String unit = ImagePlanes.valueUnit(imp);
        List<ResultRow> rows = new ArrayList<>();
        for (int z : DifferenceCommand.zSlices(imp, slice)) {
            RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(StackPlanes.repeats(imp, z), imp.getWidth(),
                    imp.getHeight(), null);
            rows.add(MethodRows.repeated(name, z, unit, RepeatedAcquisitions.summarize(m, reg.signal(), rician, channels)));
        }
        return rows;
    }

    private Path mapPath(int z, int count) {
        if (count == 1) {
            return map;
        }
        String name = map.getFileName().toString();
        int dot = name.lastIndexOf('.');
        String stem = dot > 0 ? name.substring(0, dot) : name;
        String ext = dot > 0 ? name.substring(dot) : ".tif";
        return map.resolveSibling(stem + "_z" + z + ext);
    }
}
