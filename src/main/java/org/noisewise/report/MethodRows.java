package org.noisewise.report;

import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.RepeatedSnrResult;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;

/** Column descriptions of the difference, repeated-acquisition and background-check results. */
public final class MethodRows {

    private MethodRows() {
    }

    private static String u(String unit) {
        return " [" + unit + "]";
    }

    /** The two-acquisition (NEMA difference) method. */
    public static ResultRow difference(String image, String second, int slice, String unit, DifferenceSnrResult r) {
        String u = u(unit);
        CorrectedSnr f = r.figures();
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("image2", "Image 2", second)
                .add("slice", "Slice", slice)
                .add("method", "Method", "difference");
        Figures.snr(row, f, "SNR plain (NEMA, sqrt2 S/SD diff)", r.magnitudeSnr());
        row.add("snr_magnitude_ci95[0]", null, r.magnitudeSnrCi95().low())
                .add("snr_magnitude_ci95[1]", null, r.magnitudeSnrCi95().high());
        Figures.amplitude(row, f, u);
        row.add("signal_mean", "Signal mean (image 1)" + u, r.signal().mean())
                .add("average_mean", "Average-image mean" + u, r.averageMean())
                .add("mean_difference", "Mean difference" + u, r.meanDifference());
        Figures.sigma(row, "Sigma (corrected)", f.sigma(), f.sigmaCi95(), u);
        return row.add("sigma_magnitude", "Sigma plain (SD diff/sqrt2)" + u, r.sigmaMagnitude())
                .add("channels", "Channels", r.channels())
                .add("pixels.signal", "Signal pixels", r.signal().n())
                .add("noise_correlation.x", "Noise correlation x", r.correlation().neighbourX())
                .add("noise_correlation.y", "Noise correlation y", r.correlation().neighbourY())
                .add("effective_pixels", "Effective pixels", r.effectivePixels())
                .add("warnings", "Warnings", r.warnings());
    }

    /** The repeated-acquisition method's region summary. */
    public static ResultRow repeated(String image, int slice, String unit, RepeatedSnrResult r) {
        String u = u(unit);
        CorrectedSnr f = r.figures();
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", "repeated");
        Figures.snr(row, f, "SNR plain (mean/pooled SD)", r.magnitudeSnr());
        row.add("snr_magnitude_ci95[0]", null, r.magnitudeSnrCi95().low())
                .add("snr_magnitude_ci95[1]", null, r.magnitudeSnrCi95().high())
                .add("repeats", "Repeats", r.repeats());
        Figures.amplitude(row, f, u);
        row.add("signal_mean", "Signal mean (magnitude)" + u, r.signalMean());
        Figures.sigma(row, "Sigma (corrected)", f.sigma(), f.sigmaCi95(), u);
        return row.add("sigma_magnitude", "Sigma plain (pooled SD)" + u, r.sigmaMagnitude())
                .add("snr_map_mean", "SNR-map mean (biased)", r.snrMapMean())
                .add("snr_map_bias", "SNR-map bias factor", r.snrMapBias())
                .add("channels", "Channels", r.channels())
                .add("pixels.signal", "Signal pixels", r.pixels())
                .add("noise_correlation.x", "Noise correlation x", r.correlation().neighbourX())
                .add("noise_correlation.y", "Noise correlation y", r.correlation().neighbourY())
                .add("effective_pixels", "Effective pixels", r.pixels() / r.correlation().squared())
                .add("warnings", "Warnings", r.warnings());
    }

    /** The background noise check. */
    public static ResultRow check(String image, int slice, String unit, BackgroundDiagnostics.Diagnosis d) {
        String u = u(unit);
        BackgroundCheck.Result r = d.check();
        SigmaEstimate ml = r.estimates().get(SigmaEstimator.ML);
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", "check")
                .add("verdict", "Verdict", d.verdict().key())
                .add("model", "Model", BackgroundCheck.modelName(d.channels()));
        Figures.sigma(row, "Sigma", ml.sigma(), ml.ci95(), u);
        BackgroundSnrRows.addDiagnosis(row, d);
        row.add("pixels.background", "Background pixels", r.pixels())
                .add("background_mean", "Background mean" + u, r.stats().mean())
                .add("background_sd", "Background SD" + u, r.stats().sd());
        for (SigmaEstimator e : SigmaEstimator.values()) {
            double v = r.estimates().get(e).sigma();
            row.add("estimators." + e.key(), "Sigma " + e.key() + u, v > 0 ? v : null);
        }
        return row
                .add("estimator_spread_percent", "Estimator spread [%]", 100 * (Math.exp(r.disagreement()) - 1))
                .add("agreement_p", "Agreement p", r.agreementP())
                .add("ks_distance", "KS distance", r.ksDistance())
                .add("fit_p", "Fit p (bootstrap)", r.fitP())
                .add("region_agreement_p", "Region agreement p", d.regionTest().p())
                .add("zero_fraction", "Zero fraction", r.zeroFraction())
                .add("clipped_fraction", "Clipped fraction", r.clippedFraction())
                .add("warnings", "Reasons", d.reasons());
    }
}
