package org.noisewise.report;

import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.diagnose.BackgroundSnrResult;
import org.noisewise.diagnose.ChannelCount;
import org.noisewise.estimate.CorrectedSnr;
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
        CorrectedSnr f = r.figures();
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", METHOD)
                .add("verdict", "Verdict", d.verdict().key());
        Figures.snr(row, f, "SNR plain (S/sigma)");
        Figures.amplitude(row, f, u);
        row.add("signal_mean", "Signal mean (magnitude)" + u, r.signal().stats().mean())
                .add("signal_sd", "Signal SD" + u, r.signal().stats().sd());
        Figures.sigma(row, "Sigma", s.sigma(), s.ci95(), u);
        row.add("sigma_estimator", "Estimator", s.estimator().key());
        addDiagnosis(row, d);
        row.add("pixels.signal", "Signal pixels", r.signal().stats().n())
                .add("pixels.background", "Background pixels", r.background().n())
                .add("signal_effective_pixels", "Effective signal pixels",
                        r.signal().correlation().effectiveForMean(r.signal().stats().n()))
                .add("background_mean", "Background mean" + u, r.background().mean())
                .add("background_sd", "Background SD" + u, r.background().sd());
        for (SigmaEstimator e : SigmaEstimator.values()) {
            double v = r.estimates().get(e).sigma();
            row.add("estimators." + e.key(), "Sigma " + e.key() + u, v > 0 ? v : null);
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
                .add("phase", "Phase encoding", d.phase().name().toLowerCase(java.util.Locale.ROOT))
                .add("noise_correlation.x", "Noise correlation x", d.noise().noiseCorrelationX())
                .add("noise_correlation.y", "Noise correlation y", d.noise().noiseCorrelationY())
                .add("noise_correlation.x2", "Noise correlation x lag 2",
                        Math.sqrt(Math.max(0.0, d.noise().squares().lag2X())))
                .add("noise_correlation.y2", "Noise correlation y lag 2",
                        Math.sqrt(Math.max(0.0, d.noise().squares().lag2Y())))
                .add("effective_pixels", "Effective background pixels", d.effectivePixels());
    }
}
