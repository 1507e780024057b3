package org.noisewise.report;

import org.noisewise.estimate.BackgroundSnrResult;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;

/** The columns of the background SNR method, described once for every output. */
public final class BackgroundSnrRows {

    /** The JSON "method" value. */
    public static final String METHOD = "background";

    private BackgroundSnrRows() {
    }

    /**
     * @param image image title or file name
     * @param slice 1-based slice number
     * @param unit  the unit of the pixel values (e.g. "a.u.")
     */
    public static ResultRow row(String image, int slice, String unit, BackgroundSnrResult r) {
        SigmaEstimate s = r.sigma();
        String u = " [" + unit + "]";
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", METHOD)
                .add("snr", "SNR", r.snr())
                .add("snr_ci95[0]", "SNR 95% low", r.snrCi95().low())
                .add("snr_ci95[1]", "SNR 95% high", r.snrCi95().high())
                .add("signal_mean", "Signal mean" + u, r.signal().mean())
                .add("signal_sd", "Signal SD" + u, r.signal().sd())
                .add("sigma", "Sigma" + u, s.sigma())
                .add("sigma_ci95[0]", "Sigma 95% low" + u, s.ci95().low())
                .add("sigma_ci95[1]", "Sigma 95% high" + u, s.ci95().high())
                .add("sigma_estimator", "Estimator", s.estimator().key())
                .add("channels", "Channels", r.channels())
                .add("pixels.signal", "Signal pixels", r.signal().n())
                .add("pixels.background", "Background pixels", r.background().n())
                .add("background_mean", "Background mean" + u, r.background().mean())
                .add("background_sd", "Background SD" + u, r.background().sd());
        for (SigmaEstimator e : SigmaEstimator.values()) {
            row.add("estimators." + e.key(), "Sigma " + e.key() + u, r.estimates().get(e).sigma());
        }
        return row.add("warnings", "Warnings", r.warnings());
    }
}
