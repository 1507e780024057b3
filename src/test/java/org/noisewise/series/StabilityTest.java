package org.noisewise.series;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;

/**
 * The stability figures (Friedman and Glover 2006; Weisskoff 1996; definitions in the reference sheet,
 * section 5) against series whose answer is known in closed form: exact trends and alternating
 * patterns (exact values), white noise, and a fluctuation common to every voxel (SFNR =
 * A / sqrt(sigma^2 + s^2), F(k) = 100 sqrt(s^2 + sigma^2 / k^2) / A), plus seeded coverage of the intervals.
 */
class StabilityTest {

    /** A w x w series of {@code n} frames: A + trend(t) + common c(t) + independent noise. */
    static float[][] series(SplittableRandom rng, int w, int n, double a, double sigma, double common,
                            java.util.function.IntToDoubleFunction trend) {
        float[][] f = new float[n][w * w];
        for (int t = 0; t < n; t++) {
            double c = common * rng.nextGaussian() + trend.applyAsDouble(t);
            for (int i = 0; i < w * w; i++) {
                f[t][i] = (float) (a + c + sigma * rng.nextGaussian());
            }
        }
        return f;
    }

    static StabilityResult figures(float[][] f, int w, int skip, int side) throws InputException {
        StabilityMaps m = Stability.maps(f, w, w, skip);
        int x0 = (w - side) / 2;
        Region r = Region.rectangle("signal", x0, x0, side, side, w, w);
        return Stability.summarize(m, Stability.Frames.of(f), new Stability.Placement(r, x0, x0, side), Double.NaN);
    }

    /** Exact: a linear drift gives drift = 100 g (n - 1) / mean and no fluctuation; the maps match the definitions. */
    @Test
    void exactTrendsAndMaps() throws InputException {
        int w = 9;
        int n = 40;
        double a = 500;
        double g = 0.25;
        float[][] f = series(new SplittableRandom(1), w, n + 2, a, 0, 0, t -> g * (t - 2));
        StabilityResult r = figures(f, w, 2, 5);
        double mean = a + g * (n - 1) / 2.0;
        assertEquals(mean, r.signalMean(), 1e-3);
        assertEquals(100 * g * (n - 1) / mean, r.driftPercent(), 1e-6, "closed form");
        assertEquals(0.0, r.percentFluctuation(), 1e-6);
        // quadratic: y = A + q (t - c)^2, c = (n - 1) / 2: the fit is exact; over the frames (n even) its
        // largest value is q c^2 at the ends and its smallest q / 4 at the two middle frames
        double q = 0.01;
        double c = (n - 1) / 2.0;
        float[][] f2 = series(new SplittableRandom(1), w, n, a, 0, 0, t -> q * (t - c) * (t - c));
        StabilityResult r2 = figures(f2, w, 0, 5);
        double mean2 = a + q * IntStream.range(0, n).mapToDouble(t -> (t - c) * (t - c)).sum() / n;
        assertEquals(100 * q * (c * c - 0.25) / mean2, r2.driftPercent(), 1e-5, "closed form");

        // static map: an alternating pattern x = A + k_p (-1)^t gives exactly N_s k_p (odd frames 1, 3, ... carry +k_p)
        int frames = 21;
        float[][] alt = new float[frames][w * w];
        for (int t = 0; t < frames; t++) {
            for (int i = 0; i < w * w; i++) {
                alt[t][i] = (float) (a + (i % 3) * (t % 2 == 0 ? 1 : -1));
            }
        }
        StabilityMaps m = Stability.maps(alt, w, w, 0);
        assertEquals(20, m.staticFrames(), "21 frames used: the last is dropped");
        for (int i = 0; i < w * w; i++) {
            assertEquals(20.0 * (i % 3), m.staticNoise()[i], 1e-3, "pixel " + i);
        }
    }

