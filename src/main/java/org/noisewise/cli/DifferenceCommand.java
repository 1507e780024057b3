package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageFiles;
import org.noisewise.measure.DifferenceMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Progress;
import org.noisewise.measure.Roles;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise difference}: the NEMA two-acquisition difference method, bias-corrected. */
@Command(name = "difference", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Two-acquisition (NEMA difference) SNR: the magnitude SD is SD(I1 - I2)/sqrt(2) over the signal "
                + "region; amplitude, sigma and SNR are corrected for magnitude bias (Koay-Basser); NEMA's plain "
                + "sqrt(2) S/SD(diff) is shown beside them.",
                "Either two image files, or one stack with --frames a,b (time points of a hyperstack, else slices)."})
public class DifferenceCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(arity = "1..*", paramLabel = "IMAGE", description = "IMAGE_A IMAGE_B, or one STACK with --frames.")
    List<Path> images;

    @Option(names = "--frames", paramLabel = "a,b", converter = FramePair.Converter.class,
            description = "Two 1-based frames of one stack (time points of a hyperstack, else stack slices).")
    FramePair frames;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--slice", paramLabel = "N", description = "1-based slice (z) to measure (default: every slice).")
    Integer slice;

    @Mixin
    ProgressOption progressOption;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        int channels = channelOption.get();
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "difference");
        Measurement m;
        if (images.size() > 2) {
            throw new InputException(images.size() + " images were given: the difference method compares two "
                    + "acquisitions; give IMAGE_A IMAGE_B, or one stack with --frames a,b");
        }
        if (images.size() == 2) {
            if (frames != null) {
                throw new InputException("give either two images or one stack with --frames, not both");
            }
            ImagePlus a = ImageFiles.open(images.get(0), echoOption.get());
            ImagePlus b = ImageFiles.open(images.get(1), echoOption.get());
            Roles roles = regions.resolve(a.getWidth(), a.getHeight());
            RegionOptions.require(roles, true, false, false);
            m = DifferenceMeasure.images(a, images.get(0).getFileName().toString(), b,
                    images.get(1).getFileName().toString(), roles, channels, Slices.select(a, slice), progress);
        } else {
            if (frames == null) {
                throw new InputException("one image was given: add a second image, or --frames a,b to use two frames "
                        + "of this stack");
            }
            ImagePlus imp = ImageFiles.open(images.get(0), echoOption.get());
            m = frames(imp, images.get(0).getFileName().toString(), regions, frames, channels, slice, progress);
        }
        Output.print(spec.commandLine().getOut(), m.rows(), json);
        Output.notes(spec.commandLine().getErr(), "difference", m.notes());
        return 0;
    }

    /** The difference method on two frames of one opened stack (shared with batch). */
    static Measurement frames(ImagePlus imp, String name, RegionOptions regions, FramePair frames, int channels,
                              Integer slice, Progress progress) throws InputException {
        Roles roles = regions.resolve(imp.getWidth(), imp.getHeight());
        RegionOptions.require(roles, true, false, false);
        return DifferenceMeasure.frames(imp, name, frames.a(), frames.b(), roles, channels, Slices.selectZ(imp, slice),
                progress);
    }
}
