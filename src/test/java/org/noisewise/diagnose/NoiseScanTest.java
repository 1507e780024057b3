package org.noisewise.diagnose;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Locale;
import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.math.ChiMoments;
import org.noisewise.testing.NoiseFields;

/**
 * The noise-only scan: sigma where the noise varies over the image (a 2x ramp of sigma across it, as
 * parallel imaging makes it), checked by seeded simulation against the TRUE local sigma and SNR, under
 * white, neighbour-correlated and integer-stored noise; the checks that refuse a scan holding signal,
 * masked or clipped.
 */
class NoiseScanTest {

    static final int W = 128;
    static final int H = 128;
    static final double S0 = 10.0;
    static final double A = 100.0;
    /** The object: a band across the whole width, so regions at either side of the ramp lie in it. */
    static final int BAND_Y0 = 32;
    static final int BAND_Y1 = 96;

    /** sigma(x): rising linearly from S0 at the left edge to 2 S0 at the right. */
    static double sigmaAt(int x) {
        return S0 * (1.0 + (double) x / (W - 1));
    }

    /** L-channel magnitude with per-pixel sigma(x); amplitude A in the band when {@code signal}. */
    static float[] image(SplittableRandom rng, NoiseFields.Kind kind, int channels, boolean signal) {
        return image(rng, kind, channels, signal, true);
    }

    /** As above; without {@code ramp}, sigma is S0 everywhere. */
    static float[] image(SplittableRandom rng, NoiseFields.Kind kind, int channels, boolean signal, boolean ramp) {
        double[] sum = new double[W * H];
        double per = A / Math.sqrt(channels);
        for (int c = 0; c < channels; c++) {
            double[][] f = NoiseFields.complex(rng, kind, W, H);
            for (int i = 0; i < W * H; i++) {
                int x = i % W;
                int y = i / W;
                double s = ramp ? sigmaAt(x) : S0;
                double re = (signal && y >= BAND_Y0 && y < BAND_Y1 ? per : 0.0) + s * f[0][i];
                double im = s * f[1][i];
                sum[i] += re * re + im * im;
            }
        }
        float[] out = new float[W * H];
        for (int i = 0; i < out.length; i++) {
            out[i] = (float) Math.sqrt(sum[i]);
        }
        return out;
    }

    static float[] rounded(float[] v, double step) {
        float[] out = new float[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = (float) (step * Math.rint(v[i] / step));
        }
        return out;
    }

    /** The true local sigma of a region: the RMS of sigma(x) over its pixels (what sqrt(mean M^2 / 2L) estimates). */
    static double trueSigma(Region r) {
        double s = 0;
        for (int i : r.indices()) {
            s += sigmaAt(i % W) * sigmaAt(i % W);
        }
        return Math.sqrt(s / r.size());
    }

    static Region left() throws InputException {
        return Region.rectangle("left", 4, 54, 20, 20, W, H);
    }

    static Region right() throws InputException {
        return Region.rectangle("right", 104, 54, 20, 20, W, H);
    }

    @Test
    void blockStatisticIsTheChiMomentRatio() {
        // exact: Rayleigh E[M] = sigma sqrt(pi/2), E[M^2] = 2 sigma^2, so E[M]^2 / E[M^2] = pi / 4
        assertEquals(Math.PI / 4, NoiseScan.g(1), 1e-12);
        for (int l : new int[]{2, 4, 8, 32}) {
            double b = ChiMoments.beta(l);
            assertEquals(b * b / (2.0 * l), NoiseScan.g(l), 1e-12, "L=" + l);
            assertEquals(l, NoiseScan.solve(NoiseScan.g(l) + (1 - NoiseScan.g(l)) / 256, 256), 1e-6);
        }
        // exact: E sqrt(chi^2_k / k) for k = 2 is Gamma(3/2) = sqrt(pi) / 2
        assertEquals(Math.sqrt(Math.PI) / 2, NoiseScan.rootBias(2), 1e-12);
    }

