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

    /**
     * Appends rows to a table (columns that are new to it are added). Each numeric column shows the
     * digits its values' intervals make meaningful (the values themselves keep full precision).
     */
    static void append(ResultsTable rt, List<ResultRow> rows) {
        java.util.Map<String, Integer> digits = new java.util.HashMap<>();
        for (ResultRow row : rows) {
            rt.incrementCounter();
            for (ResultRow.Cell c : row.tableCells()) {
                Object v = c.value();
                if (v instanceof Number n && !(v instanceof Double d && !Double.isFinite(d))) {
                    rt.addValue(c.heading(), n.doubleValue());
                    int k = v instanceof Double d ? Formats.decimals(row, c.key(), d) : 0;
                    digits.merge(c.heading(), k, Math::max);
                } else {
                    rt.addValue(c.heading(), Formats.text(v));
                }
            }
        }
        for (java.util.Map.Entry<String, Integer> e : digits.entrySet()) {
            int col = rt.getColumnIndex(e.getKey());
            if (col >= 0) {
                rt.setDecimalPlaces(col, Math.min(9, e.getValue()));
            }
        }
    }
}
