package org.noisewise.estimate;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * The single-image (background) SNR method: {@code SNR = S / sigma}, with {@code S} the signal
 * region mean and {@code sigma} estimated from background (air) regions under the central chi(2L)
 * model. Equivalent to NEMA MS 1's single-image method {@code 0.655 S / SD_bg} for L = 1 with the
 * SD estimator, and {@code 1.253 S / mean_bg} with the mean estimator.
 *
 * <p>Only valid when the background holds unprocessed magnitude noise: not masked or zero-filled,
 * free of ghosts, from a sum-of-squares combination of equal, uncorrelated channels, without
 * parallel imaging or filtering (Dietrich et al. 2007, JMRI 26:375). The warnings say when the
 * data contradict that.
 */
public final class BackgroundSnr {

    /** Below this many background pixels the sigma estimate is imprecise (common practice). */
    public static final int MIN_BACKGROUND_PIXELS = 100;
    /** Above this fraction of exact zeros the background looks masked (common practice). */
    public static final double MASKED_ZERO_FRACTION = 0.01;

    private BackgroundSnr() {
    }

    /** Options of the method. */
    public record Options(int channels, SigmaEstimator estimator) {
        public Options {
            if (channels < 1) {
                throw new IllegalArgumentException("channel count must be >= 1, was " + channels);
            }
            if (estimator == null) {
                estimator = SigmaEstimator.ML;
            }
        }

        public static Options defaults() {
            return new Options(1, SigmaEstimator.ML);
        }
    }

    /**
     * Measures one plane.
     *
     * @param pixels     the plane's calibrated values, row by row
     * @param signal     the signal region
     * @param background one or more background regions (pooled)
     */
    public static BackgroundSnrResult analyze(float[] pixels, Region signal, List<Region> background,
                                              Options options) throws InputException {
        if (signal == null) {
            throw new InputException("no signal region: mark one region as signal");
        }
        if (background == null || background.isEmpty()) {
            throw new InputException("no background region: mark at least one region in air, "
                    + "clear of the object and of ghosts, as background");
        }
        double[] s = signal.values(pixels);
        double[] bg = Region.pooledMagnitudes(pixels, background);
        List<Warning> warnings = new ArrayList<>();
        checkOverlap(signal, background, warnings);
        SampleStats sStats = SampleStats.of(s);
        SampleStats bStats = SampleStats.of(bg);
        if (bStats.sumSquares() == 0) {
            throw new InputException("every background pixel is zero: the background was masked or "
                    + "zero-filled, so it holds no noise to measure; acquire twice and use the difference method");
        }
        Map<SigmaEstimator, SigmaEstimate> est = BackgroundSigma.estimate(bg, options.channels());
        SigmaEstimate chosen = est.get(options.estimator());
        if (bg.length < MIN_BACKGROUND_PIXELS) {
            warnings.add(new Warning("few_background_pixels", String.format(Locale.ROOT,
                    "only %d background pixels (fewer than %d): sigma is imprecise; draw larger "
                            + "background regions", bg.length, MIN_BACKGROUND_PIXELS)));
        }
        int zeros = 0;
        for (double v : bg) {
            if (v == 0) {
                zeros++;
            }
        }
        if (zeros > MASKED_ZERO_FRACTION * bg.length) {
            warnings.add(new Warning("masked_background", String.format(Locale.ROOT,
                    "%.1f%% of background pixels are exactly zero: the background looks masked or "
                            + "zero-filled, so background sigma is too low; use the difference method",
                    100.0 * zeros / bg.length)));
        }
        double snr = sStats.mean() / chosen.sigma();
        Interval snrCi = SnrMath.snrInterval(sStats.mean(), sStats.standardError(), chosen.sigma(),
                chosen.ci95());
        Warning low = SnrMath.lowSnrWarning(snr, options.channels());
        if (low != null) {
            warnings.add(low);
        }
        return new BackgroundSnrResult(options.channels(), options.estimator(), est, sStats, bStats,
                snr, snrCi, warnings);
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
