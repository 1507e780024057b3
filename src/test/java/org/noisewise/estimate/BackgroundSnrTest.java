package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;
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
        BackgroundSnrResult r = BackgroundSnr.analyze(phantom(100, 4, 1, 3), signal(), background(),
                BackgroundSnr.Options.defaults());
        assertEquals(SigmaEstimator.ML, r.estimator());
        assertEquals(4.0, r.sigma().sigma(), 0.3);
        assertTrue(r.sigma().ci95().contains(4.0));
        assertEquals(25.0, r.snr(), 1.5);
        assertEquals(400, r.signal().n());
        assertEquals(392, r.background().n());
        assertTrue(r.warnings().isEmpty(), r.warnings().toString());
        assertEquals(r.signal().mean() / r.sigma().sigma(), r.snr(), 1e-12);
    }

    @Test
    void chosenEstimatorIsReported() throws InputException {
        BackgroundSnrResult r = BackgroundSnr.analyze(phantom(100, 4, 1, 3), signal(), background(),
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
        BackgroundSnrResult r = BackgroundSnr.analyze(px, signal(), small, BackgroundSnr.Options.defaults());
        List<String> codes = r.warnings().stream().map(Warning::code).toList();
        assertTrue(codes.contains("few_background_pixels"), codes.toString());
        assertTrue(codes.contains("masked_background"), codes.toString());
        assertTrue(codes.contains("low_snr"), codes.toString());
        assertTrue(codes.contains("regions_overlap"), codes.toString());
    }

    @Test
    void badInputIsOneClearError() throws InputException {
        float[] px = phantom(100, 4, 1, 3);
        Region sig = signal();
        InputException none = assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(px, sig, List.of(), BackgroundSnr.Options.defaults()));
        assertTrue(none.getMessage().contains("no background region"));
        assertThrows(InputException.class, () -> BackgroundSnr.analyze(px, null, background(), BackgroundSnr.Options.defaults()));
        InputException outside = assertThrows(InputException.class, () -> Region.rectangle("bg", 90, 90, 10, 10, W, W));
        assertTrue(outside.getMessage().contains("outside the 96x96 image"), outside.getMessage());
        assertThrows(InputException.class, () -> Region.rectangle("bg", 1, 1, 0, 5, W, W));
        float[] withNaN = px.clone();
        withNaN[2 * W + 2] = Float.NaN;
        InputException nan = assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(withNaN, sig, background(), BackgroundSnr.Options.defaults()));
        assertTrue(nan.getMessage().contains("NaN"), nan.getMessage());
        float[] zeros = px.clone();
        for (int i : background().get(0).indices()) {
            zeros[i] = 0;
        }
        for (int i : background().get(1).indices()) {
            zeros[i] = 0;
        }
        InputException masked = assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(zeros, sig, background(), BackgroundSnr.Options.defaults()));
        assertTrue(masked.getMessage().contains("masked"), masked.getMessage());
        float[] negative = px.clone();
        negative[2 * W + 3] = -1f;
        assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(negative, sig, background(), BackgroundSnr.Options.defaults()));
        Region empty = new Region("empty", new int[0]);
        assertThrows(InputException.class,
                () -> BackgroundSnr.analyze(px, empty, background(), BackgroundSnr.Options.defaults()));
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
}
