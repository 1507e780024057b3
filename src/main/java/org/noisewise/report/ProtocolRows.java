package org.noisewise.report;

import java.util.Map;
import org.noisewise.protocol.GFactor;
import org.noisewise.protocol.Protocol;
import org.noisewise.protocol.ProtocolScaling;

/** Column descriptions of protocol predictions, comparisons, SNR efficiency and g-factors. */
public final class ProtocolRows {

    /** The unit of SNR efficiency. */
    public static final String EFFICIENCY_UNIT = "mm^-3 s^-1/2";

    private ProtocolRows() {
    }

    /** Adds the SNR-efficiency cells (blank when the protocol is not known). */
    public static ResultRow addEfficiency(ResultRow row, ProtocolScaling.Efficiency e) {
        String u = " [" + EFFICIENCY_UNIT + "]";
        return row.add("snr_efficiency", "SNR efficiency" + u, e == null ? null : e.value())
                .add("snr_efficiency_ci95[0]", "Efficiency 95% low" + u, e == null ? null : e.ci95().low())
                .add("snr_efficiency_ci95[1]", "Efficiency 95% high" + u, e == null ? null : e.ci95().high());
    }

    /** A prediction between two protocols. */
    public static ResultRow prediction(Protocol from, Protocol to, ProtocolScaling.Prediction p, Double snrFrom) {
        ResultRow row = new ResultRow()
                .add("from", "From", from.text())
                .add("to", "To", to.text())
                .add("ratio", "Predicted SNR ratio (to/from)", p.ratio());
        if (snrFrom != null) {
            row.add("snr", "SNR (from)", snrFrom).add("snr_predicted", "SNR predicted (to)", snrFrom * p.ratio());
        }
        factors(row, p.factors());
        return row.add("field_exponent", "Field exponent", p.fieldExponent())
                .add("notes", "Notes", String.join("; ", p.notes()));
    }

    private static void factors(ResultRow row, Map<String, Double> f) {
        row.add("factors.voxel_volume", "Factor voxel volume", f.get("voxel_volume"))
                .add("factors.sampling_time", "Factor sampling time", f.get("sampling_time"))
                .add("factors.field", "Factor field", f.get("field"))
                .add("factors.acceleration", "Factor acceleration", f.get("acceleration"));
    }

    /** Two measured SNRs, their ratio and the prediction. */
    public static ResultRow comparison(String imageA, String imageB, int slice, String method, String region,
                                       double snrA, double snrB, ProtocolScaling.MeasuredRatio m,
                                       ProtocolScaling.Prediction p, Protocol from, Protocol to) {
        ResultRow row = new ResultRow()
                .add("image", "Image A", imageA)
                .add("image2", "Image B", imageB)
                .add("slice", "Slice", slice)
                .add("region", "Region", region)
                .add("method", "Method", method)
                .add("snr_a", "SNR A (corrected)", snrA)
                .add("snr_b", "SNR B (corrected)", snrB)
                .add("ratio_measured", "Ratio measured (B/A)", m.ratio())
                .add("ratio_measured_ci95[0]", "Ratio 95% low", m.ci95().low())
                .add("ratio_measured_ci95[1]", "Ratio 95% high", m.ci95().high())
                .add("ratio_predicted", "Ratio predicted", m.predicted())
                .add("consistent", "Consistent", m.consistent());
        if (p != null) {
            factors(row, p.factors());
            row.add("field_exponent", "Field exponent", p.fieldExponent());
        }
        return row.add("from", "Protocol A", from == null ? null : from.text())
                .add("to", "Protocol B", to == null ? null : to.text())
                .add("notes", "Notes", p == null ? null : String.join("; ", p.notes()));
    }

    /** A region's g-factor. */
    public static ResultRow gfactor(String full, String accel, int slice, String region, String method,
                                    double snrFull, double snrAccel, GFactor.Result g, int window) {
        return new ResultRow()
                .add("image", "Full", full)
                .add("image2", "Accelerated", accel)
                .add("slice", "Slice", slice)
                .add("region", "Region", region)
                .add("method", "Method", method)
                .add("acceleration", "R", g.acceleration())
                .add("g_mean", "g (region, RMS over its pixels)", g.g())
                .add("g_ci95[0]", "g 95% low", g.ci95().low())
                .add("g_ci95[1]", "g 95% high", g.ci95().high())
                .add("g_max", "g max (pixel map)", g.gMax())
                .add("g_map_mean", "g map mean (bias-corrected)", g.pixelMapMean())
                .add("snr_full", "SNR full (corrected)", snrFull)
                .add("snr_accelerated", "SNR accelerated (corrected)", snrAccel)
                .add("window", "Window [pixels]", window)
                .add("pixel_precision_percent", "Pixel precision [%]", 100 * g.pixelPrecision())
                .add("repeats_needed", "Repeats for 10%", g.repeatsNeeded())
                .add("warnings", "Warnings", g.warnings());
    }
}
