package org.noisewise.report;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import org.noisewise.series.StabilityResult;

/** The columns of a stability result, described once for the ImageJ table, the text table, CSV and JSON. */
public final class StabilityRows {

    private StabilityRows() {
    }

    public static ResultRow row(String image, int slice, String unit, String region, StabilityResult r) {
        String u = unit == null || unit.isBlank() ? "" : " [" + unit + "]";
        double[] f = r.weisskoff();
        JsonArray curve = new JsonArray();
        for (int k = 0; k < f.length; k++) {
            JsonObject o = new JsonObject();
            o.addProperty("n", k + 1);
            if (Double.isFinite(f[k])) {
                o.addProperty("cv_percent", f[k]);
            } else {
                o.add("cv_percent", com.google.gson.JsonNull.INSTANCE);
            }
            curve.add(o);
        }
        return new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", "stability")
                .add("region", "Region", region)
                .add("sfnr", "SFNR (corrected)", r.sfnr())
                .add("sfnr_ci95[0]", "SFNR 95% low", r.sfnrCi95().low())
                .add("sfnr_ci95[1]", "SFNR 95% high", r.sfnrCi95().high())
                .add("sfnr_map_mean", "SFNR-map mean (plain)", r.sfnrMapMean())
                .add("snr", "Static-noise SNR", r.snr())
                .add("snr_ci95[0]", "SNR 95% low", r.snrCi95().low())
                .add("snr_ci95[1]", "SNR 95% high", r.snrCi95().high())
                .add("percent_fluctuation", "Percent fluctuation [%]", r.percentFluctuation())
                .add("drift_percent", "Drift [%]", r.driftPercent())
                .add("drift_ci95[0]", "Drift 95% low [%]", r.driftCi95().low())
                .add("drift_ci95[1]", "Drift 95% high [%]", r.driftCi95().high())
                .add("rdc", "Radius of decorrelation [pixels]", r.rdc())
                .add("weisskoff_first", "F(1) [%]", f[0])
                .add("weisskoff_last", "F(" + f.length + ") [%]", f[f.length - 1])
                .add("weisskoff", null, curve)
                .add("signal_mean", "Signal mean" + u, r.signalMean())
                .add("static_sigma", "Static noise sigma" + u, r.staticSigma())
                .add("frames_used", "Frames used", r.framesUsed())
                .add("frames_skipped", "Frames skipped", r.skipped())
                .add("roi_size", "Square side [pixels]", r.roiSize())
                .add("pixels.signal", "Region pixels", r.pixels())
                .add("repetition_time_s", "Frame interval [s]", Double.isFinite(r.repetitionSeconds())
                        ? r.repetitionSeconds() : null)
                .add("warnings", "Warnings", r.warnings());
    }
}
