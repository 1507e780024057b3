package org.noisewise.estimate;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.diagnose.Verdict;

/**
 * The single-image (background) SNR method: {@code SNR = S / sigma}, with {@code S} the signal
 * region mean and {@code sigma} estimated from background (air) regions under the central chi(2L)
 * model. Equivalent to NEMA MS 1's single-image method {@code 0.655 S / SD_bg} for L = 1 with the
 * SD estimator, and {@code 1.253 S / mean_bg} with the mean estimator.
 *
 * <p>Only valid when the background holds unprocessed magnitude noise: not masked or zero-filled,
 * free of ghosts, from a sum-of-squares combination of equal, uncorrelated channels, without
 * parallel imaging or filtering (Dietrich et al. 2007, JMRI 26:375). Every measurement is judged by
 * {@link BackgroundDiagnostics}; intervals use the effective pixel count of correlated noise, and an
 * {@code invalid} verdict withholds the SNR.
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
     * @param channels  stated channel count L, or {@code null} to estimate it ("auto")
     * @param estimator the estimator reported as sigma
     * @param phase     phase-encoding direction, for the ghosting check
     * @param storage   how values were stored, for the quantisation and clipping checks
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
        double[] s = signal.values(pixels);
        double[] bg = Region.pooledMagnitudes(pixels, background);
        List<Warning> warnings = new ArrayList<>();
        checkOverlap(signal, background, warnings);
        SampleStats sStats = SampleStats.of(s);
        SampleStats bStats = SampleStats.of(bg);
        BackgroundDiagnostics.Diagnosis diag = BackgroundDiagnostics.diagnose(pixels, width, height, signal, background,
                new BackgroundDiagnostics.Options(options.channels(), options.phase(), options.storage()));
        int channels = diag.channels();
        Map<SigmaEstimator, SigmaEstimate> est = BackgroundSigma.estimate(bg, channels, diag.effectivePixels());
        SigmaEstimate chosen = est.get(options.estimator());
        if (options.difference() != null && chosen.sigma() > 0) {
            Warning w = BackgroundDiagnostics.compareWithDifference(chosen.sigma(), chosen.ci95(),
                    options.difference().sigma(), options.difference().ci95());
            if (w != null) {
                diag = diag.withReason(w, Verdict.QUESTIONABLE);
            }
        }
        warnings.addAll(diag.reasons());
        if (bg.length < MIN_BACKGROUND_PIXELS) {
            warnings.add(new Warning("few_background_pixels", String.format(Locale.ROOT,
                    "only %d background pixels (fewer than %d): sigma is imprecise; draw larger "
                            + "background regions", bg.length, MIN_BACKGROUND_PIXELS)));
        }
        double snr = Double.NaN;
        Interval snrCi = new Interval(Double.NaN, Double.NaN);
        if (diag.verdict() == Verdict.INVALID || !(chosen.sigma() > 0)) {
            warnings.add(new Warning("no_snr", "no SNR is reported: the background cannot give a trustworthy sigma "
                    + "here. Acquire the scan twice and use the difference method, or repeat it and use the "
                    + "repeated-acquisition method."));
        } else {
            snr = sStats.mean() / chosen.sigma();
            snrCi = SnrMath.snrInterval(sStats.mean(), sStats.standardError(), chosen.sigma(), chosen.ci95());
            Warning low = SnrMath.lowSnrWarning(snr, channels);
            if (low != null) {
                warnings.add(low);
            }
        }
        return new BackgroundSnrResult(channels, options.estimator(), est, sStats, bStats, snr, snrCi, diag, warnings);
    }

    private static void checkOverlap(Region signal, List<Region> background, List<Warning> warnings) {
        Set<Integer> sig = new HashSet<>();
        for (int i : signal.indices()) {
            sig.add(i);
        }
        for (Region b : background) {
            int shared = 0;
            for (int i : b.indices()) {
                if (sig.contains(i)) {
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
