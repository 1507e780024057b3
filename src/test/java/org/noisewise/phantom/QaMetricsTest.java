package org.noisewise.phantom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.PhantomLocator;
import org.noisewise.math.ChiMoments;

class QaMetricsTest {

    private static final int N = 128;

    /** references.md section 4, published PIU checks [math]: 94.737, 88.889, 81.657. */
    @Test
    void publishedPiuChecks() {
        assertEquals(94.737, QaMetrics.piu(1000, 900), 5e-4);
        assertEquals(88.889, QaMetrics.piu(1000, 800), 5e-4);
        assertEquals(81.657, QaMetrics.piu(1000, 690), 5e-4);
    }

    /** references.md section 4: top 12, bottom 10, left 4, right 2, mean 1000 gives 0.008, i.e. 0.8%. */
    @Test
    void publishedGhostingCheck() {
        assertEquals(0.8, QaMetrics.ghostingPercent(12, 10, 4, 2, 1000), 1e-12);
    }

    /** Action limits (references.md section 4): PIU >= 87.5% below 3 T, >= 82.0% at 3 T; ghosting <= 2.5%. */
    @Test
    void actionLimits() {
        ActionLimits low = ActionLimits.largePhantom(1.5);
        assertEquals(87.5, low.minimumPiu());
        assertTrue(low.piuPasses(88.889));
        assertFalse(low.piuPasses(81.657));
        ActionLimits high = ActionLimits.largePhantom(3.0);
        assertEquals(82.0, high.minimumPiu());
        assertFalse(high.piuPasses(81.657));
        assertTrue(high.ghostingPasses(2.5));
        assertFalse(high.ghostingPasses(2.51));
    }

    /**
     * A known linear ramp I = I0 (1 + g (x - cx) / R) across a noise-free disk: the highest and lowest
     * 1 cm^2 windows inside the signal disk (radius rs) sit at the ends, centred d = sqrt(rs^2 - s^2/4) - s/2
     * from the centre, so PIU = 100 (1 - g d / R) (closed form); measured within 0.5 points.
     */
    @Test
    void rampPiu() throws InputException {
        double cx = 64;
        double cy = 64;
        double radius = 40;
        double g = 0.2;
        float[] px = new float[N * N];
        for (int i = 0; i < px.length; i++) {
            double dx = i % N + 0.5 - cx;
            double dy = i / N + 0.5 - cy;
            px[i] = dx * dx + dy * dy <= radius * radius ? (float) (100 * (1 + g * dx / radius)) : 0f;
        }
        Phantom p = PhantomFinder.find(px, N, N, 50);
        QaRegions.Placement pl = QaRegions.place(p, N, N, 0.75, PhaseDirection.UNKNOWN, 1.0, 1.0);
        QaMetrics.Windows w = QaMetrics.searchWindows(px, N, N, pl.signal().region(), pl.windowW(), pl.windowH());
        double rs = Math.sqrt(pl.signal().region().size() / Math.PI);
        double s = pl.windowW();
        double d = Math.sqrt(rs * rs - s * s / 4) - s / 2;
        double expected = 100 * (1 - g * d / radius);
        assertEquals(expected, QaMetrics.piu(w.high(), w.low()), 0.5);
        assertTrue(w.highX() > w.lowX(), "the bright window must be on the right");
        // issue 15.3: a NaN pixel outside every region changes nothing, wherever it is
        for (int at : new int[] {0, 90 * N, N * N - 1}) {
            float[] withNaN = px.clone();
            withNaN[at] = Float.NaN;
            QaMetrics.Windows wn = QaMetrics.searchWindows(withNaN, N, N, pl.signal().region(), pl.windowW(),
                    pl.windowH());
            assertEquals(w, wn, "NaN at " + at);
            assertEquals(QaMetrics.nemaNonUniformity(px, N, N, pl.signal().region()),
                    QaMetrics.nemaNonUniformity(withNaN, N, N, pl.signal().region()), 0.0);
        }
    }

