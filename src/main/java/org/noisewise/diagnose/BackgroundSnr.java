package org.noisewise.diagnose;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.noisewise.estimate.BackgroundNoise;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SampleStats;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.SignedValues;
import org.noisewise.estimate.SpatialCorrelation;
import org.noisewise.estimate.Warning;

/**
 * The single-image (background) SNR method, judged by the background diagnostics: sigma from
 * background (air) regions under the central chi(2L) model, the signal amplitude from the signal
 * region's mean by inverting the Rice / noncentral-chi mean ({@link CorrectedSnr#knownSigma}), and
 * {@code SNR = A / sigma}. The plain ratio {@code S / sigma} is NEMA MS 1's single-image method
 * ({@code 0.655 S / SD_bg} for L = 1 with the SD estimator, {@code 1.253 S / mean_bg} with the mean
 * estimator) and is reported beside it.
 *
 * <p>Only valid when the background holds unprocessed magnitude noise: not masked or zero-filled,
 * free of ghosts, from a sum-of-squares combination of equal, uncorrelated channels, without
 * parallel imaging or filtering (Dietrich et al. 2007, JMRI 26:375). Every measurement is judged by
 * {@link BackgroundDiagnostics}; intervals use each estimator's effective pixel count, the signal
 * mean's standard error the signal region's own, and an {@code invalid} verdict withholds the SNR.
 */
public final class BackgroundSnr {

    /** Below this many background pixels the sigma estimate is imprecise (common practice). */
    public static final int MIN_BACKGROUND_PIXELS = 100;

    private BackgroundSnr() {
    }

    /** The sigma of the same slice measured by the difference method, with its interval. */
    public record DifferenceSigma(double sigma, Interval ci95) {
    }

    /**
     * Options of the method.
     *
     * @param channels   stated channel count L, or {@code null} to estimate it ("auto")
     * @param estimator  the estimator reported as sigma
     * @param phase      phase-encoding direction, for the ghosting check
     * @param storage    how values were stored, for the quantisation and clipping checks
     * @param difference a two-acquisition sigma to compare the background with, or null
     */
    public record Options(Integer channels, SigmaEstimator estimator, PhaseDirection phase,
                          BackgroundCheck.Storage storage, DifferenceSigma difference) {
        public Options {
            if (channels != null && channels < 1) {
                throw new IllegalArgumentException("channel count must be >= 1, was " + channels);
            }
            estimator = estimator == null ? SigmaEstimator.ML : estimator;
            phase = phase == null ? PhaseDirection.UNKNOWN : phase;
            storage = storage == null ? BackgroundCheck.Storage.floatingPoint() : storage;
        }

        public Options(Integer channels, SigmaEstimator estimator, PhaseDirection phase,
                       BackgroundCheck.Storage storage) {
            this(channels, estimator, phase, storage, null);
        }

        public Options(int channels, SigmaEstimator estimator) {
            this(Integer.valueOf(channels), estimator, PhaseDirection.UNKNOWN, BackgroundCheck.Storage.floatingPoint());
        }

        /** The same options with a two-acquisition sigma to compare the background with. */
        public Options withDifference(DifferenceSigma d) {
            return new Options(channels, estimator, phase, storage, d);
        }

        public static Options defaults() {
            return new Options(1, SigmaEstimator.ML);
        }
    }

    /** The signal region's statistics and the correlation of its values (for the mean's standard error). */
    public record Signal(SampleStats stats, SpatialCorrelation.Result correlation) {
        /** Standard error of the region mean with the effective pixel count; NaN for one pixel. */
        public double standardError() {
            return stats.n() > 1 ? stats.sd() / Math.sqrt(correlation.effectiveForMean(stats.n())) : Double.NaN;
        }

        public static Signal of(float[] pixels, int width, Region signal) throws InputException {
            SampleStats s = SampleStats.of(signal.values(pixels));
            SpatialCorrelation.Result c = s.n() > 1 ? SpatialCorrelation.ofValues(pixels, width, signal)
                    : SpatialCorrelation.Result.white(s.n());
            return new Signal(s, c);
        }
    }