    /** The per-voxel residual variance divides by n - 3 (unbiased): over 40,000 voxels of 50 frames n - 1 is 4% off. */
    @Test
    void fluctuationMapIsUnbiased() throws InputException {
        int w = 200;
        int n = 50;
        float[][] f = series(new SplittableRandom(2), w, n, 100, 3, 0, t -> 0.05 * t);
        StabilityMaps m = Stability.maps(f, w, w, 0);
        double mean = 0;
        for (float v : m.fluctuation()) {
            mean += (double) v * v;
        }
        mean /= w * w;
        // relative SE of the mean of 40,000 chi-square(47)/47 variances: sqrt(2 / (47 * 40000)) = 0.1%
        assertEquals(9.0, mean, 9.0 * 0.004, "E[s^2] = sigma^2 with n - 3");
    }

    /** White noise: SFNR = static SNR = A / sigma, fluctuation = 100 sigma / (A sqrt(m)), RDC about the square's side. */
    @Test
    void whiteNoise() throws InputException {
        int w = 25;
        double a = 1000;
        double sigma = 10;
        float[][] f = series(new SplittableRandom(3), w, 402, a, sigma, 0, t -> 0);
        StabilityResult r = figures(f, w, 2, 21);
        assertEquals(400, r.framesUsed());
        // SFNR: relative SE sqrt(1 / (2 * 397 * 441)) = 0.17%
        assertEquals(100, r.sfnr(), 0.7, "A / sigma");
        assertTrue(r.sfnrCi95().contains(100), r.sfnrCi95().toString());
        // static SNR: relative SE sqrt(1 / (2 * 440)) = 3.4%
        assertEquals(100, r.snr(), 10, "A / sigma");
        // fluctuation of the mean of 441 voxels: 100 * 10 / (1000 * 21) = 0.0476%; relative SE 3.5%
        assertEquals(100 * sigma / (a * 21), r.percentFluctuation(), 0.1 * 100 * sigma / (a * 21));
        assertEquals(21, r.rdc(), 21 * 0.12, "independent voxels: F(1) / F(21) = 21");
        assertEquals(0, r.driftPercent(), 0.01);
    }

    /**
     * A fluctuation common to every voxel (reference sheet's Weisskoff check value, from memory: F(1) = 0.5%,
     * F(21) = 0.05%, RDC = 10): A = 1000, sigma^2 = 24.806, s^2 = 0.194 give exactly those F(1) and F(21).
     */
    @Test
    void commonFluctuationAndWeisskoffCheckValue() throws InputException {
        int w = 23;
        double a = 1000;
        double sigma = Math.sqrt(24.806);
        double s = Math.sqrt(0.194);
        float[][] f = series(new SplittableRandom(4), w, 3000, a, sigma, s, t -> 0);
        StabilityResult r = figures(f, w, 0, 21);
        double[] fk = r.weisskoff();
        assertEquals(0.5, fk[0], 0.5 * 0.05, "F(1)");
        assertEquals(0.05, fk[20], 0.05 * 0.06, "F(21)");
        assertEquals(10, r.rdc(), 10 * 0.07, "RDC = F(1) / F(21)");
        for (int k = 1; k <= 21; k++) {
            double want = 100 * Math.sqrt(s * s + sigma * sigma / (k * k)) / a;
            assertEquals(want, fk[k - 1], want * 0.07, "F(" + k + ")");
        }
        assertEquals(a / Math.sqrt(sigma * sigma + s * s), r.sfnr(), 200 * 0.03, "SFNR = A / sqrt(sigma^2 + s^2)");
        assertEquals(a / sigma, r.snr(), a / sigma * 0.12, "the common part cancels in odd - even");
        double fl = 100 * Math.sqrt(s * s + sigma * sigma / 441) / a;
        assertEquals(fl, r.percentFluctuation(), fl * 0.06);
    }

