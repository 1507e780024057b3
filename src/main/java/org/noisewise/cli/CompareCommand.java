package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageFiles;
import org.noisewise.measure.CompareMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Progress;
import org.noisewise.measure.Roles;
import org.noisewise.protocol.Protocol;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** {@code noisewise compare}: measured against predicted SNR ratio of two protocols. */
@Command(name = "compare", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Measures the corrected SNR of two acquisitions with one method (repeated acquisitions when each "
                + "is a series, the difference method when each is a pair, else background regions) and reports the "
                + "measured ratio B/A with its 95%% interval beside the ratio the protocols predict.",
                "Protocols come from the DICOM headers; --from/--to give or override them (KEY=VALUE pairs, see "
                        + "predict)."})
public class CompareCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "IMAGE_A", description = "Acquisition with protocol A.")
    Path imageA;

    @Parameters(index = "1", paramLabel = "IMAGE_B", description = "Acquisition with protocol B.")
    Path imageB;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--from", paramLabel = "PROTOCOL", description = "Protocol of IMAGE_A (over its header).")
    String from;

    @Option(names = "--to", paramLabel = "PROTOCOL", description = "Protocol of IMAGE_B (over its header).")
    String to;

    @Option(names = "--field-exponent", paramLabel = "p", defaultValue = "1",
            description = "Exponent of the field strength (default ${DEFAULT-VALUE}).")
    double fieldExponent;

    @Option(names = "--slice", paramLabel = "N", description = "1-based z slice (default: every one).")
    Integer slice;

    @Mixin
    ProgressOption progressOption;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several rows).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        int channels = channelOption.get();
        Protocol pa = from == null ? null : ProtocolArgument.resolve(from, "--from");
        Protocol pb = to == null ? null : ProtocolArgument.resolve(to, "--to");
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "compare");
        ImagePlus a = ImageFiles.open(imageA, echoOption.get());
        ImagePlus b = ImageFiles.open(imageB, echoOption.get());
        regions.refuseContrast("compare");
        regions.refuseAutoAir("compare");
        Roles roles = regions.resolve(a.getWidth(), a.getHeight());
        RegionOptions.require(roles, true, false, false);
        Measurement m = CompareMeasure.run(a, imageA.getFileName().toString(), b, imageB.getFileName().toString(), pa, pb,
                fieldExponent, roles, channels, Slices.selectZ(a, slice), progress);
        Output.notes(spec.commandLine().getErr(), "compare", m.notes());
        Output.print(spec.commandLine().getOut(), m.rows(), json);
        return 0;
    }
}
