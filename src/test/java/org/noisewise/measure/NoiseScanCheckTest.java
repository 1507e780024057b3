package org.noisewise.measure;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.noisewise.diagnose.NoiseScan;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.Warning;

/**
 * The background check's noise-only-scan verdicts, by seeded simulation: with noise of one sigma
 * everywhere, {@code noise_varies} and {@code noise_scan_scale} (which change the verdict) are rare;
 * with sigma rising 2x across the image, a signal region on the high side is caught in nearly every
 * trial.
 */
class NoiseScanCheckTest {

    static final int N = 128;

    /** One channel, sigma {@code s0 * (1 + ramp * x / (N - 1))}, amplitude 100 in rows 32-95. */
    static float[] image(SplittableRandom rng, double s0, double ramp, boolean signal) {
        float[] out = new float[N * N];
        for (int i = 0; i < out.length; i++) {
            int x = i % N;
            int y = i / N;
            double s = s0 * (1 + ramp * x / (N - 1));
            double re = (signal && y >= 32 && y < 96 ? 100 : 0) + s * rng.nextGaussian();
            double im = s * rng.nextGaussian();
            out[i] = (float) Math.sqrt(re * re + im * im);
        }
        return out;
    }

    static int[] alarms(double ramp, long seed, int trials) throws InputException {
        SplittableRandom rng = new SplittableRandom(seed);
        List<Region> corners = List.of(Region.rectangle("a", 2, 2, 20, 20, N, N), Region.rectangle("b", 106, 2, 20, 20,
                N, N), Region.rectangle("c", 2, 106, 20, 20, N, N), Region.rectangle("d", 106, 106, 20, 20, N, N));
        Region signal = Region.rectangle("signal", 104, 54, 20, 20, N, N);
        int varies = 0;
        int scale = 0;
        for (int t = 0; t < trials; t++) {
            float[] img = image(rng, 10, ramp, true);
            float[] scan = image(rng, 10, ramp, false);
            NoiseScan.Check c = NoiseScan.check(scan, N, N, 1, null, signal);
            NoiseScanMeasure.CheckPart part = NoiseScanMeasure.checkPart(img, scan, N, corners, signal, c, 0.0);
            for (Warning w : part.warnings()) {
                varies += w.code().equals("noise_varies") ? 1 : 0;
                scale += w.code().equals("noise_scan_scale") ? 1 : 0;
            }
        }
        return new int[] {varies, scale};
    }

    @Test
    void cleanUniformNoiseIsRarelyCalledVarying() throws InputException {
        int trials = 400;
        int[] a = alarms(0.0, 31, trials);
        System.out.printf(Locale.ROOT, "uniform noise: noise_varies in %d, noise_scan_scale in %d of %d%n", a[0], a[1],
                trials);
        assertTrue(a[0] <= trials / 100, "false noise_varies: " + a[0]);
        assertTrue(a[1] <= trials / 100, "false noise_scan_scale: " + a[1]);
    }

    @Test
    void aTwofoldRampIsCaught() throws InputException {
        int trials = 200;
        int[] a = alarms(1.0, 32, trials);
        System.out.printf(Locale.ROOT, "2x ramp: noise_varies in %d of %d%n", a[0], trials);
        assertTrue(a[0] >= 0.99 * trials, "caught " + a[0]);
    }
}
