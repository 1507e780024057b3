package org.noisewise.cli;

import org.noisewise.phantom.QaLog;
import picocli.CommandLine.Option;

/** The QA log's key and baseline options, shared by {@code qa} and {@code stability}. */
public class LogKeyOptions {

    @Option(names = "--scanner", paramLabel = "NAME", description = "Scanner key for the log (default: DICOM).")
    String scanner;

    @Option(names = "--coil", paramLabel = "NAME", description = "Coil key for the log (default: DICOM 0018,1250).")
    String coil;

    @Option(names = "--protocol", paramLabel = "NAME", description = "Protocol key for the log (default: DICOM 0018,1030).")
    String protocol;

    @Option(names = "--baseline", paramLabel = "N", defaultValue = "" + QaLog.DEFAULT_BASELINE,
            description = "Sessions forming the baseline per key (default: ${DEFAULT-VALUE}).")
    int baseline;
}
