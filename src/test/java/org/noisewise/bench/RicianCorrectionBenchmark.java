package org.noisewise.bench;

import java.util.Arrays;
import java.util.Locale;
import java.util.SplittableRandom;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.noisewise.estimate.RicianCorrection;
import org.noisewise.math.ChiMoments;
import org.noisewise.math.MeanInverse;

/**
 * Benchmark (not a test): the per-pixel Rician / noncentral-chi correction (Koay-Basser mean
 * inversion, {@link RicianCorrection#correct(float[], double, int, RicianCorrection.Method)}) of
 * 5e7 float voxels, for L = 1 and L = 8, against one plain single-threaded pass that only reads the
 * array and writes a new one (median of 5, interleaved, after the same warm-up); printed as a ratio of
 * throughputs (target at least 0.33). Then its error against an exact inversion (Commons Math's Brent
 * root-finder on the noncentral chi mean itself): the largest relative error for {@code A >= 0.1 sigma}
 * (target 1e-6) and absolute error in sigma below that (target 1e-5), over amplitudes from 1e-4 to
 * 1e4 sigma; and the setup time of each channel count up to 32 (target 0.1 s). Run:
 * {@code docs/run-benchmarks.sh}.
 */
public final class RicianCorrectionBenchmark {

    static final int N = 50_000_000;

    private RicianCorrectionBenchmark() {
    }

    static float[] readWrite(float[] in) {
        float[] out = new float[in.length];
        for (int i = 0; i < in.length; i++) {
            out[i] = in[i];
        }
        return out;
    }

    static float[] magnitudes(int channels, double sigma) {
        SplittableRandom rng = new SplittableRandom(3);
        float[] px = new float[N];
        // a spread of amplitudes, 0 to 40 sigma, each pixel a noncentral chi sample
        for (int i = 0; i < N; i++) {
            double a = 40.0 * (i % 1000) / 1000.0 * sigma;
            double sum = 0;
            for (int c = 0; c < channels; c++) {
                double re = (c == 0 ? a : 0) + sigma * rng.nextGaussian();
                double im = sigma * rng.nextGaussian();
                sum += re * re + im * im;
            }
            px[i] = (float) Math.sqrt(sum);
        }
        return px;
    }

    private static double median(long[] v) {
        long[] c = v.clone();
        Arrays.sort(c);
        return c[c.length / 2];
    }

    static double exact(int channels, double x) {
        double floor = ChiMoments.beta(channels);
        if (!(x > floor)) {
            return 0.0;
        }
        return new BrentSolver(1e-15, 1e-15).solve(500, t -> ChiMoments.mean(channels, t) - x, 0.0, x);
    }

    public static void main(String[] args) throws Exception {
        System.out.println("setup time of the mean inversion (first use of each channel count):");
        double slowest = 0;
        int slowestL = 0;
        for (int l = 1; l <= 32; l++) {
            long t0 = System.nanoTime();
            MeanInverse.of(l);
            double s = (System.nanoTime() - t0) / 1e9;
            if (s > slowest) {
                slowest = s;
                slowestL = l;
            }
        }
        System.out.printf(Locale.ROOT, "  slowest: L = %d, %.3f s (target <= 0.1 s)%n", slowestL, slowest);

        double sigma = 12.5;
        for (int channels : new int[] {1, 8}) {
            float[] px = magnitudes(channels, sigma);
            int reps = 5;
            long[] ours = new long[reps];
            long[] pass = new long[reps];
            for (int warm = 0; warm < 3; warm++) {
                RicianCorrection.correct(px, sigma, channels, RicianCorrection.Method.KOAY_BASSER);
                readWrite(px);
            }
            for (int r = 0; r < reps; r++) {
                long t0 = System.nanoTime();
                RicianCorrection.correct(px, sigma, channels, RicianCorrection.Method.KOAY_BASSER);
                ours[r] = System.nanoTime() - t0;
                t0 = System.nanoTime();
                readWrite(px);
                pass[r] = System.nanoTime() - t0;
            }
            System.out.printf(Locale.ROOT, "Rician correction of %.0e float voxels, L = %d, %d cores, median of %d:%n",
                    (double) N, channels, Runtime.getRuntime().availableProcessors(), reps);
            System.out.printf(Locale.ROOT, "  Noisewise correct (mean inversion)  %8.1f ms%n", median(ours) / 1e6);
            System.out.printf(Locale.ROOT, "  read-write pass, 1 thread           %8.1f ms%n", median(pass) / 1e6);
            System.out.printf(Locale.ROOT, "  throughput / read-write pass: %.2f (target >= 0.33)%n",
                    median(pass) / median(ours));

            int m = 20000;
            float[] in = new float[m];
            double[] theta = new double[m];
            for (int i = 0; i < m; i++) {
                theta[i] = 1e-4 * Math.pow(1e8, i / (m - 1.0));
                in[i] = (float) (sigma * ChiMoments.mean(channels, theta[i]));
            }
            float[] out = RicianCorrection.correct(in, sigma, channels, RicianCorrection.Method.KOAY_BASSER);
            double rel = 0;
            double abs = 0;
            for (int i = 0; i < m; i++) {
                double want = exact(channels, in[i] / sigma);
                double got = out[i] / sigma;
                if (want >= 0.1) {
                    rel = Math.max(rel, Math.abs(got - want) / want);
                } else {
                    abs = Math.max(abs, Math.abs(got - want));
                }
            }
            System.out.printf(Locale.ROOT, "  largest relative error for A >= 0.1 sigma: %.1e (target <= 1e-6)%n", rel);
            System.out.printf(Locale.ROOT, "  largest absolute error below, in sigma:     %.1e (target <= 1e-5)%n", abs);
        }
    }
}
