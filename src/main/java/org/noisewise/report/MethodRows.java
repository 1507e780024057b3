package org.noisewise.report;

import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.KoayBasser;
import org.noisewise.estimate.RepeatedSnrResult;
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
        return new ResultRow()
                .add("image", "Image", image)
                .add("image2", "Image 2", second)
                .add("slice", "Slice", slice)
                .add("method", "Method", "difference")
                .add("snr", "SNR", r.snr())
                .add("snr_ci95[0]", "SNR 95% low", r.snrCi95().low())
                .add("snr_ci95[1]", "SNR 95% high", r.snrCi95().high())
                .add("signal_mean", "Signal mean" + u, r.signal().mean())
                .add("average_mean", "Average-image mean" + u, r.averageMean())
                .add("mean_difference", "Mean difference" + u, r.meanDifference())
                .add("sigma", "Sigma" + u, r.sigma())
                .add("sigma_ci95[0]", "Sigma 95% low" + u, r.sigmaCi95().low())
                .add("sigma_ci95[1]", "Sigma 95% high" + u, r.sigmaCi95().high())
                .add("channels", "Channels", r.channels())
                .add("pixels.signal", "Signal pixels", r.signal().n())
                .add("noise_correlation.x", "Noise correlation x", r.correlationX())
                .add("noise_correlation.y", "Noise correlation y", r.correlationY())
                .add("effective_pixels", "Effective pixels", r.effectivePixels())
                .add("warnings", "Warnings", r.warnings());
    }

    /** The repeated-acquisition method's region summary. */
    public static ResultRow repeated(String image, int slice, String unit, RepeatedSnrResult r) {
        String u = u(unit);
        KoayBasser.Correction c = r.rician();
        return new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", "repeated")
                .add("snr", "SNR", r.snr())
                .add("snr_ci95[0]", "SNR 95% low", r.snrCi95().low())
                .add("snr_ci95[1]", "SNR 95% high", r.snrCi95().high())
                .add("repeats", "Repeats", r.repeats())
                .add("signal_mean", "Signal mean" + u, r.signalMean())
                .add("sigma", "Sigma" + u, r.sigma())
                .add("sigma_ci95[0]", "Sigma 95% low" + u, r.sigmaCi95().low())
                .add("sigma_ci95[1]", "Sigma 95% high" + u, r.sigmaCi95().high())
                .add("snr_map_mean", "SNR-map mean (biased)", r.snrMapMean())
                .add("snr_map_bias", "SNR-map bias factor", r.snrMapBias())
                .add("channels", "Channels", r.channels())
                .add("pixels.signal", "Signal pixels", r.pixels())
                .add("rician.signal", "Corrected signal" + u, c == null ? null : c.amplitude())
                .add("rician.sigma", "Corrected sigma" + u, c == null ? null : c.sigma())
                .add("rician.snr", "Corrected SNR", c == null ? null : r.correctedSnr())
                .add("warnings", "Warnings", r.warnings());
    }

    /** The background noise check. */
    public static ResultRow check(String image, int slice, String unit, BackgroundDiagnostics.Diagnosis d) {
        String u = u(unit);
        BackgroundCheck.Result r = d.check();
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", "check")
                .add("verdict", "Verdict", d.verdict().key())
                .add("model", "Model", BackgroundCheck.modelName(d.channels()))
                .add("sigma", "Sigma" + u, r.sigma())
                .add("sigma_ci95[0]", "Sigma 95% low" + u, r.estimates().get(SigmaEstimator.ML).ci95().low())
                .add("sigma_ci95[1]", "Sigma 95% high" + u, r.estimates().get(SigmaEstimator.ML).ci95().high());
        BackgroundSnrRows.addDiagnosis(row, d);
        row.add("pixels.background", "Background pixels", r.pixels())
                .add("background_mean", "Background mean" + u, r.stats().mean())
                .add("background_sd", "Background SD" + u, r.stats().sd());
        for (SigmaEstimator e : SigmaEstimator.values()) {
            row.add("estimators." + e.key(), "Sigma " + e.key() + u, r.estimates().get(e).sigma());
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
