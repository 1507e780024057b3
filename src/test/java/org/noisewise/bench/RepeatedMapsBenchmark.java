package org.noisewise.bench;

import ij.ImagePlus;
import ij.ImageStack;
import ij.plugin.Duplicator;
import ij.plugin.ImageCalculator;
import ij.plugin.ZProjector;
import ij.process.ShortProcessor;
import java.lang.management.ManagementFactory;
import java.util.Arrays;
import java.util.Locale;
import java.util.SplittableRandom;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.io.RepeatedMaps;

/**
 * Benchmark (not a test): the repeated-acquisition maps as a user meets them, from a 16-bit hyperstack
 * of 128 x 128 pixels x 64 z slices x 100 repeats (1.05e8 voxels, as opened: no conversion done
 * beforehand), against, in the same run and interleaved after the same warm-up (median of 7):
 * <ul>
 *   <li>one plain single-threaded streaming pass: per-pixel sum and sum of squares of the calibrated
 *       values, then the three float maps;</li>
 *   <li>the route a user takes in ImageJ: per z slice, Z Project (average and standard deviation over
 *       the frames), then Image Calculator (divide, 32-bit result).</li>
 * </ul>
 * Printed as ratios: throughput against the streaming pass (target at least 0.5), speed-up over
 * ImageJ's route (target at least 3), bytes allocated over the bytes of the output maps (target at most
 * 1.1), time for twice the voxels (linearity, about 2), and the SD map's agreement with a two-pass
 * computation on 30000 +- 2 data. Run: {@code docs/run-benchmarks.sh}.
 */
public final class RepeatedMapsBenchmark {

    static final int W = 128;
    static final int Z = 64;
    static final int T = 100;

    private RepeatedMapsBenchmark() {
    }

    static ImagePlus hyperstack(int zs) {
        SplittableRandom rng = new SplittableRandom(1);
        ImageStack st = new ImageStack(W, W);
        for (int t = 0; t < T; t++) {
            for (int z = 0; z < zs; z++) {
                short[] p = new short[W * W];
                for (int i = 0; i < p.length; i++) {
                    p[i] = (short) Math.max(0, Math.round(Math.hypot(800 + 40 * rng.nextGaussian(), 40 * rng.nextGaussian())));
                }
                st.addSlice(new ShortProcessor(W, W, p, null));
            }
        }
        ImagePlus imp = new ImagePlus("bench", st);
        imp.setDimensions(1, zs, T);
        imp.setOpenAsHyperStack(true);
        return imp;
    }

    /** The plain streaming pass, single-threaded. */
    static float[][] streaming(ImagePlus imp, int z) {
        int n = W * W;
        double[] s = new double[n];
        double[] ss = new double[n];
        float[] ctable = imp.getCalibration().getCTable();
        for (int t = 1; t <= T; t++) {
            short[] p = (short[]) imp.getStack().getPixels(imp.getStackIndex(1, z, t));
            for (int i = 0; i < n; i++) {
                int raw = p[i] & 0xffff;
                double v = ctable == null ? raw : ctable[raw];
                s[i] += v;
                ss[i] += v * v;
            }
        }
        float[] mean = new float[n];
        float[] sd = new float[n];
        float[] snr = new float[n];
        for (int i = 0; i < n; i++) {
            double m = s[i] / T;
            double v = Math.max(0, (ss[i] - T * m * m) / (T - 1));
            mean[i] = (float) m;
            sd[i] = (float) Math.sqrt(v);
            snr[i] = (float) (m / sd[i]);
        }
        return new float[][] {mean, sd, snr};
    }

    /**
     * ImageJ's route as a user takes it: Image > Duplicate the frames of one z slice (a hyperstack's
     * frames cannot be Z-projected in place), Z Project average and SD, then Image Calculator divide.
     */
    static ImagePlus imagej(ImagePlus imp, int z) {
        return project(new Duplicator().run(imp, 1, 1, z, z, 1, T));
    }

    /** The same without the duplicate: the frames' arrays put in a stack by reference (ImageJ's best case). */
    static ImagePlus imagejByReference(ImagePlus imp, int z) {
        ImageStack frames = new ImageStack(W, W);
        for (int t = 1; t <= T; t++) {
            frames.addSlice(imp.getStack().getProcessor(imp.getStackIndex(1, z, t)));
        }
        return project(new ImagePlus("frames", frames));
    }

    private static ImagePlus project(ImagePlus sub) {
        ImagePlus avg = ZProjector.run(sub, "avg");
        ImagePlus sd = ZProjector.run(sub, "sd");
        return ImageCalculator.run(avg, sd, "divide create 32-bit");
    }

    static long noisewise(ImagePlus imp, int zs) throws Exception {
        long t0 = System.nanoTime();
        for (int z = 1; z <= zs; z++) {
            RepeatedMaps.compute(imp, z);
        }
        return System.nanoTime() - t0;
    }

