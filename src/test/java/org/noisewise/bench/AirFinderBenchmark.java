package org.noisewise.bench;

import java.util.Arrays;
import java.util.Locale;
import java.util.SplittableRandom;
import org.noisewise.diagnose.AirFinder;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.estimate.BackgroundNoise;
import org.noisewise.estimate.SigmaEstimator;

/**
 * Benchmark (not a test): automatic air ({@link AirFinder#find}) on a 512 x 512 slice of a disk phantom
 * (radius 160, amplitude 120, sigma 5; L = 1 and 8), median of 15 runs after the same warm-up, against
 * one plain pass that sums {@code M^2} over the slice, and the ML sigma on the air found (target: the
 * selection at most 0.1 s). Run: {@code docs/run-benchmarks.sh}.
 */
public final class AirFinderBenchmark {

    static final int N = 512;

    private AirFinderBenchmark() {
    }

    static float[] slice(int channels) {
        SplittableRandom rng = new SplittableRandom(9);
        float[] px = new float[N * N];
        double per = 120 / Math.sqrt(channels);
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double dx = x + 0.5 - N / 2.0;
                double dy = y + 0.5 - N / 2.0;
                double a = dx * dx + dy * dy <= 160 * 160 ? per : 0;
                double sum = 0;
                for (int c = 0; c < channels; c++) {
                    double re = a + 5 * rng.nextGaussian();
                    double im = 5 * rng.nextGaussian();
                    sum += re * re + im * im;
                }
                px[y * N + x] = (float) Math.sqrt(sum);
            }
        }
        return px;
    }

    static double plainPass(float[] px) {
        double s = 0;
        for (float v : px) {
            s += (double) v * v;
        }
        return s;
    }

    private static double median(long[] v) {
        long[] c = v.clone();
        Arrays.sort(c);
        return c[c.length / 2];
    }

    public static void main(String[] args) throws Exception {
        for (int l : new int[] {1, 8}) {
            float[] px = slice(l);
            int runs = 15;
            long[] find = new long[runs];
            long[] pass = new long[runs];
            double sink = 0;
            for (int w = 0; w < 5; w++) {
                sink += AirFinder.find(px, N, N, l, BackgroundCheck.Storage.floatingPoint(), null).pixels();
                sink += plainPass(px);
            }
            AirFinder.Result r = null;
            for (int i = 0; i < runs; i++) {
                long t0 = System.nanoTime();
                r = AirFinder.find(px, N, N, l, BackgroundCheck.Storage.floatingPoint(), null);
                long t1 = System.nanoTime();
                sink += plainPass(px);
                long t2 = System.nanoTime();
                find[i] = t1 - t0;
                pass[i] = t2 - t1;
            }
            double sigma = BackgroundNoise.measure(px, N, r.regions()).estimates(l).get(SigmaEstimator.ML).sigma();
            System.out.printf(Locale.ROOT, "automatic air, 512x512 slice, L=%d: %.3f s per slice (median of %d; target "
                            + "at most 0.1 s), %.0fx the time of one plain pass over the slice; %d air pixels (%.1f%%), "
                            + "%d iterations, sigma %.4f (truth 5)%n", l, median(find) / 1e9, runs,
                    median(find) / median(pass), r.pixels(), 100 * r.share(), r.iterations(), sigma);
        }
    }
}
