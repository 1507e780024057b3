package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.GFactorMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Progress;
import org.noisewise.measure.Roles;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** {@code noisewise gfactor}: g-factor map and region value from repeated full and accelerated acquisitions. */
@Command(name = "gfactor", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Parallel-imaging g-factor, g = SNR_full / (SNR_accelerated sqrt(R)): a pixel map from the "
                + "temporal mean and SD of repeated acquisitions, and each signal region's value from the corrected, "
                + "pooled SNRs with a 95%% interval.",
                "FULL and ACCEL are each a series of repeats of the same slices (as repeat takes them) or a pair."})
public class GFactorCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FULL", description = "Unaccelerated acquisition: repeats or a pair.")
    Path full;

    @Parameters(index = "1", paramLabel = "ACCEL", description = "Accelerated acquisition: repeats or a pair.")
    Path accel;

    @Option(names = "--acceleration", required = true, paramLabel = "R", description = "Acceleration factor R of ACCEL.")
    double acceleration;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--window", paramLabel = "N", description = "Odd side of the window over which the pixel map "
            + "averages variances (default 1 for series, " + GFactorMeasure.PAIR_WINDOW + " when an input is a pair).")
    Integer window;

    @Option(names = "--slice", paramLabel = "N", description = "1-based z slice (default: every one).")
    Integer slice;

    @Option(names = "--map", paramLabel = "OUT.tif", description = "Write the g map (32-bit TIFF; OUT_zN.tif per z "
            + "slice when there are several).")
    Path map;

    @Option(names = "--force", description = "Replace output files that exist.")
    boolean force;

    @Mixin
    ProgressOption progressOption;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several rows).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        int channels = channelOption.get();
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "gfactor");
        ImagePlus f = ImageFiles.open(full, echoOption.get());
        ImagePlus a = ImageFiles.open(accel, echoOption.get());
        regions.refuseContrast("gfactor");
        regions.refuseAutoAir("gfactor");
        Roles roles = regions.resolve(f.getWidth(), f.getHeight());
        if (roles.signal().isEmpty() && map == null) {
            throw new InputException("nothing to do: give --signal x,y,w,h for the region's g-factor and/or --map "
                    + "OUT.tif for the pixel map");
        }
        int[] zs = Slices.selectZ(f, slice);
        if (map != null) {
            for (int z : zs) {
                ImageWriter.checkWritable(OutputPaths.perZ(map, z, zs.length), force, full, accel);
            }
        }
        Measurement m = GFactorMeasure.run(f, full.getFileName().toString(), a, accel.getFileName().toString(),
                acceleration, roles, channels, zs, window, map != null, progress);
        for (int i = 0; i < m.images().size(); i++) {
            ImageWriter.saveTiff(m.images().get(i), OutputPaths.perZ(map, zs[i], zs.length), force, full, accel);
        }
        Output.notes(spec.commandLine().getErr(), "gfactor", m.notes());
        if (!m.rows().isEmpty()) {
            Output.print(spec.commandLine().getOut(), m.rows(), json);
        }
        return 0;
    }
}
