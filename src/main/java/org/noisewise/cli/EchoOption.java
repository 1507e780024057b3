package org.noisewise.cli;

import org.noisewise.estimate.InputException;
import picocli.CommandLine.Option;

/** {@code --echo N}: the echo of a multi-echo DICOM series to measure, shared by the commands that read images. */
public class EchoOption {

    @Option(names = "--echo", paramLabel = "N",
            description = "For a DICOM series holding several echoes (never mixed): the echo to measure, 1 for the "
                    + "first in increasing Echo Number (or echo time of an enhanced file). Without it such a series is "
                    + "refused, naming its echoes.")
    Integer echo;

    /** The echo asked for, or null. */
    Integer get() throws InputException {
        if (echo != null && echo < 1) {
            throw new InputException("--echo must be 1 or more (1 = the first echo), was " + echo);
        }
        return echo;
    }
}