    /**
     * A 2x ramp of sigma: the local sigma at either side within 1% of the truth on average (the issue
     * asks 4%), its SD within 1.3x the bound {@code 1/sqrt(4 L n)}, and the 95% intervals of sigma and of
     * the SNR covering the TRUE values in 93-97% of the trials; the channel count found in every trial.
     */
    @ParameterizedTest
    @CsvSource({"1, 101", "4, 102", "8, 103"})
    void localSigmaAndSnrCoverTheTruthUnderARamp(int channels, long seed) throws InputException {
        assertRamp(channels, seed, NoiseFields.Kind.WHITE, 0.0, 0.010, 1.3, 1500, 97);
    }

    /** Complex noise averaged over 3x3 pixels: the scan's correlation widens the intervals enough. */
    @ParameterizedTest
    @ValueSource(ints = {1, 8})
    void correlatedNoiseKeepsTheCoverage(int channels) throws InputException {
        assertRamp(channels, 200 + channels, NoiseFields.Kind.BOX, 0.0, 0.015, Double.NaN, 1000, 98.5);
    }

    /** Integer storage, sigma 2 steps at the low side: Sheppard's correction keeps the bias and coverage. */
    @Test
    void integerStorageKeepsTheCoverage() throws InputException {
        assertRamp(1, 301, NoiseFields.Kind.WHITE, S0 / 2, 0.010, 1.3, 1500, 97);
    }

    private static void assertRamp(int channels, long seed, NoiseFields.Kind kind, double step, double biasTol,
                                   double sdRatio, int trials, double snrHigh) throws InputException {
        SplittableRandom rng = new SplittableRandom(seed);
        Region[] regions = {left(), right()};
        int[] sigmaIn = new int[2];
        int[] snrIn = new int[2];
        double[] sum = new double[2];
        double[] sum2 = new double[2];
        int channelsRight = 0;
        BackgroundCheck.Storage storage = step > 0 ? new BackgroundCheck.Storage(step, 65535 * step)
                : BackgroundCheck.Storage.floatingPoint();
        for (int t = 0; t < trials; t++) {
            float[] img = image(rng, kind, channels, true);
            float[] noise = image(rng, kind, channels, false);
            if (step > 0) {
                img = rounded(img, step);
                noise = rounded(noise, step);
            }
            NoiseScan.Check c = NoiseScan.check(noise, W, H, null, storage, null);
            channelsRight += c.channels() == channels ? 1 : 0;
            for (int k = 0; k < 2; k++) {
                Region r = regions[k];
                double truth = trueSigma(r);
                SigmaEstimate s = NoiseScan.sigma(noise, r, c);
                sigmaIn[k] += s.ci95().contains(truth) ? 1 : 0;
                double rel = s.sigma() / truth - 1;
                sum[k] += rel;
                sum2[k] += rel * rel;
                BackgroundSnr.Signal sig = BackgroundSnr.Signal.of(img, W, r);
                CorrectedSnr f = BackgroundSnr.figures(sig, s, c.channels());
                double trueSnr = A / truth;
                snrIn[k] += f.snrCi95().contains(trueSnr) ? 1 : 0;
            }
        }
        assertEquals(trials, channelsRight, "channel count found in every trial");
        for (int k = 0; k < 2; k++) {
            double bias = sum[k] / trials;
            double sd = Math.sqrt(sum2[k] / trials - bias * bias);
            double bound = 1 / Math.sqrt(4.0 * channels * regions[k].size());
            double cs = 100.0 * sigmaIn[k] / trials;
            double cn = 100.0 * snrIn[k] / trials;
            System.out.printf(Locale.ROOT, "noise scan %s L=%d step %.0f %s: bias %.2f%%, SD %.2f%% (bound %.2f%%), "
                    + "coverage sigma %.1f%% SNR %.1f%%%n", kind, channels, step, regions[k].name(), 100 * bias,
                    100 * sd, 100 * bound, cs, cn);
            assertTrue(Math.abs(bias) < biasTol, "bias " + bias);
            if (!Double.isNaN(sdRatio)) {
                assertTrue(sd < sdRatio * bound, "SD " + sd + " vs bound " + bound);
            }
            assertTrue(cs >= 93 && cs <= 97, "sigma coverage " + cs);
            assertTrue(cn >= 93 && cn <= snrHigh, "SNR coverage " + cn);
        }
    }

