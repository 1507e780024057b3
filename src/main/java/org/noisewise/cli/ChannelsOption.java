package org.noisewise.cli;

import java.util.Locale;
import org.noisewise.estimate.InputException;
import picocli.CommandLine.Option;

/** {@code --channels L|auto}, shared by the commands. */
public class ChannelsOption {

    @Option(names = "--channels", paramLabel = "L|auto",
            description = "Receive channels combined by root sum of squares, or auto to estimate the effective "
                    + "count from the background (default: 1; for background and check with --noise-scan, estimated from the scan).")
    String channels;

    /** Whether --channels was given. */
    boolean stated() {
        return channels != null;
    }

    /** The stated channel count, or {@code null} for "auto" (only where {@code autoAllowed}). */
    Integer get(boolean autoAllowed) throws InputException {
        String t = channels == null ? "1" : channels.trim().toLowerCase(Locale.ROOT);
        if (t.equals("auto")) {
            if (!autoAllowed) {
                throw new InputException("--channels auto needs background regions: give a whole number here");
            }
            return null;
        }
        int l;
        try {
            l = Integer.parseInt(t);
        } catch (NumberFormatException e) {
            throw new InputException("--channels must be a whole number of at least 1, or auto; was '" + channels + "'");
        }
        if (l < 1) {
            throw new InputException("--channels must be at least 1, was " + l);
        }
        return l;
    }

    /** A stated channel count ("auto" not allowed). */
    int get() throws InputException {
        return get(false);
    }
}