    private static double median(long[] v) {
        long[] c = v.clone();
        Arrays.sort(c);
        return c[c.length / 2];
    }

    private static long allocatedByAllThreads() {
        com.sun.management.ThreadMXBean mx = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
        long sum = 0;
        for (long id : mx.getAllThreadIds()) {
            long a = mx.getThreadAllocatedBytes(id);
            sum += Math.max(0, a);
        }
        return sum;
    }

    public static void main(String[] args) throws Exception {
        ImagePlus imp = hyperstack(Z);
        int reps = 7;
        long[] ours = new long[reps];
        long[] plain = new long[reps];
        long[] route = new long[reps];
        long[] byReference = new long[reps];
        // every contender gets the same warm-up (the just-in-time compiler settles after a few full runs)
        for (int warm = 0; warm < 6; warm++) {
            noisewise(imp, Z);
            for (int z = 1; z <= Z; z++) {
                streaming(imp, z);
                imagej(imp, z);
                imagejByReference(imp, z);
            }
        }
        for (int r = 0; r < reps; r++) {
            ours[r] = noisewise(imp, Z);
            long t0 = System.nanoTime();
            for (int z = 1; z <= Z; z++) {
                streaming(imp, z);
            }
            plain[r] = System.nanoTime() - t0;
            t0 = System.nanoTime();
            for (int z = 1; z <= Z; z++) {
                imagej(imp, z);
            }
            route[r] = System.nanoTime() - t0;
            t0 = System.nanoTime();
            for (int z = 1; z <= Z; z++) {
                imagejByReference(imp, z);
            }
            byReference[r] = System.nanoTime() - t0;
        }
        double voxels = (double) W * W * Z * T;
        System.out.printf(Locale.ROOT, "repeated maps from a 16-bit hyperstack %dx%d x %d z x %d repeats (%.2e voxels), "
                        + "%d cores, median of %d:%n", W, W, Z, T, voxels, Runtime.getRuntime().availableProcessors(),
                reps);
        System.out.printf(Locale.ROOT, "  Noisewise RepeatedMaps.compute              %8.1f ms%n", median(ours) / 1e6);
        System.out.printf(Locale.ROOT, "  plain streaming pass, 1 thread              %8.1f ms%n", median(plain) / 1e6);
        System.out.printf(Locale.ROOT, "  ImageJ: Duplicate, Z Project x2, Calculator %8.1f ms%n", median(route) / 1e6);
        System.out.printf(Locale.ROOT, "  ImageJ without the Duplicate (best case)    %8.1f ms%n", median(byReference) / 1e6);
        System.out.printf(Locale.ROOT, "  throughput / streaming pass: %.2f (target >= 0.5)%n", median(plain) / median(ours));
        System.out.printf(Locale.ROOT, "  speed-up over ImageJ's route: %.2f (target >= 3); over its best case: %.2f%n",
                median(route) / median(ours), median(byReference) / median(ours));

        long before = allocatedByAllThreads();
        noisewise(imp, Z);
        long allocated = (allocatedByAllThreads() - before) / Z;
        long maps = 3L * 4 * W * W;
        System.out.printf(Locale.ROOT, "  bytes allocated per z slice over a run / output maps: %.3f (%d / %d; "
                + "target <= 1.1)%n", (double) allocated / maps, allocated, maps);

        ImagePlus half = new ImagePlus("half", imp.getStack());
        half.setDimensions(1, Z / 2, T * 2);
        long[] shortRun = new long[reps];
        long[] longRun = new long[reps];
        ImagePlus twice = hyperstack(Z * 2);
        for (int r = 0; r < reps; r++) {
            shortRun[r] = noisewise(imp, Z);
            longRun[r] = noisewise(twice, Z * 2);
        }
        System.out.printf(Locale.ROOT, "  twice the voxels / the voxels: %.2f (linear: about 2)%n",
                median(longRun) / median(shortRun));

        int k = 100;
        int n = 10000;
        SplittableRandom rng = new SplittableRandom(7);
        short[][] f = new short[k][n];
        for (short[] a : f) {
            for (int i = 0; i < n; i++) {
                a[i] = (short) (30000 + rng.nextInt(5) - 2);
            }
        }
        RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, n, 1, 0, 1, null, null);
        double worst = 0;
        for (int i = 0; i < n; i++) {
            double mean = 0;
            for (short[] a : f) {
                mean += a[i];
            }
            mean /= k;
            double ssd = 0;
            for (short[] a : f) {
                ssd += (a[i] - mean) * (a[i] - mean);
            }
            double sd = Math.sqrt(ssd / (k - 1));
            worst = Math.max(worst, Math.abs(m.sd()[i] - sd) / sd);
        }
        System.out.printf(Locale.ROOT, "  SD map on 30000 +- 2 data, largest relative difference from two passes: %.1e "
                + "(target <= 1e-6)%n", worst);
    }
}
