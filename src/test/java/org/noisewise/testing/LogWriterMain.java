package org.noisewise.testing;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import org.noisewise.io.QaLogFile;
import org.noisewise.phantom.QaLog;

/** A separate process for the log tests: appends COUNT rows (or rows until killed when COUNT is 0). */
public final class LogWriterMain {

    private LogWriterMain() {
    }

    public static void main(String[] args) throws Exception {
        Path log = Path.of(args[0]);
        int count = Integer.parseInt(args[1]);
        String tag = args[2];
        for (int i = 0; count == 0 || i < count; i++) {
            QaLogFile.append(log, entry(tag, i));
        }
    }

    public static QaLog.Entry entry(String tag, int i) {
        Map<String, String> v = new LinkedHashMap<>();
        v.put("recorded_utc", "2026-12-01T00:00:00Z");
        v.put("acquired", "2026-11-" + String.format("%02d", 1 + i % 28));
        v.put("scanner", "Aster");
        v.put("coil", "head, 1 channel");
        v.put("protocol", "weekly \"uniformity\"");
        v.put("image", tag + "-" + i);
        v.put("method", "difference");
        v.put("verdict", "valid");
        v.put("snr", Double.toString(24 + 0.01 * i));
        v.put("sigma", "5.0");
        v.put("signal_mean", "120");
        v.put("uniformity_piu", "97.1");
        v.put("nema_nonuniformity_percent", "5.0");
        v.put("ghosting_percent", "0.2");
        v.put("flags", "");
        return new QaLog.Entry(v);
    }
}
