package org.noisewise.cli;

import org.noisewise.estimate.InputException;
import picocli.CommandLine.Option;

/** {@code --channels L}, shared by the commands. */
public class ChannelsOption {

    @Option(names = "--channels", paramLabel = "L", defaultValue = "1",
            description = "Receive channels combined by root sum of squares (default: ${DEFAULT-VALUE}).")
    int channels;

    /** The channel count, checked. */
    int get() throws InputException {
        if (channels < 1) {
            throw new InputException("--channels must be at least 1, was " + channels);
        }
        return channels;
    }
}