    /** Seeded coverage: the 95% intervals contain the true SFNR and static SNR in 93-97% of 1,000 trials. */
    @Test
    void intervalsCoverTheTruth() {
        int trials = 1000;
        int w = 17;
        int side = 15;
        double a = 400;
        double sigma = 8;
        List<String> failures = new ArrayList<>();
        for (double s : new double[] {0, 6}) {
            // the true signal is the mean over the frames used (2 .. 201) of A + 0.02 t, A + 2.03
            double signal = a + 0.02 * 101.5;
            double trueSfnr = signal / Math.sqrt(sigma * sigma + s * s);
            double trueSnr = signal / sigma;
            int[] hits = new int[2];
            IntStream.range(0, trials).parallel().forEach(t -> {
                try {
                    StabilityResult r = figures(series(new SplittableRandom(1000L * t + (long) s), w, 202, a, sigma, s,
                            x -> 0.02 * x), w, 2, side);
                    synchronized (hits) {
                        hits[0] += r.sfnrCi95().contains(trueSfnr) ? 1 : 0;
                        hits[1] += r.snrCi95().contains(trueSnr) ? 1 : 0;
                    }
                } catch (InputException e) {
                    throw new IllegalStateException(e);
                }
            });
            String line = String.format(Locale.ROOT, "common s=%.0f: SFNR %.1f%%, static SNR %.1f%%", s,
                    100.0 * hits[0] / trials, 100.0 * hits[1] / trials);
            System.out.println("coverage " + line);
            for (int h : hits) {
                if (h < 0.93 * trials || h > 0.97 * trials) {
                    failures.add(line);
                }
            }
        }
        assertTrue(failures.isEmpty(), "outside 93-97%: " + failures);
    }

    @Test
    void badInputSaysWhatToDo() throws InputException {
        float[][] few = series(new SplittableRandom(5), 8, 11, 100, 1, 0, t -> 0);
        InputException e = assertThrows(InputException.class, () -> Stability.maps(few, 8, 8, 2));
        assertTrue(e.getMessage().contains("11 frames") && e.getMessage().contains("at least 10"), e.getMessage());
        float[][] odd = series(new SplittableRandom(5), 8, 20, 100, 1, 0, t -> 0);
        odd[7] = new float[63];
        e = assertThrows(InputException.class, () -> Stability.maps(odd, 8, 8, 2));
        assertTrue(e.getMessage().contains("frame 8") && e.getMessage().contains("same matrix"), e.getMessage());
        float[][] ok = series(new SplittableRandom(5), 8, 20, 100, 1, 0, t -> 0);
        StabilityMaps m = Stability.maps(ok, 8, 8, 2);
        e = assertThrows(InputException.class, () -> Stability.summarize(m, Stability.Frames.of(ok), new Stability.Placement(
                Region.rectangle("signal", 0, 0, 4, 4, 8, 8), 0, 0, 9), Double.NaN));
        assertTrue(e.getMessage().contains("does not fit"), e.getMessage());
    }

    /** 16-bit frames (whole-number sums) give the maps of the same values as floats, for odd and even frame counts. */
    @Test
    void storedIntegersMatchFloats() throws InputException {
        for (int frames : new int[] {37, 40}) {
            SplittableRandom rng = new SplittableRandom(frames);
            int w = 13;
            short[][] s = new short[frames][w * w];
            float[][] f = new float[frames][w * w];
            for (int t = 0; t < frames; t++) {
                for (int i = 0; i < w * w; i++) {
                    int v = (int) Math.round(30000 + 0.3 * t * t + 25 * rng.nextGaussian() + (i % 7) * 100);
                    s[t][i] = (short) v;
                    f[t][i] = v;
                }
            }
            StabilityMaps a = Stability.maps(s, w, w, 3, 5.0, 0.5, null, null);
            StabilityMaps b = Stability.maps(f, w, w, 3, 5.0, 0.5, null, null);
            for (int i = 0; i < w * w; i++) {
                assertEquals(b.signal()[i], a.signal()[i], 1e-3, "signal " + i);
                assertEquals(b.fluctuation()[i], a.fluctuation()[i], 1e-4 * b.fluctuation()[i], "fluctuation " + i);
                assertEquals(b.staticNoise()[i], a.staticNoise()[i], 1e-3, "static " + i);
            }
        }
    }
}
