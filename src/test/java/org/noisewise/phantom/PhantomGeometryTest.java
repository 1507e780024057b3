package org.noisewise.phantom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.SplittableRandom;
import java.util.function.IntPredicate;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.io.PhantomLocator;
import org.noisewise.sample.Phantoms;

/** Automatic regions on generated phantoms: disks and rectangles, three sizes, off centre, with and without calibration. */
class PhantomGeometryTest {

    private static final int N = 160;

    private static float[] image(IntPredicate inside, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        float[] px = new float[N * N];
        for (int i = 0; i < px.length; i++) {
            px[i] = (float) Phantoms.magnitude(rng, inside.test(i) ? 100 : 0, 5, 1);
        }
        return px;
    }

    private static IntPredicate disk(double cx, double cy, double r) {
        return i -> {
            double dx = i % N + 0.5 - cx;
            double dy = i / N + 0.5 - cy;
            return dx * dx + dy * dy <= r * r;
        };
    }

    private static IntPredicate rect(double cx, double cy, double hw, double hh) {
        return i -> Math.abs(i % N + 0.5 - cx) <= hw && Math.abs(i / N + 0.5 - cy) <= hh;
    }

    private static void check(IntPredicate truth, float[] px, double pixelMm) throws InputException {
        Phantom p = PhantomFinder.find(px, N, N, PhantomLocator.threshold(px));
        QaRegions.Placement pl = QaRegions.place(p, N, N, 0.75, PhaseDirection.UNKNOWN, pixelMm, pixelMm);
        int truthCount = 0;
        for (int i = 0; i < N * N; i++) {
            truthCount += truth.test(i) ? 1 : 0;
        }
        int[] sig = pl.signal().region().indices();
        for (int i : sig) {
            assertTrue(truth.test(i), "signal pixel outside the phantom");
        }
        assertEquals(0.75, sig.length / (double) truthCount, 0.02, "signal area fraction");
        for (PlacedRegion r : List.of(pl.top(), pl.bottom(), pl.left(), pl.right())) {
            assertNotNull(r, "a side region is missing");
            for (int i : r.region().indices()) {
                assertFalse(truth.test(i), r.name() + " touches the phantom");
                int x = i % N;
                int y = i / N;
                assertTrue(x >= 2 && y >= 2 && x < N - 2 && y < N - 2, r.name() + " touches the image border");
            }
        }
        assertEquals(4, pl.background().size());
        QaMetrics.Windows w = QaMetrics.searchWindows(px, N, N, pl.signal().region(), pl.windowW(), pl.windowH());
        for (PlacedRegion win : List.of(w.highRegion(N), w.lowRegion(N))) {
            for (int i : win.region().indices()) {
                assertTrue(truth.test(i), "uniformity window outside the phantom");
            }
        }
        if (Double.isNaN(pixelMm)) {
            assertTrue(pl.warnings().stream().anyMatch(x -> x.code().equals("uncalibrated")));
        } else {
            // 1 cm^2 = 100 mm^2 (references.md section 4: ~1 cm^2 high and low regions)
            assertEquals(10 / pixelMm, pl.windowW(), 0.5);
            assertEquals(10 / pixelMm, pl.windowH(), 0.5);
            assertTrue(pl.warnings().isEmpty(), pl.warnings().toString());
        }
    }

    @ParameterizedTest
    @CsvSource({"15, 80, 80, 1.0", "30, 92, 70, 0.8", "45, 72, 86, NaN", "30, 70, 95, NaN"})
    void disks(double r, double cx, double cy, double mm) throws InputException {
        IntPredicate truth = disk(cx, cy, r);
        check(truth, image(truth, (long) (r * 100 + cx)), mm);
    }