    /**
     * The corrected figures from a signal region and one sigma estimate (no diagnostics): the part of
     * the method the coverage tests check against the truth.
     */
    public static CorrectedSnr figures(Signal signal, SigmaEstimate sigma, int channels) {
        return CorrectedSnr.knownSigma(signal.stats().mean(), signal.standardError(), sigma.sigma(), sigma.ci95(),
                channels);
    }

    /**
     * Measures one plane.
     *
     * @param pixels     the plane's calibrated values, row by row
     * @param width      plane width (for the spatial noise correlation)
     * @param height     plane height
     * @param signal     the signal region
     * @param background one or more background regions (pooled)
     */
    public static BackgroundSnrResult analyze(float[] pixels, int width, int height, Region signal,
                                              List<Region> background, Options options) throws InputException {
        if (signal == null) {
            throw new InputException("no signal region: mark one region as signal");
        }
        if (background == null || background.isEmpty()) {
            throw new InputException("no background region: mark at least one region in air, "
                    + "clear of the object and of ghosts, as background");
        }
        if ((long) width * height != pixels.length) {
            throw new IllegalArgumentException("plane is " + pixels.length + " pixels, not " + width + "x" + height);
        }
        Signal sig = Signal.of(pixels, width, signal);
        BackgroundNoise noise = BackgroundNoise.measure(pixels, width, background);
        SignedValues.requireMagnitude(signal.values(pixels), "signal region '" + signal.name() + "'",
                "the background method");
        List<Warning> warnings = new ArrayList<>();
        checkOverlap(signal, background, pixels.length, warnings);
        BackgroundDiagnostics.Diagnosis diag = BackgroundDiagnostics.diagnose(pixels, width, height, signal, background,
                noise, new BackgroundDiagnostics.Options(options.channels(), options.phase(), options.storage()));
        int channels = diag.channels();
        Map<SigmaEstimator, SigmaEstimate> est = diag.check().estimates();
        SigmaEstimate chosen = est.get(options.estimator());
        if (options.difference() != null && chosen.sigma() > 0) {
            Warning w = BackgroundDiagnostics.compareWithDifference(chosen.sigma(), chosen.ci95(),
                    options.difference().sigma(), options.difference().ci95());
            if (w != null) {
                diag = diag.withReason(w, Verdict.QUESTIONABLE);
            }
        }
        warnings.addAll(diag.reasons());
        if (noise.size() < MIN_BACKGROUND_PIXELS) {
            warnings.add(new Warning("few_background_pixels", String.format(Locale.ROOT,
                    "only %d background pixels (fewer than %d): sigma is imprecise; draw larger "
                            + "background regions", noise.size(), MIN_BACKGROUND_PIXELS)));
        }
        CorrectedSnr figures = null;
        if (diag.verdict() == Verdict.INVALID || !(chosen.sigma() > 0)) {
            warnings.add(new Warning("no_snr", "no SNR is reported: the background cannot give a trustworthy sigma "
                    + "here. Acquire the scan twice and use the difference method, or repeat it and use the "
                    + "repeated-acquisition method."));
        } else {
            figures = figures(sig, chosen, channels);
            warnings.addAll(figures.warnings());
        }
        return new BackgroundSnrResult(channels, options.estimator(), est, sig, noise.stats(), figures, diag, warnings);
    }

    private static void checkOverlap(Region signal, List<Region> background, int pixels, List<Warning> warnings) {
        java.util.BitSet sig = new java.util.BitSet(pixels);
        for (int i : signal.indices()) {
            sig.set(i);
        }
        for (Region b : background) {
            int shared = 0;
            for (int i : b.indices()) {
                if (sig.get(i)) {
                    shared++;
                }
            }
            if (shared > 0) {
                warnings.add(new Warning("regions_overlap", "background region '" + b.name() + "' shares "
                        + shared + " pixels with the signal region: background must lie in air"));
            }
        }
    }
}
