package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.measure.Progress;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.CheckMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Roles;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise check}: does the background behave like magnitude noise? */
@Command(name = "check", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Background noise check: fit to the Rayleigh / chi(2L) model (bootstrap p-value), agreement "
                + "of the mean-, SD-, ML- and median-based sigmas, zeros, clipping and quantisation, and a verdict "
                + "(valid, questionable, invalid) with reasons."})
public class CheckCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "IMAGE", description = "Image file.")
    Path image;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--slice", paramLabel = "N", description = "1-based slice (default: every slice).")
    Integer slice;

    @Option(names = "--plot", paramLabel = "OUT.png",
            description = "Write the histogram with the fitted curve as PNG (first checked slice).")
    Path plot;

    @Option(names = "--force", description = "Replace an output file that exists.")
    boolean force;

    @Option(names = "--air-mask", paramLabel = "OUT.tif",
            description = "With --background auto: write the air found as an 8-bit TIFF (255 = air), a slice per "
                    + "checked slice.")
    Path airMask;

    @Mixin
    NoiseScanOption noiseScan;

    @Option(names = "--phase", paramLabel = "ROW|COL",
            description = "Phase-encoding direction for the ghosting check (default: DICOM 0018,1312, else unknown).")
    String phase;

    @Mixin
    ProgressOption progressOption;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        Integer channels = channelOption.get(true);
        if (plot != null) {
            ImageWriter.checkWritable(plot, force, image);
        }
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "check");
        progress.report(0.0, "reading " + image.getFileName());
        AirMask.check(airMask, regions, force, image);
        ImagePlus imp = ImageFiles.open(image, echoOption.get());
        regions.refuseContrast("check");
        Roles roles = regions.resolve(imp.getWidth(), imp.getHeight());
        RegionOptions.require(roles, false, false, true);
        ImagePlus scan = noiseScan.open(echoOption.get());
        if (scan != null && !channelOption.stated()) {
            channels = null;
        }
        Measurement m = CheckMeasure.run(imp, image.getFileName().toString(), roles,
                new CheckMeasure.Options(channels, phase == null ? null : BackgroundCommand.parsePhase(phase)),
                Slices.select(imp, slice), scan, noiseScan.title(), progress);
        if (plot != null) {
            ImageWriter.savePng(m.plots().get(0).getImagePlus(), plot, force, image);
        }
        AirMask.write(m, airMask, force, image);
        Output.notes(spec.commandLine().getErr(), "check", m.notes());
        Output.print(spec.commandLine().getOut(), m.rows(), json);
        return 0;
    }
}
