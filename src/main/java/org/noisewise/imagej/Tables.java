package org.noisewise.imagej;

import ij.measure.ResultsTable;
import java.util.List;
import org.noisewise.report.Formats;
import org.noisewise.report.ResultRow;

/** Builds ImageJ results tables from the shared row description. */
public final class Tables {

    private Tables() {
    }

    /** One table row per result row; numbers stay numbers, text and warnings become strings. */
    public static ResultsTable toResultsTable(List<ResultRow> rows) {
        ResultsTable rt = new ResultsTable();
        append(rt, rows);
        return rt;
    }

    /** Appends rows to a table (columns that are new to it are added). */
    static void append(ResultsTable rt, List<ResultRow> rows) {
        rt.setPrecision(6);
        for (ResultRow row : rows) {
            rt.incrementCounter();
            for (ResultRow.Cell c : row.tableCells()) {
                Object v = c.value();
                if (v instanceof Number n && !(v instanceof Double d && !Double.isFinite(d))) {
                    rt.addValue(c.heading(), n.doubleValue());
                } else {
                    rt.addValue(c.heading(), Formats.text(v));
                }
            }
        }
    }
}
