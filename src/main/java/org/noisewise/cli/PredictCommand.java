package org.noisewise.cli;

import java.util.List;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.protocol.Protocol;
import org.noisewise.protocol.ProtocolScaling;
import org.noisewise.report.ProtocolRows;
import org.noisewise.report.ResultRow;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** {@code noisewise predict}: the SNR ratio two protocols predict, factor by factor. */
@Command(name = "predict", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Predicted SNR ratio between two protocols: SNR ~ voxel volume x sqrt(phase steps x partitions "
                + "x averages / bandwidth per pixel) x field^p / (g sqrt(R)).",
                "PROTOCOL is KEY=VALUE pairs (voxel=1x1x5,phase=256,partitions=1,averages=1,bandwidth=130,field=3,"
                        + "acceleration=1,g=1) or a DICOM file or series folder whose header states them."})
public class PredictCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Option(names = "--from", required = true, paramLabel = "PROTOCOL", description = "The protocol measured or known.")
    String from;

    @Option(names = "--to", required = true, paramLabel = "PROTOCOL", description = "The protocol to predict.")
    String to;

    @Option(names = "--snr", paramLabel = "S", description = "SNR measured with --from: also print the SNR predicted "
            + "for --to.")
    Double snr;

    @Option(names = "--field-exponent", paramLabel = "p", defaultValue = "1",
            description = "Exponent of the field strength (default ${DEFAULT-VALUE}; about 2 was measured in phantoms "
                    + "at 3-11.7 T).")
    double fieldExponent;

    @Option(names = "--json", description = "Write JSON.")
    boolean json;

    @Override
    public Integer call() throws InputException {
        if (snr != null && !(snr > 0 && Double.isFinite(snr))) {
            throw new InputException("--snr must be a positive number, was " + snr);
        }
        Protocol a = ProtocolArgument.resolve(from, "--from");
        Protocol b = ProtocolArgument.resolve(to, "--to");
        ProtocolScaling.Prediction p = ProtocolScaling.predict(a, b, fieldExponent);
        ResultRow row = ProtocolRows.prediction(a, b, p, snr);
        List<String> notes = new java.util.ArrayList<>();
        a.notes().forEach(n -> notes.add("from: " + n));
        b.notes().forEach(n -> notes.add("to: " + n));
        notes.addAll(p.notes());
        Output.notes(spec.commandLine().getErr(), "predict", notes);
        Output.print(spec.commandLine().getOut(), List.of(row), json);
        return 0;
    }
}
