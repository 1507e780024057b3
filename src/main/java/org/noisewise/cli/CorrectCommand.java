package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.measure.Progress;
import org.noisewise.estimate.RicianCorrection;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.CorrectionMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Roles;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise correct}: a bias-corrected copy of a magnitude image. */
@Command(name = "correct", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Rician bias correction: writes a new 32-bit TIFF with the magnitude noise bias removed, given "
                + "the per-channel noise sigma (or measured per slice from --background regions).",
                "koay (default): per pixel, the amplitude whose expected magnitude equals the pixel value; power: "
                        + "sqrt(M^2 - 2L sigma^2) per pixel; local: the same over an N x N window, whose region means "
                        + "are unbiased down to A/sigma ~ 2 (per-pixel methods are unbiased only at high SNR)."})
public class CorrectCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "IMAGE", description = "Image file.")
    Path image;

    @Option(names = "--sigma", paramLabel = "s", defaultValue = "0",
            description = "Per-channel noise SD in the image's calibrated units (from background, difference or repeat); "
                    + "0 or omitted: measured on each slice from --background regions.")
    double sigma;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--method", paramLabel = "koay|power|local", defaultValue = "koay",
            description = "Correction (default: ${DEFAULT-VALUE}).")
    String method;

    @Option(names = "--window", paramLabel = "N", defaultValue = "5",
            description = "local: neighbourhood side in pixels, odd (default: ${DEFAULT-VALUE}).")
    int window;

    @Option(names = "--out", required = true, paramLabel = "OUT.tif", description = "Output TIFF.")
    Path out;

    @Option(names = "--force", description = "Replace the output file if it exists (never the input).")
    boolean force;

    @Mixin
    ProgressOption progressOption;

    @Override
    public Integer call() throws InputException {
        if (sigma < 0 || !Double.isFinite(sigma)) {
            throw new InputException("--sigma must be a positive number (or 0 to measure it), was " + sigma);
        }
        int channels = channelOption.get();
        RicianCorrection.Method m;
        try {
            m = RicianCorrection.Method.parse(method);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        }
        ImageWriter.checkWritable(out, force, image);
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "correct");
        progress.report(0.0, "reading " + image.getFileName());
        ImagePlus imp = ImageFiles.open(image, echoOption.get());
        regions.refuseContrast("correct");
        regions.refuseAutoAir("correct");
        Roles roles = regions.resolve(imp.getWidth(), imp.getHeight());
        if (sigma == 0 && roles.background().isEmpty()) {
            throw new InputException("give --sigma s, or --background regions (in air) to measure it on each slice");
        }
        Measurement result = CorrectionMeasure.run(imp, image.getFileName().toString(), roles,
                new CorrectionMeasure.Options(sigma, channels, m, window),
                progress);
        ImageWriter.saveTiff(result.images().get(0), out, force, image);
        Output.notes(spec.commandLine().getErr(), "correct", result.notes());
        spec.commandLine().getOut().println("wrote " + out + " (" + m.label()
                + (sigma > 0 ? ", sigma " + sigma : ", sigma measured per slice") + ", L " + channels + ")");
        spec.commandLine().getOut().flush();
        return 0;
    }
}
