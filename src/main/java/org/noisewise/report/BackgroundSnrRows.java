package org.noisewise.report;

import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.diagnose.ChannelCount;
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
        BackgroundDiagnostics.Diagnosis d = r.diagnosis();
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", METHOD)
                .add("verdict", "Verdict", d.verdict().key())
                .add("snr", "SNR", r.snr())
                .add("snr_ci95[0]", "SNR 95% low", r.snrCi95().low())
                .add("snr_ci95[1]", "SNR 95% high", r.snrCi95().high())
                .add("signal_mean", "Signal mean" + u, r.signal().mean())
                .add("signal_sd", "Signal SD" + u, r.signal().sd())
                .add("sigma", "Sigma" + u, s.sigma())
                .add("sigma_ci95[0]", "Sigma 95% low" + u, s.ci95().low())
                .add("sigma_ci95[1]", "Sigma 95% high" + u, s.ci95().high())
                .add("sigma_estimator", "Estimator", s.estimator().key());
        addDiagnosis(row, d);
        row.add("pixels.signal", "Signal pixels", r.signal().n())
                .add("pixels.background", "Background pixels", r.background().n())
                .add("background_mean", "Background mean" + u, r.background().mean())
                .add("background_sd", "Background SD" + u, r.background().sd());
        for (SigmaEstimator e : SigmaEstimator.values()) {
            row.add("estimators." + e.key(), "Sigma " + e.key() + u, r.estimates().get(e).sigma());
        }
        return row.add("warnings", "Warnings", r.warnings());
    }

    /** The diagnostic columns shared by the background method and the background check. */
    static void addDiagnosis(ResultRow row, BackgroundDiagnostics.Diagnosis d) {
        ChannelCount.Estimate ce = d.channelEstimate();
        row.add("channels", "Channels", d.channelsEstimated() ? (Object) d.reportedChannels() : (Object) d.channels())
                .add("channels_used", "Channels used", d.channels())
                .add("channels_estimate.value", "Channels (estimated)", ce == null ? null : ce.channels())
                .add("channels_estimate.ci95[0]", "Channels 95% low", ce == null ? null : ce.low())
                .add("channels_estimate.ci95[1]", "Channels 95% high", ce == null ? null : ce.high())
                .add("noise_correlation.x", "Noise correlation x", d.correlation().neighbourX())
                .add("noise_correlation.y", "Noise correlation y", d.correlation().neighbourY())
                .add("noise_correlation.x2", "Noise correlation x lag 2", d.correlation().noiseX(2, true))
                .add("noise_correlation.y2", "Noise correlation y lag 2", d.correlation().noiseY(2, true))
                .add("effective_pixels", "Effective background pixels", d.effectivePixels());
    }
}
