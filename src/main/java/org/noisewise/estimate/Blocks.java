package org.noisewise.estimate;

import java.util.stream.IntStream;

/**
 * Runs a loop over {@code [0, n)} in contiguous blocks on every core. Each block is a plain loop the
 * JIT can unroll, so per-element lambdas and boxing never appear in the hot path.
 */
public final class Blocks {

    /** Elements per block: large enough to amortise the task, small enough to balance the cores. */
    static final int SIZE = 1 << 16;

    private Blocks() {
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
