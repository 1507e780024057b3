package org.noisewise.estimate;

import java.util.List;
import java.util.Map;
import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.diagnose.Verdict;

/**
 * The result of the background (single-image) SNR method on one image plane.
 *
 * @param channels   number of receive channels L used by the noise model
 * @param estimator  the estimator reported as "the" sigma
 * @param estimates  all four sigma estimates (intervals use the effective pixel count)
 * @param signal     statistics of the signal region
 * @param background statistics of the pooled background regions
 * @param snr        signal mean / sigma (NaN when the verdict is invalid)
 * @param snrCi95    95% interval of the SNR
 * @param diagnosis  the background diagnostics and verdict
 * @param warnings   cautions, in the order found
 */
public record BackgroundSnrResult(int channels, SigmaEstimator estimator,
                                  Map<SigmaEstimator, SigmaEstimate> estimates, SampleStats signal,
                                  SampleStats background, double snr, Interval snrCi95,
                                  BackgroundDiagnostics.Diagnosis diagnosis, List<Warning> warnings) {

    public BackgroundSnrResult {
        estimates = Map.copyOf(estimates);
        warnings = List.copyOf(warnings);
    }

    /** The reported sigma estimate. */
    public SigmaEstimate sigma() {
        return estimates.get(estimator);
    }

    public Verdict verdict() {
        return diagnosis.verdict();
    }
}
