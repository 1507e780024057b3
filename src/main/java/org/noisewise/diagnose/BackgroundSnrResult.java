package org.noisewise.diagnose;

import java.util.List;
import java.util.Map;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.SampleStats;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.Warning;

/**
 * The result of the background (single-image) SNR method on one image plane.
 *
 * @param channels   number of receive channels L used by the noise model
 * @param estimator  the estimator reported as "the" sigma
 * @param estimates  all four sigma estimates (each interval with its own effective pixel count)
 * @param signal     the signal region's statistics and noise correlation
 * @param background statistics of the pooled background regions
 * @param figures    corrected amplitude, sigma and SNR with intervals; {@code null} when the verdict is invalid
 * @param diagnosis  the background diagnostics and verdict
 * @param warnings   cautions, in the order found
 */
public record BackgroundSnrResult(int channels, SigmaEstimator estimator,
                                  Map<SigmaEstimator, SigmaEstimate> estimates, BackgroundSnr.Signal signal,
                                  SampleStats background, CorrectedSnr figures,
                                  BackgroundDiagnostics.Diagnosis diagnosis, List<Warning> warnings) {

    private static final Interval NONE = new Interval(Double.NaN, Double.NaN);

    public BackgroundSnrResult {
        estimates = Map.copyOf(estimates);
        warnings = List.copyOf(warnings);
    }

    /** The reported sigma estimate. */
    public SigmaEstimate sigma() {
        return estimates.get(estimator);
    }

    /** The corrected SNR {@code A / sigma}, NaN when withheld. */
    public double snr() {
        return figures == null ? Double.NaN : figures.snr();
    }

    public Interval snrCi95() {
        return figures == null ? NONE : figures.snrCi95();
    }

    public Verdict verdict() {
        return diagnosis.verdict();
    }

    /** The same result with one more reason, the verdict at least {@code atLeast}; the figures are kept. */
    public BackgroundSnrResult withReason(Warning reason, Verdict atLeast) {
        List<Warning> w = new java.util.ArrayList<>(warnings);
        w.add(reason);
        return new BackgroundSnrResult(channels, estimator, estimates, signal, background, figures,
                diagnosis.withReason(reason, atLeast), w);
    }
}
