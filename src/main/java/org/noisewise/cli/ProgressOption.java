package org.noisewise.cli;

import java.io.PrintWriter;
import java.util.Locale;
import org.noisewise.measure.Progress;
import picocli.CommandLine.Option;

/**
 * {@code --progress}: progress lines on stderr. On by default when stderr is a terminal, so a long
 * run is never silent there, and off in pipelines unless asked for.
 */
public class ProgressOption {

    /** Lines at most this often while the status stays the same. */
    static final long INTERVAL_NANOS = 1_000_000_000L;
    /** A new stage's status is shown unless the last line is younger than this. */
    static final long STAGE_NANOS = 200_000_000L;

    @Option(names = "--progress", description = "Report progress on stderr (default: when it is a terminal).")
    boolean progress;

    /** The sink for a command: throttled lines on {@code err}, or nothing. */
    Progress sink(PrintWriter err, String command) {
        if (!progress && System.console() == null) {
            return Progress.NONE;
        }
        long start = System.nanoTime();
        long[] last = {start - INTERVAL_NANOS};
        String[] shown = {null};
        return (fraction, status) -> {
            long now = System.nanoTime();
            boolean newStage = status != null && !status.isEmpty() && !status.equals(shown[0]);
            if (fraction < 1.0 && now - last[0] < (newStage ? STAGE_NANOS : INTERVAL_NANOS)) {
                return;
            }
            last[0] = now;
            shown[0] = status;
            err.printf(Locale.ROOT, "%s: %3.0f%% %s (%.1f s)%n", command, 100 * fraction,
                    status == null ? "" : status, (now - start) / 1e9);
            err.flush();
        };
    }
}