    /**
     * A known N/2 ghost: the object's copy shifted by half the field of view along y, at 5% of its
     * amplitude, lands above and below it. The expected region means are the Rice means of each
     * pixel's amplitude (references.md section 2 closed form), averaged over the regions; the measured
     * ghosting equals the value computed from them within 0.2 points.
     */
    @Test
    void halfFovGhosting() throws InputException {
        double a = 200;
        double sigma = 5;
        double ghost = 0.05;
        double radius = 30;
        SplittableRandom rng = new SplittableRandom(9);
        float[] px = new float[N * N];
        double[] amp = new double[N * N];
        for (int i = 0; i < px.length; i++) {
            int x = i % N;
            int y = i / N;
            amp[i] = (in(x, y, radius) ? a : 0) + (in(x, (y + N / 2) % N, radius) ? ghost * a : 0);
            double re = amp[i] + sigma * rng.nextGaussian();
            double im = sigma * rng.nextGaussian();
            px[i] = (float) Math.hypot(re, im);
        }
        Phantom p = PhantomFinder.find(px, N, N, PhantomLocator.threshold(px));
        QaRegions.Placement pl = QaRegions.place(p, N, N, 0.75, PhaseDirection.COL, 1.0, 1.0);
        double[] expectedSides = new double[4];
        List<PlacedRegion> sides = List.of(pl.top(), pl.bottom(), pl.left(), pl.right());
        for (int k = 0; k < 4; k++) {
            expectedSides[k] = expectedMean(sides.get(k).region(), amp, sigma);
        }
        double expectedSignal = expectedMean(pl.signal().region(), amp, sigma);
        double expected = QaMetrics.ghostingPercent(expectedSides[0], expectedSides[1], expectedSides[2],
                expectedSides[3], expectedSignal);
        assertTrue(expected > 1.0, "the ghost should be clearly visible: " + expected);
        PhantomQa.Result r = PhantomQa.run(new PhantomQa.Input(new float[][] {px}, N, N, PhantomLocator.threshold(px),
                0.75, PhaseDirection.COL, 1.0, 1.0, 1, null, ActionLimits.largePhantom(1.5), null));
        assertEquals(expected, r.ghostingPercent(), 0.2);
        assertEquals(Boolean.valueOf(expected <= 2.5), r.ghostingPasses());
    }

    private static boolean in(int x, int y, double r) {
        double dx = x + 0.5 - N / 2.0;
        double dy = y + 0.5 - N / 2.0;
        return dx * dx + dy * dy <= r * r;
    }

    private static double expectedMean(Region region, double[] amp, double sigma) {
        double s = 0;
        for (int i : region.indices()) {
            s += sigma * ChiMoments.riceMean(amp[i] / sigma);
        }
        return s / region.size();
    }

    /**
     * Integer storage: two and eight acquisitions stored as whole numbers at sigma 2 steps. Rounding
     * adds {@code 1/12} step^2 to the variance (Sheppard's correction, exact for a uniform rounding
     * error), so without the storage step sigma reads about 1% high (sqrt(4 + 1/12) / 2 = 1.0104); with
     * it, the difference and repeated sigma are within 0.5% of the truth on average over 150 and 40 phantoms
     * (more than four standard errors of that mean).
     */
    @Test
    void integerStorageSigmaIsSheppardCorrected() throws InputException {
        org.noisewise.diagnose.BackgroundCheck.Storage storage = new org.noisewise.diagnose.BackgroundCheck.Storage(1.0,
                65535);
        for (int k : new int[] {8, 2}) {
            double with = 0;
            double without = 0;
            int n = k == 2 ? 150 : 40;
            for (int s = 0; s < n; s++) {
                float[][] f = new float[k][];
                for (int j = 0; j < k; j++) {
                    f[j] = org.noisewise.sample.Phantoms.disk(N, N, 64, 64, 35, 100, 2, 1, 7000L * k + 100L * s + j);
                    for (int i = 0; i < f[j].length; i++) {
                        f[j][i] = (float) Math.rint(f[j][i]);
                    }
                }
                with += PhantomQa.run(new PhantomQa.Input(f, N, N, PhantomLocator.threshold(f[0]), 0.75,
                        PhaseDirection.UNKNOWN, 1.0, 1.0, 1, storage, null, null)).sigma() / n;
                without += PhantomQa.run(new PhantomQa.Input(f, N, N, PhantomLocator.threshold(f[0]), 0.75,
                        PhaseDirection.UNKNOWN, 1.0, 1.0, 1, null, null, null)).sigma() / n;
            }
            System.out.printf(java.util.Locale.ROOT, "QA integer storage, %d acquisitions: sigma %.4f with the step, %.4f without%n", k, with / 2, without / 2);
            assertEquals(1.0, with / 2.0, 0.005, k + " acquisitions, with the storage step");
            assertEquals(Math.sqrt(4 + 1.0 / 12) / 2, without / 2.0, 0.005, k + " acquisitions, continuous");
        }
    }