    /**
     * The scale check compares the image's background sigma with the scan's in the same pixels (flat noise,
     * four corners): for a scan
     * of the same scale its 95% interval holds 1 in 93-97% of the trials, and the warning (more than 2% off
     * at 3.29 standard errors) is rare; a scan 10% off is caught in nearly every trial.
     */
    @Test
    void scaleCheckHoldsOneAndCatchesAnotherScale() throws InputException {
        SplittableRandom rng = new SplittableRandom(404);
        java.util.List<Region> corners = java.util.List.of(Region.rectangle("a", 2, 2, 20, 20, W, H),
                Region.rectangle("b", 106, 2, 20, 20, W, H), Region.rectangle("c", 2, 106, 20, 20, W, H),
                Region.rectangle("d", 106, 106, 20, 20, W, H));
        int[] idx = corners.stream().flatMapToInt(r -> java.util.stream.IntStream.of(r.indices())).toArray();
        Region all = new Region("corners", idx);
        int trials = 1000;
        int holds = 0;
        int alarms = 0;
        int caught = 0;
        for (int t = 0; t < trials; t++) {
            float[] img = image(rng, NoiseFields.Kind.WHITE, 4, true, false);
            float[] noise = image(rng, NoiseFields.Kind.WHITE, 4, false, false);
            NoiseScan.Check c = NoiseScan.check(noise, W, H, 4, null, null);
            org.noisewise.estimate.BackgroundNoise bn = org.noisewise.estimate.BackgroundNoise.measure(img, W, corners);
            java.util.Map<org.noisewise.estimate.SigmaEstimator, Double> counts = java.util.Map.of(
                    org.noisewise.estimate.SigmaEstimator.ML, bn.effectivePixels(org.noisewise.estimate.SigmaEstimator.ML));
            SigmaEstimate onImage = org.noisewise.estimate.BackgroundSigma.estimate(bn.values(), bn.stats(), 4,
                    new java.util.EnumMap<>(counts), 0.0).get(org.noisewise.estimate.SigmaEstimator.ML);
            NoiseScan.Ratio r = NoiseScan.ratio(onImage, NoiseScan.sigma(noise, all, c));
            holds += r.ci95().contains(1.0) ? 1 : 0;
            alarms += r.differs(0.02, 3.29) ? 1 : 0;
            float[] scaled = noise.clone();
            for (int i = 0; i < scaled.length; i++) {
                scaled[i] *= 1.1f;
            }
            NoiseScan.Ratio off = NoiseScan.ratio(onImage, NoiseScan.sigma(scaled, all, c));
            caught += off.differs(0.02, 3.29) ? 1 : 0;
        }
        double cover = 100.0 * holds / trials;
        System.out.printf(Locale.ROOT, "scale check: interval holds 1 in %.1f%%, warning in %d of %d, 10%% off caught in "
                + "%d%n", cover, alarms, trials, caught);
        assertTrue(cover >= 93 && cover <= 97, "coverage " + cover);
        assertTrue(alarms <= trials / 100, "false warnings " + alarms);
        assertTrue(caught >= 0.99 * trials, "caught " + caught);
    }

    /** A stated count is used as given when the scan agrees; one the scan contradicts is refused. */
    @Test
    void statedChannelsAreUsedAsGiven() throws InputException {
        float[] noise = image(new SplittableRandom(7), NoiseFields.Kind.WHITE, 4, false);
        NoiseScan.Check stated = NoiseScan.check(noise, W, H, 4, null, null);
        assertEquals(4, stated.channels());
        assertNull(stated.estimate());
        NoiseScan.Check found = NoiseScan.check(noise, W, H, null, null, null);
        assertTrue(found.estimate().low() < 4 && found.estimate().high() > 4, found.estimate().toString());
        InputException wrong = assertThrows(InputException.class, () -> NoiseScan.check(noise, W, H, 1, null, null));
        assertTrue(wrong.getMessage().contains("not the 1 stated: state 4 channels"), wrong.getMessage());
    }

