package org.noisewise.report;

import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.Cnr;
import org.noisewise.estimate.Warning;

/**
 * The contrast-to-noise cells a method's row gains when a contrast region is given, placed before
 * the warnings (which gain the CNR's own): the corrected CNR and its interval, the plain magnitude
 * CNR beside it, the contrast region's corrected amplitude (with interval) and raw mean. A withheld
 * CNR (the method's figures withheld) is blank cells and JSON {@code null}.
 */
public final class CnrRows {

    private CnrRows() {
    }

    /** A copy of {@code row} with the CNR cells of {@code c} (or blanks when {@code c} is null). */
    public static ResultRow with(ResultRow row, Cnr c, String contrastRegion, String unit) {
        String u = " [" + unit + "]";
        ResultRow out = new ResultRow();
        boolean added = false;
        for (ResultRow.Cell cell : row.cells()) {
            if (cell.key().equals("warnings")) {
                cells(out, c, contrastRegion, u);
                added = true;
                List<Warning> w = new ArrayList<>();
                if (cell.value() instanceof List<?> list) {
                    for (Object o : list) {
                        w.add((Warning) o);
                    }
                }
                if (c != null) {
                    w.addAll(c.warnings());
                }
                out.add(cell.key(), cell.heading(), w);
            } else {
                out.add(cell.key(), cell.heading(), cell.value());
            }
        }
        if (!added) {
            cells(out, c, contrastRegion, u);
        }
        return out;
    }

    private static void cells(ResultRow row, Cnr c, String region, String u) {
        boolean ok = c != null;
        row.add("cnr", "CNR (corrected)", ok ? c.cnr() : null)
                .add("cnr_ci95[0]", "CNR 95% low", ok ? finite(c.ci95().low()) : null)
                .add("cnr_ci95[1]", "CNR 95% high", ok ? finite(c.ci95().high()) : null)
                .add("cnr_magnitude", "CNR plain ((S-C)/sigma)", ok ? c.magnitudeCnr() : null)
                .add("contrast_region", "Contrast region", region)
                .add("contrast_amplitude", "Contrast amplitude (corrected)" + u, ok ? c.contrastAmplitude() : null)
                .add("contrast_amplitude_ci95[0]", "Contrast amplitude 95% low" + u,
                        ok ? finite(c.contrastAmplitudeCi95().low()) : null)
                .add("contrast_amplitude_ci95[1]", "Contrast amplitude 95% high" + u,
                        ok ? finite(c.contrastAmplitudeCi95().high()) : null)
                .add("contrast_mean", "Contrast mean (magnitude)" + u, ok ? c.contrastMean() : null);
    }

    private static Double finite(double v) {
        return Double.isFinite(v) ? v : null;
    }
}
