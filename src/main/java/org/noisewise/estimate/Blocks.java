package org.noisewise.estimate;

import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.ForkJoinWorkerThread;
import java.util.concurrent.TimeUnit;
import java.util.function.IntConsumer;
import java.util.stream.IntStream;

/**
 * Runs a loop over {@code [0, n)} in contiguous blocks on every core. Each block is a plain loop the
 * JIT can unroll, so per-element lambdas and boxing never appear in the hot path.
 */
public final class Blocks {

    /** Elements per block: large enough to amortise the task, small enough to balance the cores. */
    static final int SIZE = 1 << 16;

    private static final int CORES = Runtime.getRuntime().availableProcessors();

    /**
     * Noisewise's own workers (daemon threads, one per core, kept for ten idle minutes): unlike the
     * common pool's, they keep their per-thread scratch between calls, so a kernel that reuses scratch
     * allocates only its results.
     */
    private static final ForkJoinPool POOL = new ForkJoinPool(CORES, pool -> {
        ForkJoinWorkerThread t = ForkJoinPool.defaultForkJoinWorkerThreadFactory.newThread(pool);
        t.setDaemon(true);
        t.setName("noisewise-worker-" + t.getPoolIndex());
        return t;
    }, null, false, CORES, Math.max(256, CORES), 1, null, 10, TimeUnit.MINUTES);

    private Blocks() {
    }

    /** Runs {@code task(0 .. tasks - 1)} on Noisewise's workers and waits for all of them. */
    public static void tasks(int tasks, IntConsumer task) {
        if (tasks <= 1 || CORES == 1) {
            for (int t = 0; t < tasks; t++) {
                task.accept(t);
            }
            return;
        }
        POOL.submit(() -> IntStream.range(0, tasks).parallel().forEach(task)).join();
    }

    /**
     * Padding between scratch arrays, in 8-byte elements: 656 bytes with the array header, so arrays
     * allocated one after another start at different offsets within a 4 KB page.
     */
    static final int STAGGER = 80;

    /**
     * {@code count} scratch arrays of at least {@code length} elements each, allocated one after the
     * other with their lengths staggered so that element {@code j} of each lies at a different offset
     * within a 4 KB page. Arrays of equal power-of-two size allocated together would put element
     * {@code j} of every one at the same offset, and a kernel that reads one and stores another at
     * the same index stalls on the processor's false store-to-load matches (4K aliasing): the
     * stability sums of a 64 x 64 x 198-frame slice measured 8-15% faster with staggered arrays.
     */
    public static long[][] staggeredLongs(int count, int length) {
        long[][] out = new long[count][];
        for (int i = 0; i < count; i++) {
            out[i] = new long[length + STAGGER * (i + 1)];
        }
        return out;
    }

    /** As {@link #staggeredLongs}, for doubles. */
    public static double[][] staggeredDoubles(int count, int length) {
        double[][] out = new double[count][];
        for (int i = 0; i < count; i++) {
            out[i] = new double[length + STAGGER * (i + 1)];
        }
        return out;
    }

    /** The body of one block, {@code [from, to)}. */
    @FunctionalInterface
    public interface Body {
        void run(int from, int to);
    }

    /** Runs {@code body} over {@code [0, n)}, in parallel when there is more than one block. */
    public static void forEach(int n, Body body) {
        int blocks = (n + SIZE - 1) / SIZE;
        if (blocks <= 1) {
            body.run(0, n);
            return;
        }
        IntStream.range(0, blocks).parallel().forEach(b -> body.run(b * SIZE, Math.min(n, (b + 1) * SIZE)));
    }
}