    /** The map follows the ramp: each column's mean within 1% of sigma(x), NaN nowhere on an unmasked scan. */
    @Test
    void sigmaMapFollowsTheRamp() throws InputException {
        SplittableRandom rng = new SplittableRandom(11);
        int trials = 20;
        double[] col = new double[W];
        for (int t = 0; t < trials; t++) {
            float[] noise = image(rng, NoiseFields.Kind.WHITE, 1, false);
            NoiseScan.Check c = NoiseScan.check(noise, W, H, 1, null, null);
            float[] map = NoiseScan.sigmaMap(noise, W, H, c, NoiseScan.DEFAULT_WINDOW);
            for (int i = 0; i < map.length; i++) {
                assertTrue(Float.isFinite(map[i]), "pixel " + i);
                col[i % W] += map[i] / (double) (H * trials);
            }
        }
        for (int x = 8; x < W - 8; x += 8) {
            assertEquals(1.0, col[x] / sigmaAt(x), 0.01, "x=" + x);
        }
    }

    @Test
    void scanHoldingSignalIsRefused() {
        // the transmitter left on: the band at 3 sigma of the low side
        SplittableRandom rng = new SplittableRandom(5);
        float[] noise = image(rng, NoiseFields.Kind.WHITE, 1, false);
        float[] faint = image(new SplittableRandom(6), NoiseFields.Kind.WHITE, 1, true);
        for (int i = 0; i < noise.length; i++) {
            int y = i / W;
            if (y >= BAND_Y0 && y < BAND_Y1) {
                noise[i] = (float) Math.sqrt(noise[i] * noise[i] + 0.09 * faint[i] * faint[i]);
            }
        }
        InputException e = assertThrows(InputException.class, () -> NoiseScan.check(noise, W, H, null, null, null));
        assertTrue(e.getMessage().contains("holds structure"), e.getMessage());
        assertTrue(e.getMessage().contains("transmitter off"), e.getMessage());
    }

    @Test
    void maskedAndClippedScansAreRefused() {
        float[] noise = image(new SplittableRandom(8), NoiseFields.Kind.WHITE, 1, false);
        float[] masked = noise.clone();
        for (int i = 0; i < masked.length; i++) {
            if (i / W < 80) {
                masked[i] = 0;
            }
        }
        InputException m = assertThrows(InputException.class, () -> NoiseScan.check(masked, W, H, 1, null, null));
        assertTrue(m.getMessage().contains("masked"), m.getMessage());
        float[] partly = noise.clone();
        for (int i = 0; i < 16 * W; i++) {
            partly[i] = 0;
        }
        InputException inMask = assertThrows(InputException.class, () -> NoiseScan.check(partly, W, H, 1, null,
                Region.rectangle("signal", 10, 2, 8, 8, W, H)));
        assertTrue(inMask.getMessage().contains("masked (zeros)"), inMask.getMessage());
        float[] clipped = rounded(noise, 1.0);
        for (int i = 0; i < 2 * W; i++) {
            clipped[i] = 255;
        }
        InputException cl = assertThrows(InputException.class, () -> NoiseScan.check(clipped, W, H, 1,
                new BackgroundCheck.Storage(1.0, 255), null));
        assertTrue(cl.getMessage().contains("clipped"), cl.getMessage());
        float[] nan = noise.clone();
        nan[W + 3] = Float.NaN;
        InputException n = assertThrows(InputException.class, () -> NoiseScan.check(nan, W, H, 1, null, null));
        assertTrue(n.getMessage().contains("NaN at x=3, y=1"), n.getMessage());
    }
}
