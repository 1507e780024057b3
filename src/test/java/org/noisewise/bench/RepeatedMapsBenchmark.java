package org.noisewise.bench;

import java.lang.management.ManagementFactory;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.concurrent.ForkJoinPool;
import org.noisewise.estimate.RepeatedAcquisitions;

/**
 * Benchmark (not a test): the repeated-acquisition maps on a 256 x 256 x 64 stack, measured in one
 * run on this machine and printed as ratios:
 * <ul>
 *   <li>speed-up of the parallel maps over the same code confined to one worker thread (target:
 *       close to the number of cores);</li>
 *   <li>bytes allocated by one single-threaded run over the bytes of the three output maps (target:
 *       about 1, i.e. no per-pixel allocation).</li>
 * </ul>
 * Run: {@code docs/run-benchmarks.sh}.
 */
public final class RepeatedMapsBenchmark {

    private RepeatedMapsBenchmark() {
    }

    public static void main(String[] args) throws Exception {
        int w = 256;
        int h = 256;
        int k = 64;
        SplittableRandom rng = new SplittableRandom(1);
        float[][] frames = new float[k][w * h];
        for (float[] f : frames) {
            for (int i = 0; i < f.length; i++) {
                f[i] = (float) Math.hypot(50 + 5 * rng.nextGaussian(), 5 * rng.nextGaussian());
            }
        }
        ForkJoinPool one = new ForkJoinPool(1);
        for (int warm = 0; warm < 5; warm++) {
            RepeatedAcquisitions.maps(frames, w, h, null);
            one.submit(() -> RepeatedAcquisitions.maps(frames, w, h, null)).get();
        }
        int reps = 10;
        long t0 = System.nanoTime();
        for (int r = 0; r < reps; r++) {
            one.submit(() -> RepeatedAcquisitions.maps(frames, w, h, null)).get();
        }
        long single = System.nanoTime() - t0;
        t0 = System.nanoTime();
        for (int r = 0; r < reps; r++) {
            RepeatedAcquisitions.maps(frames, w, h, null);
        }
        long parallel = System.nanoTime() - t0;

        com.sun.management.ThreadMXBean mx = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
        long allocated = one.submit(() -> {
            long id = Thread.currentThread().getId();
            long before = mx.getThreadAllocatedBytes(id);
            RepeatedAcquisitions.maps(frames, w, h, null);
            return mx.getThreadAllocatedBytes(id) - before;
        }).get();
        long outputBytes = 3L * 4 * w * h;
        System.out.printf(Locale.ROOT, "repeated maps, %dx%dx%d, %d cores: single %.1f ms, parallel %.1f ms, "
                        + "speed-up %.2fx%n", w, h, k, Runtime.getRuntime().availableProcessors(), single / 1e6 / reps,
                parallel / 1e6 / reps, (double) single / parallel);
        System.out.printf(Locale.ROOT, "allocated by one single-threaded run / output maps: %.3f (%d / %d bytes)%n",
                (double) allocated / outputBytes, allocated, outputBytes);
        one.shutdown();
    }
}
