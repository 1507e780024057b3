package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.RicianCorrection;
import org.noisewise.io.CorrectedImages;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageWriter;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise correct}: a bias-corrected copy of a magnitude image. */
@Command(name = "correct", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Rician bias correction: writes a new 32-bit TIFF with the magnitude noise bias removed pixel "
                + "by pixel, given the per-channel noise sigma.",
                "koay (default): the amplitude whose expected magnitude equals the pixel value (0 at or below the "
                        + "pure-noise mean); power: sqrt(M^2 - 2L sigma^2), 0 where negative."})
public class CorrectCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "IMAGE", description = "Image file.")
    Path image;

    @Option(names = "--sigma", required = true, paramLabel = "s",
            description = "Per-channel noise SD in the image's calibrated units (from background, difference or repeat).")
    double sigma;

    @Mixin
    ChannelsOption channelOption;

    @Option(names = "--method", paramLabel = "koay|power", defaultValue = "koay", description = "Correction (default: ${DEFAULT-VALUE}).")
    String method;

    @Option(names = "--out", required = true, paramLabel = "OUT.tif", description = "Output TIFF.")
    Path out;

    @Option(names = "--force", description = "Replace the output file if it exists.")
    boolean force;

    @Override
    public Integer call() throws InputException {
        if (!(sigma > 0) || Double.isInfinite(sigma)) {
            throw new InputException("--sigma must be a positive number, was " + sigma);
        }
        int channels = channelOption.get();
        RicianCorrection.Method m;
        try {
            m = RicianCorrection.Method.parse(method);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        }
        ImageWriter.checkWritable(out, force);
        ImagePlus imp = ImageFiles.open(image);
        ImagePlus corrected = CorrectedImages.correct(imp, sigma, List.of(), channels, m, null);
        ImageWriter.saveTiff(corrected, out, force);
        spec.commandLine().getOut().println("wrote " + out + " (" + m.label() + ", sigma " + sigma + ", L " + channels + ")");
        spec.commandLine().getOut().flush();
        return 0;
    }
}
