package org.noisewise.diagnose;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.Warning;
import org.noisewise.math.MeanInverse;
import org.noisewise.sample.Phantoms;

class BackgroundSnrTest {

    private static final int W = 96;

    private static float[] phantom(double amplitude, double sigma, int channels, long seed) {
        return Phantoms.disk(W, W, 48, 48, 28, amplitude, sigma, channels, seed);
    }

    private static Region signal() throws InputException {
        return Region.rectangle("signal", 38, 38, 20, 20, W, W);
    }

    private static List<Region> background() throws InputException {
        return List.of(Region.rectangle("bg1", 1, 1, 14, 14, W, W), Region.rectangle("bg2", 80, 80, 14, 14, W, W));
    }

    @Test
    void measuresKnownSnr() throws InputException {
        BackgroundSnrResult r = BackgroundSnr.analyze(phantom(100, 4, 1, 3), W, W, signal(), background(),
                BackgroundSnr.Options.defaults());
        assertEquals(SigmaEstimator.ML, r.estimator());
        assertEquals(4.0, r.sigma().sigma(), 0.3);
        assertTrue(r.sigma().ci95().contains(4.0));
        assertEquals(25.0, r.snr(), 1.5);
        assertEquals(400, r.signal().stats().n());
        assertEquals(392, r.background().n());
        assertTrue(r.warnings().isEmpty(), r.warnings().toString());
        // the plain ratio is the signal mean over sigma; the SNR inverts the Rice mean of that ratio (closed form)
        double plain = r.signal().stats().mean() / r.sigma().sigma();
        assertEquals(plain, r.figures().magnitudeSnr(), 1e-12);
        assertEquals(MeanInverse.of(1).theta(plain), r.snr(), 1e-12);
        assertEquals(r.snr() * r.sigma().sigma(), r.figures().amplitude(), 1e-9);
    }

    @Test
    void chosenEstimatorIsReported() throws InputException {
        BackgroundSnrResult r = BackgroundSnr.analyze(phantom(100, 4, 1, 3), W, W, signal(), background(),
                new BackgroundSnr.Options(1, SigmaEstimator.MEDIAN));
        assertEquals(r.estimates().get(SigmaEstimator.MEDIAN), r.sigma());
    }

    @Test
    void warnsOfFewPixelsMaskingLowSnrAndOverlap() throws InputException {
        float[] px = phantom(6, 4, 1, 5);
        // mask part of the background to zero, as some reconstructions do
        for (int i = 0; i < 5 * W; i++) {
            px[i] = 0f;
        }
        List<Region> small = List.of(Region.rectangle("bg", 2, 2, 8, 8, W, W), Region.rectangle("bg2", 40, 40, 3, 3, W, W));
        BackgroundSnrResult r = BackgroundSnr.analyze(px, W, W, signal(), small, BackgroundSnr.Options.defaults());
        List<String> codes = r.warnings().stream().map(Warning::code).toList();
        assertTrue(codes.contains("few_background_pixels"), codes.toString());
        assertTrue(codes.contains("masked_background"), codes.toString());
        assertTrue(codes.contains("regions_overlap"), codes.toString());
        // a masked background is invalid: no SNR, so no statement about its bias either
        assertTrue(codes.contains("no_snr") && !codes.contains("low_snr"), codes.toString());
        assertEquals(null, r.figures());
        assertTrue(Double.isNaN(r.snr()));
        BackgroundSnrResult low = BackgroundSnr.analyze(phantom(6, 4, 1, 5), W, W, signal(), background(),
                BackgroundSnr.Options.defaults());
        assertTrue(low.warnings().stream().anyMatch(w -> w.code().equals("low_snr")), low.warnings().toString());
    }

    @Test
    void badInputIsOneClearError() throws InputException {
        float[] px = phantom(100, 4, 1, 3);
        Region sig = signal();
        InputException none = assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(px, W, W, sig, List.of(), BackgroundSnr.Options.defaults()));
        assertTrue(none.getMessage().contains("no background region"));
        assertThrows(InputException.class, () -> BackgroundSnr.analyze(px, W, W, null, background(), BackgroundSnr.Options.defaults()));
        InputException outside = assertThrows(InputException.class, () -> Region.rectangle("bg", 90, 90, 10, 10, W, W));
        assertTrue(outside.getMessage().contains("outside the 96x96 image"), outside.getMessage());
        assertThrows(InputException.class, () -> Region.rectangle("bg", 1, 1, 0, 5, W, W));
        float[] withNaN = px.clone();
        withNaN[2 * W + 2] = Float.NaN;
        InputException nan = assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(withNaN, W, W, sig, background(), BackgroundSnr.Options.defaults()));
        assertTrue(nan.getMessage().contains("NaN"), nan.getMessage());
        float[] zeros = px.clone();
        for (int i : background().get(0).indices()) {
            zeros[i] = 0;
        }
        for (int i : background().get(1).indices()) {
            zeros[i] = 0;
        }
        BackgroundSnrResult masked = BackgroundSnr.analyze(zeros, W, W, sig, background(), BackgroundSnr.Options.defaults());
        assertEquals(org.noisewise.diagnose.Verdict.INVALID, masked.verdict());
        assertTrue(Double.isNaN(masked.snr()), "an invalid background must not give an SNR");
        assertTrue(masked.warnings().stream().anyMatch(w -> w.code().equals("masked_background")));
        assertTrue(masked.warnings().stream().anyMatch(w -> w.code().equals("no_snr")
                && w.message().contains("difference method")));
        float[] negative = px.clone();
        negative[2 * W + 3] = -1f;
        assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(negative, W, W, sig, background(), BackgroundSnr.Options.defaults()));
        Region empty = new Region("empty", new int[0]);
        assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(px, W, W, empty, background(), BackgroundSnr.Options.defaults()));
    }

    @Test
    void ovalRegionHoldsPixelCentresInsideTheEllipse() throws InputException {
        Region o = Region.oval("o", 10, 10, 20, 20, W, W);
        // pixel centres within radius 10 of (20, 20): close to pi * 100
        assertEquals(Math.PI * 100, o.size(), 12);
        assertTrue(IntStream.of(o.indices()).allMatch(i -> {
            double dx = i % W + 0.5 - 20;
            double dy = i / W + 0.5 - 20;
            return dx * dx + dy * dy <= 100;
        }));
    }

    /** A one-pixel signal region has no interval, and a warning says why and what to do (no silent null). */
    @Test
    void onePixelSignalRegionSaysWhyThereIsNoInterval() throws InputException {
        BackgroundSnrResult r = BackgroundSnr.analyze(phantom(100, 4, 1, 3), W, W,
                Region.rectangle("signal", 48, 48, 1, 1, W, W), background(), BackgroundSnr.Options.defaults());
        assertTrue(Double.isFinite(r.snr()));
        assertTrue(Double.isNaN(r.snrCi95().low()));
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("no_interval")
                && w.message().contains("draw a region")), r.warnings().toString());
    }
}