    /** SNR by the best method: one image -> background, two -> difference, three or more -> repeated. */
    @Test
    void bestMethodForTheData() throws InputException {
        float[][] frames = new float[3][];
        for (int k = 0; k < 3; k++) {
            frames[k] = org.noisewise.sample.Phantoms.disk(N, N, 64, 64, 35, 100, 4, 1, 50 + k);
        }
        String[] expected = {"background", "difference", "repeated"};
        for (int k = 1; k <= 3; k++) {
            float[][] f = java.util.Arrays.copyOf(frames, k);
            PhantomQa.Result r = PhantomQa.run(new PhantomQa.Input(f, N, N, PhantomLocator.threshold(f[0]), 0.75,
                    PhaseDirection.UNKNOWN, 1.0, 1.0, 1, null, null, null));
            assertEquals(expected[k - 1], r.method());
            assertEquals(25.0, r.snr(), 2.5, r.method());
            if (k == 3) {
                // issue 15.10: repeats read the ghost regions from the temporal mean, as the signal mean is
                float[] mean = new float[N * N];
                for (int i = 0; i < mean.length; i++) {
                    mean[i] = (float) ((frames[0][i] + (double) frames[1][i] + frames[2][i]) / 3);
                }
                PlacedRegion top = r.placement().top();
                double m = 0;
                for (int i : top.region().indices()) {
                    m += mean[i];
                }
                assertEquals(m / top.region().size(), r.sideMeans()[0], 1e-4);
            }
        }
    }

    /**
     * The window search and the 3x3 non-uniformity against their definitions computed the slow way
     * (every window's mean summed pixel by pixel; every pixel's 3x3 mean of its finite neighbours), on
     * a random image with NaN pixels and an irregular region.
     */
    @Test
    void windowSearchAndNonUniformityAgainstBruteForce() throws InputException {
        int w = 61;
        int h = 47;
        java.util.SplittableRandom rng = new java.util.SplittableRandom(4);
        float[] px = new float[w * h];
        for (int i = 0; i < px.length; i++) {
            px[i] = rng.nextInt(50) == 0 ? Float.NaN : (float) (100 + 10 * rng.nextGaussian());
        }
        java.util.List<Integer> in = new java.util.ArrayList<>();
        for (int y = 3; y < h - 2; y++) {
            for (int x = 2 + y % 5; x < w - 4; x++) {
                in.add(y * w + x);
            }
        }
        Region region = new Region("r", in.stream().mapToInt(Integer::intValue).toArray());
        java.util.Set<Integer> inside = new java.util.HashSet<>(in);
        int sw = 7;
        int sh = 5;
        double best = Double.NEGATIVE_INFINITY;
        double worst = Double.POSITIVE_INFINITY;
        int bx = -1;
        int by = -1;
        for (int y = 0; y + sh <= h; y++) {
            for (int x = 0; x + sw <= w; x++) {
                double s = 0;
                boolean ok = true;
                for (int yy = y; yy < y + sh && ok; yy++) {
                    for (int xx = x; xx < x + sw; xx++) {
                        int i = yy * w + xx;
                        ok &= inside.contains(i) && Float.isFinite(px[i]);
                        s += ok ? px[i] : 0;
                    }
                }
                if (ok && s / (sw * sh) > best) {
                    best = s / (sw * sh);
                    bx = x;
                    by = y;
                }
                if (ok) {
                    worst = Math.min(worst, s / (sw * sh));
                }
            }
        }
        QaMetrics.Windows win = QaMetrics.searchWindows(px, w, h, region, sw, sh);
        assertEquals(best, win.high(), 1e-9);
        assertEquals(worst, win.low(), 1e-9);
        assertEquals(bx, win.highX());
        assertEquals(by, win.highY());

        double max = Double.NEGATIVE_INFINITY;
        double min = Double.POSITIVE_INFINITY;
        for (int i : in) {
            int x = i % w;
            int y = i / w;
            double s = 0;
            int n = 0;
            for (int dy = -1; dy <= 1; dy++) {
                for (int dx = -1; dx <= 1; dx++) {
                    int xx = x + dx;
                    int yy = y + dy;
                    if (xx >= 0 && yy >= 0 && xx < w && yy < h && Float.isFinite(px[yy * w + xx])) {
                        s += px[yy * w + xx];
                        n++;
                    }
                }
            }
            max = Math.max(max, s / n);
            min = Math.min(min, s / n);
        }
        assertEquals(100 * (max - min) / (max + min), QaMetrics.nemaNonUniformity(px, w, h, region), 1e-9);
    }

    /** Issue 10: a large slice is embedded reduced to at most 1024 pixels on its long side, the input untouched. */
    @Test
    void largeSliceIsEmbeddedReduced() {
        int w = 2500;
        int h = 1800;
        float[] px = new float[w * h];
        for (int i = 0; i < px.length; i++) {
            px[i] = i % 977;
        }
        float[] copy = px.clone();
        ij.ImagePlus shot = org.noisewise.io.QaImages.sliceWithRegions("s", px, w, h, java.util.List.of(
                new PlacedRegion("signal", PlacedRegion.Kind.OVAL, 500, 400, 1500, 1000, null)));
        assertTrue(Math.max(shot.getWidth(), shot.getHeight()) <= 1024, shot.getWidth() + "x" + shot.getHeight());
        assertTrue(Math.max(shot.getWidth(), shot.getHeight()) >= 512);
        org.junit.jupiter.api.Assertions.assertArrayEquals(copy, px);
    }
}
