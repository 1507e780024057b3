package org.noisewise.math;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The inverse of the noncentral-chi mean against an exact inversion: a bracketing root-finder
 * (Commons Math's Brent solver) on {@code mean_L(theta) = x}, the definition itself. The per-pixel
 * correction (single precision, as the float images it writes) must be within 1e-6 relative for
 * theta >= 0.1, and within 1e-5 sigma absolute below that, just above the noise floor.
 */
class MeanInverseTest {

    private static double exact(int channels, double x) {
        double floor = ChiMoments.beta(channels);
        if (!(x > floor)) {
            return 0.0;
        }
        return new BrentSolver(1e-15, 1e-15).solve(500, t -> ChiMoments.mean(channels, t) - x, 0.0, x);
    }

    /** Amplitudes from just above the floor to far above the table, as pixels would give them. */
    private static double[] thetas() {
        double[] t = new double[400];
        for (int i = 0; i < t.length; i++) {
            t[i] = 1e-4 * Math.pow(1e7, i / (t.length - 1.0));
        }
        return t;
    }

    @ParameterizedTest
    @CsvSource({"1", "2", "3", "4", "8", "12", "16", "24", "32"})
    void tableAndKernelAgreeWithExactInversion(int channels) {
        MeanInverse inv = MeanInverse.of(channels);
        assertTrue(inv.usesKernel(), "kernel error " + inv.kernelError());
        double[] thetas = thetas();
        float[] px = new float[thetas.length];
        for (int i = 0; i < px.length; i++) {
            px[i] = (float) (2.5 * ChiMoments.mean(channels, thetas[i]));
        }
        float[] out = new float[px.length];
        inv.apply(px, out, 0, px.length, 2.5);
        for (int i = 0; i < px.length; i++) {
            double x = px[i] / 2.5;
            double want = exact(channels, x);
            assertEquals(want, inv.theta(x), 1e-9 * Math.max(1, want), "table, L=" + channels + " x=" + x);
            double got = out[i] / 2.5;
            if (want >= 0.1) {
                assertEquals(want, got, 1e-6 * want, "relative, L=" + channels + " x=" + x);
            } else {
                assertEquals(want, got, 1e-5, "absolute, L=" + channels + " x=" + x);
            }
        }
    }

    /** At and below the floor (negative values too) the amplitude is 0; NaN stays NaN. */
    @ParameterizedTest
    @CsvSource({"1", "8"})
    void floorNegativeAndNaN(int channels) {
        MeanInverse inv = MeanInverse.of(channels);
        float floor = (float) ChiMoments.beta(channels);
        float[] px = {0f, -5f, floor * 0.999f, Float.NaN, Math.nextUp(floor) * 1.0001f};
        float[] out = new float[px.length];
        inv.apply(px, out, 0, px.length, 1.0);
        assertEquals(0f, out[0]);
        assertEquals(0f, out[1]);
        assertEquals(0f, out[2]);
        assertTrue(Float.isNaN(out[3]));
        assertEquals(exact(channels, px[4]), out[4], 1e-5);
        assertEquals(0.0, inv.theta(-1), 0.0);
        assertTrue(Double.isNaN(inv.theta(Double.NaN)));
    }
}