    @ParameterizedTest
    @CsvSource({"12, 20, 80, 80, 1.0", "25, 35, 90, 72, NaN", "45, 30, 75, 84, 0.5"})
    void rectangles(double hw, double hh, double cx, double cy, double mm) throws InputException {
        IntPredicate truth = rect(cx, cy, hw, hh);
        float[] px = image(truth, (long) (hw * 10 + hh));
        check(truth, px, mm);
        assertTrue(PhantomFinder.find(px, N, N, PhantomLocator.threshold(px)).rectangular());
    }

    @Test
    void readoutSideBackgroundWhenPhaseIsKnown() throws InputException {
        IntPredicate truth = disk(80, 80, 30);
        float[] px = image(truth, 5);
        Phantom p = PhantomFinder.find(px, N, N, PhantomLocator.threshold(px));
        // phase along columns (y): ghosts above and below, so background left and right
        List<String> names = QaRegions.place(p, N, N, 0.75, PhaseDirection.COL, 1, 1).background().stream()
                .map(PlacedRegion::name).toList();
        assertEquals(List.of("bg left", "bg right"), names);
        assertEquals(List.of("bg top", "bg bottom"), QaRegions.place(p, N, N, 0.75, PhaseDirection.ROW, 1, 1)
                .background().stream().map(PlacedRegion::name).toList());
    }

    @Test
    void clearFailures() {
        float[] noise = image(i -> false, 1);
        InputException none = assertThrows(InputException.class, () -> PhantomFinder.find(noise, N, N, 60));
        assertTrue(none.getMessage().contains("no phantom found"));
        float[] edge = image(disk(20, 80, 30), 2);
        InputException e = assertThrows(InputException.class,
                () -> PhantomFinder.find(edge, N, N, PhantomLocator.threshold(edge)));
        assertTrue(e.getMessage().contains("touches the image edge"), e.getMessage());
        IntPredicate two = disk(50, 80, 20).or(disk(115, 80, 20));
        float[] pair = image(two, 3);
        InputException t = assertThrows(InputException.class,
                () -> PhantomFinder.find(pair, N, N, PhantomLocator.threshold(pair)));
        assertTrue(t.getMessage().contains("more than one object"), t.getMessage());
    }

    /** Issue 15.10: non-square pixels give uniformity windows 10 mm x 10 mm, not square in pixels. */
    @Test
    void windowsAreSquareInMillimetres() throws InputException {
        IntPredicate truth = disk(64, 64, 40);
        float[] px = image(truth, 3);
        Phantom p = PhantomFinder.find(px, N, N, 50);
        QaRegions.Placement pl = QaRegions.place(p, N, N, 0.75, PhaseDirection.UNKNOWN, 0.5, 1.25);
        assertEquals(20, pl.windowW());
        assertEquals(8, pl.windowH());
    }

    /**
     * Issue 15.10: a tilted elongated phantom gets axis-aligned regions (a stated limit) and a warning;
     * a straight one and a disk get none. The second moments give the tilt (closed form for an ellipse).
     */
    @Test
    void tiltedPhantomIsWarnedAbout() throws InputException {
        double a = 45;
        double b = 25;
        for (double deg : new double[] {0, 30}) {
            double t = Math.toRadians(deg);
            IntPredicate truth = i -> {
                double dx = i % N + 0.5 - 64;
                double dy = i / N + 0.5 - 64;
                double u = dx * Math.cos(t) + dy * Math.sin(t);
                double v = -dx * Math.sin(t) + dy * Math.cos(t);
                return (u / a) * (u / a) + (v / b) * (v / b) <= 1;
            };
            Phantom p = PhantomFinder.find(image(truth, 5), N, N, 50);
            assertEquals(deg, p.tiltDegrees(), 1.0);
            assertEquals(a / b, p.elongation(), 0.05);
            QaRegions.Placement pl = QaRegions.place(p, N, N, 0.75, PhaseDirection.UNKNOWN, 1, 1);
            boolean warned = pl.warnings().stream().anyMatch(w -> w.code().equals("tilted_phantom"));
            assertEquals(deg != 0, warned, pl.warnings().toString());
        }
    }
}
