package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Progress;
import org.noisewise.measure.RepeatedMeasure;
import org.noisewise.measure.Roles;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise repeat}: SNR from K repeated acquisitions, with maps. */
@Command(name = "repeat", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Repeated-acquisition SNR: per-pixel temporal mean, SD and SNR maps from a stack of K >= 2 "
                + "repeats (or a hyperstack's time frames, per z slice); a region summary with pooled sigma, always "
                + "corrected for magnitude bias (Koay-Basser), the plain ratio beside it."})
public class RepeatCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "STACK", description = "Stack of repeats (TIFF, DICOM series, NIfTI 4-D, ...).")
    Path image;

    @Mixin
    RegionOptions regions;

    @Option(names = "--rician", description = "Accepted for compatibility: the correction is always applied.")
    boolean rician;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--slice", paramLabel = "N", description = "1-based z slice of a hyperstack (default: every one).")
    Integer slice;

    @Option(names = "--map", paramLabel = "OUT.tif", description = "Write the mean, SD and SNR maps as a 3-slice TIFF "
            + "(one file per z slice: OUT_z2.tif ... when there are several).")
    Path map;

    @Option(names = "--force", description = "Replace output files that exist.")
    boolean force;

    @Mixin
    ProgressOption progressOption;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        int channels = channelOption.get();
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "repeat");
        progress.report(0.0, "reading " + image.getFileName());
        ImagePlus imp = ImageFiles.open(image, echoOption.get());
        Roles roles = regions.resolve(imp.getWidth(), imp.getHeight());
        if (roles.signal().isEmpty() && map == null) {
            throw new InputException("nothing to do: give --signal x,y,w,h for a summary and/or --map OUT.tif for maps");
        }
        int[] zs = Slices.selectZ(imp, slice);
        if (map != null) {
            for (int z : zs) {
                ImageWriter.checkWritable(mapPath(z, zs.length), force, image);
            }
        }
        Measurement m = RepeatedMeasure.run(imp, image.getFileName().toString(), roles, channels, zs, map != null,
                progress);
        for (int i = 0; i < m.images().size(); i++) {
            ImageWriter.saveTiff(m.images().get(i), mapPath(zs[i], zs.length), force, image);
        }
        if (!m.rows().isEmpty()) {
            Output.print(spec.commandLine().getOut(), m.rows(), json);
        }
        Output.notes(spec.commandLine().getErr(), "repeat", m.notes());
        return 0;
    }

    /** The region summary on one opened stack of repeats (shared with batch). */
    static Measurement summary(ImagePlus imp, String name, RegionOptions regions, int channels, Integer slice,
                               Progress progress) throws InputException {
        Roles roles = regions.resolve(imp.getWidth(), imp.getHeight());
        RegionOptions.require(roles, true, false, false);
        return RepeatedMeasure.run(imp, name, roles, channels, Slices.selectZ(imp, slice), false, progress);
    }

    private Path mapPath(int z, int count) {
        return OutputPaths.perZ(map, z, count);
    }
}
