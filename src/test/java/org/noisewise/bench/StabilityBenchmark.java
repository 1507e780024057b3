package org.noisewise.bench;

import ij.ImagePlus;
import ij.ImageStack;
import ij.process.ShortProcessor;
import java.util.Arrays;
import java.util.Locale;
import java.util.SplittableRandom;
import org.noisewise.io.RepeatedMaps;
import org.noisewise.measure.Progress;
import org.noisewise.measure.StabilityMeasure;

/**
 * Benchmark (not a test): the stability measurement of a 16-bit hyperstack of 64 x 64 pixels x 30 z
 * slices x 200 frames (a phantom disk with noise), every slice, as a user runs it (maps, phantom found,
 * region figures, Weisskoff curve, plots; no files written), against the repeated-acquisition maps of
 * the same data, interleaved in 21 rounds after 20 warm-ups (median of the per-round ratios). Target: at most 3x. Run:
 * {@code docs/run-benchmarks.sh}.
 */
public final class StabilityBenchmark {

    static final int W = 64;
    static final int Z = 30;
    static final int T = 200;

    private StabilityBenchmark() {
    }

    static ImagePlus series() {
        SplittableRandom rng = new SplittableRandom(9);
        ImageStack st = new ImageStack(W, W);
        for (int t = 0; t < T; t++) {
            for (int z = 0; z < Z; z++) {
                short[] p = new short[W * W];
                for (int y = 0; y < W; y++) {
                    for (int x = 0; x < W; x++) {
                        double dx = x + 0.5 - W / 2.0;
                        double dy = y + 0.5 - W / 2.0;
                        double a = dx * dx + dy * dy < 20 * 20 ? 800 : 0;
                        p[y * W + x] = (short) Math.round(Math.hypot(a + 8 * rng.nextGaussian(), 8 * rng.nextGaussian()));
                    }
                }
                st.addSlice(new ShortProcessor(W, W, p, null));
            }
        }
        ImagePlus imp = new ImagePlus("series", st);
        imp.setDimensions(1, Z, T);
        imp.setOpenAsHyperStack(true);
        return imp;
    }

    private static double median(long[] v) {
        long[] c = v.clone();
        Arrays.sort(c);
        return c[c.length / 2];
    }

    public static void main(String[] args) throws Exception {
        ImagePlus imp = series();
        int[] zs = new int[Z];
        for (int z = 0; z < Z; z++) {
            zs[z] = z + 1;
        }
        StabilityMeasure.Options o = StabilityMeasure.Options.measure(zs, 2, 21, true, true);
        int reps = 21;
        long[] stab = new long[reps];
        long[] maps = new long[reps];
        for (int warm = 0; warm < 20; warm++) {
            StabilityMeasure.run(imp, "series", null, o, null, Progress.NONE);
            for (int z = 1; z <= Z; z++) {
                RepeatedMaps.compute(imp, z);
            }
        }
        for (int r = 0; r < reps; r++) {
            long t0 = System.nanoTime();
            StabilityMeasure.run(imp, "series", null, o, null, Progress.NONE);
            stab[r] = System.nanoTime() - t0;
            t0 = System.nanoTime();
            for (int z = 1; z <= Z; z++) {
                RepeatedMaps.compute(imp, z);
            }
            maps[r] = System.nanoTime() - t0;
        }
        System.out.printf(Locale.ROOT, "stability of a 16-bit hyperstack %dx%d x %d z x %d frames (%.2e voxels), %d cores, "
                + "median of %d:%n", W, W, Z, T, (double) W * W * Z * T, Runtime.getRuntime().availableProcessors(), reps);
        System.out.printf(Locale.ROOT, "  Noisewise stability, every slice (maps, region, figures, plots) %8.1f ms%n",
                median(stab) / 1e6);
        System.out.printf(Locale.ROOT, "  repeated-acquisition maps of the same data                       %8.1f ms%n",
                median(maps) / 1e6);
        double[] ratio = new double[reps];
        for (int r = 0; r < reps; r++) {
            ratio[r] = (double) stab[r] / maps[r];
        }
        Arrays.sort(ratio);
        System.out.printf(Locale.ROOT, "  stability / repeated maps: %.2f (median of %d interleaved rounds; target <= 3)%n",
                ratio[reps / 2], reps);
    }
}
