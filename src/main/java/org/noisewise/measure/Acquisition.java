package org.noisewise.measure;

import ij.ImagePlus;
import java.util.List;
import org.noisewise.estimate.Interval;
import org.noisewise.io.ProtocolHeaders;
import org.noisewise.protocol.Protocol;
import org.noisewise.protocol.ProtocolScaling;
import org.noisewise.report.ProtocolRows;
import org.noisewise.report.ResultRow;

/**
 * The SNR efficiency every measurement reports: its rows gain {@code snr_efficiency} (blank when the
 * image's header does not state the protocol), with a note naming what is missing when the header states
 * part of it.
 */
final class Acquisition {

    private Acquisition() {
    }

    /** Adds the efficiency cells to each row from its {@code snr} and interval. */
    static void addEfficiency(List<ResultRow> rows, ImagePlus imp, List<String> notes) {
        Protocol p = ProtocolHeaders.of(imp);
        List<String> missing = p.missingForEfficiency();
        if (!missing.isEmpty() && missing.size() < 4) {
            notes.add("SNR efficiency not reported: the image header lacks " + String.join(", ", missing)
                    + " (DICOM pixel spacing and slice thickness, 0018,0089, 0018,0083, 0018,0095)");
        }
        if (missing.isEmpty()) {
            notes.add("SNR efficiency from the header's protocol: " + p.text());
            notes.addAll(p.notes());
        }
        for (ResultRow row : rows) {
            ProtocolRows.addEfficiency(row, efficiency(row, missing.isEmpty() ? p : null));
        }
    }

    /** The efficiency of one row's corrected SNR, or null. */
    static ProtocolScaling.Efficiency efficiency(ResultRow row, Protocol p) {
        if (p == null || !(row.get("snr") instanceof Number snr)) {
            return null;
        }
        Object lo = row.get("snr_ci95[0]");
        Object hi = row.get("snr_ci95[1]");
        Interval ci = lo instanceof Number l && hi instanceof Number h
                ? new Interval(l.doubleValue(), h.doubleValue()) : new Interval(Double.NaN, Double.NaN);
        return ProtocolScaling.efficiency(snr.doubleValue(), ci, p);
    }
}
