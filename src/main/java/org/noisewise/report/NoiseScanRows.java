package org.noisewise.report;

import java.util.List;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.NoiseScan;
import org.noisewise.diagnose.Verdict;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.Warning;

/** The columns of the noise-only-scan SNR method (sigma at the signal region from a noise-only scan). */
public final class NoiseScanRows {

    /** The JSON "method" value. */
    public static final String METHOD = "noise_scan";

    private NoiseScanRows() {
    }

    /**
     * @param scan      the noise-only scan's title
     * @param scanSlice its slice used
     * @param scale     image background sigma over the scan's in the same pixels, or null without background
     */
    public static ResultRow row(String image, int slice, String unit, Verdict verdict, CorrectedSnr f,
                                BackgroundSnr.Signal signal, SigmaEstimate sigma, NoiseScan.Check check, String scan,
                                int scanSlice, NoiseScan.Ratio scale, List<Warning> warnings) {
        String u = " [" + unit + "]";
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "Method", METHOD)
                .add("verdict", "Verdict", verdict.key());
        Figures.snr(row, f, "SNR plain (S/sigma)");
        Figures.amplitude(row, f, u);
        row.add("signal_mean", "Signal mean (magnitude)" + u, signal.stats().mean())
                .add("signal_sd", "Signal SD" + u, signal.stats().sd());
        Figures.sigma(row, "Sigma (noise-only scan)", sigma.sigma(), sigma.ci95(), u);
        row.add("noise_scan", "Noise-only scan", scan)
                .add("noise_scan_slice", "Noise-scan slice", scanSlice)
                .add("channels", "Channels", check.channels())
                .add("channels_estimate.value", "Channels (estimated)",
                        check.estimate() == null ? null : check.estimate().channels())
                .add("channels_estimate.ci95[0]", "Channels 95% low",
                        check.estimate() == null ? null : check.estimate().low())
                .add("channels_estimate.ci95[1]", "Channels 95% high",
                        check.estimate() == null ? null : check.estimate().high())
                .add("noise_correlation.x", "Noise correlation x", Math.sqrt(Math.max(0, check.correlation().neighbourX())))
                .add("noise_correlation.y", "Noise correlation y", Math.sqrt(Math.max(0, check.correlation().neighbourY())))
                .add("noise_inflation", "Noise variance inflation", check.inflation())
                .add("pixels.signal", "Signal pixels", signal.stats().n())
                .add("pixels.noise", "Noise-scan pixels", sigma.pixels())
                .add("effective_pixels", "Effective noise-scan pixels", sigma.pixels() / check.inflation())
                .add("noise_masked_share", "Noise scan masked [%]", 100 * check.maskedShare())
                .add("noise_scale", "Scale (image/scan sigma)", scale == null ? null : scale.value())
                .add("noise_scale_ci95[0]", "Scale 95% low", scale == null ? null : scale.ci95().low())
                .add("noise_scale_ci95[1]", "Scale 95% high", scale == null ? null : scale.ci95().high());
        return row.add("warnings", "Warnings", warnings);
    }

    /**
     * The noise-only scan's columns added to a background check row: the scan's sigma in the background
     * regions and at the signal region, the image's background sigma over the scan's in the same pixels
     * (scale), and the scan's sigma at the signal region over its sigma in the background (variation).
     */
    public static ResultRow checkColumns(ResultRow row, String unit, String scan, SigmaEstimate background,
                                         NoiseScan.Ratio scale, SigmaEstimate atSignal, NoiseScan.Ratio variation) {
        String u = " [" + unit + "]";
        return row.add("noise_scan", "Noise-only scan", scan)
                .add("noise_scan_sigma_background", "Scan sigma (background)" + u, background.sigma())
                .add("noise_scale", "Scale (image/scan sigma)", scale.value())
                .add("noise_scale_ci95[0]", "Scale 95% low", scale.ci95().low())
                .add("noise_scale_ci95[1]", "Scale 95% high", scale.ci95().high())
                .add("noise_scan_sigma_signal", "Scan sigma (signal)" + u, atSignal == null ? null : atSignal.sigma())
                .add("noise_variation", "Noise variation (signal/background)", variation == null ? null
                        : variation.value())
                .add("noise_variation_ci95[0]", "Variation 95% low", variation == null ? null : variation.ci95().low())
                .add("noise_variation_ci95[1]", "Variation 95% high", variation == null ? null
                        : variation.ci95().high());
    }
}
