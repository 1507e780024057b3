package org.noisewise.cli;

import com.google.gson.JsonArray;
import java.io.PrintWriter;
import java.util.List;
import org.noisewise.report.Formats;
import org.noisewise.report.ResultRow;

/** Writes result rows to stdout as an aligned table or JSON, and notes to stderr. */
final class Output {

    private Output() {
    }

    /** One row: a JSON object; several rows: a JSON array of objects. */
    static void print(PrintWriter out, List<ResultRow> rows, boolean json) {
        if (json) {
            if (rows.size() == 1) {
                out.println(Formats.toJsonString(Formats.toJson(rows.get(0))));
            } else {
                JsonArray a = new JsonArray();
                rows.forEach(r -> a.add(Formats.toJson(r)));
                out.println(Formats.toJsonString(a));
            }
        } else {
            out.print(Formats.alignedText(rows));
        }
        out.flush();
    }

    /** What the measurement chose for the user, one "note:" line each on stderr. */
    static void notes(PrintWriter err, String command, List<String> notes) {
        for (String n : notes) {
            err.println(command + ": note: " + n);
        }
        err.flush();
    }
}
