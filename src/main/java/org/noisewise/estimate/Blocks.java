package org.noisewise.estimate;

import java.util.concurrent.ExecutionException;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.ForkJoinTask;
import java.util.concurrent.ForkJoinWorkerThread;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import java.util.function.IntConsumer;

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
    }, Blocks::workerEnded, false, CORES, Math.max(256, CORES), 1, null, 10, TimeUnit.MINUTES);

    /**
     * A worker ended by an error outside any task (a full heap inside the pool's own bookkeeping): the
     * caller waiting for its share reports it ({@link #await}); printing it here would need the memory
     * that ran out, so a full heap is left unprinted.
     */
    private static void workerEnded(Thread t, Throwable e) {
        if (!(e instanceof OutOfMemoryError)) {
            e.printStackTrace();
        }
    }

    private Blocks() {
    }

    /**
     * Runs {@code task(0 .. tasks - 1)} on the calling thread and Noisewise's workers and waits for all
     * of them. Each thread takes the next index until none is left; a task's failure (an exception, or
     * an error such as a full heap) stops the others from starting new ones and is rethrown here, in the
     * caller's thread, as it was thrown, once no task is running any more (so that what they held can be
     * collected before the failure is reported). Failures are kept by the threads themselves, never left
     * to the pool: a full heap while the pool recorded one would end its worker with the work unfinished,
     * and the caller would wait for ever (as happened when a DICOM folder was read with too small a heap).
     */
    public static void tasks(int tasks, IntConsumer task) {
        if (tasks <= 1 || CORES == 1) {
            for (int t = 0; t < tasks; t++) {
                task.accept(t);
            }
            return;
        }
        AtomicInteger next = new AtomicInteger();
        AtomicReference<Throwable> failed = new AtomicReference<>();
        int helpers = Math.min(CORES, tasks) - 1;
        Share[] shares = new Share[helpers];
        for (int k = 0; k < helpers; k++) {
            shares[k] = new Share(next, tasks, failed, task);
            shares[k].submit();
        }
        work(next, tasks, failed, task);
        for (Share share : shares) {
            // a share no worker has started yet has nothing left to do: it is withdrawn, not waited for, and
            // lets go of the work (it may sit in the pool's queue a while)
            if (share.state.compareAndSet(NOT_STARTED, WITHDRAWN)) {
                share.release();
            } else {
                await(share);
            }
        }
        Throwable e = failed.get();
        if (e instanceof RuntimeException r) {
            throw r;
        }
        if (e instanceof Error r) {
            throw r;
        }
    }

    private static final int NOT_STARTED = 0;
    private static final int STARTED = 1;
    private static final int WITHDRAWN = 2;

    /**
     * One worker's part of {@link #tasks}: whether a worker took it up, and which. The pool's task refers
     * to the work only through this object, which lets go of it when the share is done or withdrawn, so a
     * task left in the pool's queue holds nothing of the caller's (the images being read or measured).
     */
    private static final class Share {
        final AtomicInteger state = new AtomicInteger(NOT_STARTED);
        volatile Thread owner;
        ForkJoinTask<?> task;
        private AtomicInteger next;
        private final int tasks;
        private AtomicReference<Throwable> failed;
        private IntConsumer body;

        Share(AtomicInteger next, int tasks, AtomicReference<Throwable> failed, IntConsumer body) {
            this.next = next;
            this.tasks = tasks;
            this.failed = failed;
            this.body = body;
        }

        void submit() {
            task = POOL.submit(this::run);
        }

        private void run() {
            owner = Thread.currentThread();
            if (state.compareAndSet(NOT_STARTED, STARTED)) {
                work(next, tasks, failed, body);
                release();
            }
        }

        void release() {
            next = null;
            failed = null;
            body = null;
        }
    }

    /** Runs the next tasks until none is left or one has failed; keeps the first failure. */
    private static void work(AtomicInteger next, int tasks, AtomicReference<Throwable> failed, IntConsumer task) {
        try {
            for (int i = next.getAndIncrement(); i < tasks && failed.get() == null; i = next.getAndIncrement()) {
                task.accept(i);
            }
        } catch (Throwable e) {
            failed.compareAndSet(null, e);
        }
    }

    /**
     * Waits for a started share (a waiting worker runs queued work meanwhile). Should its worker end
     * without finishing it, which only a full heap inside the pool does, this says so as that error.
     */
    private static void await(Share share) {
        // like join, not cut short by an interrupt (the share would still be running); the interrupt is kept
        boolean interrupted = false;
        while (true) {
            try {
                share.task.get(200, TimeUnit.MILLISECONDS);
                if (interrupted) {
                    Thread.currentThread().interrupt();
                }
                return;
            } catch (TimeoutException e) {
                Thread owner = share.owner;
                if (owner != null && !owner.isAlive() && !share.task.isDone()) {
                    throw new OutOfMemoryError("a Noisewise worker thread ended (the Java heap is full)");
                }
            } catch (InterruptedException e) {
                interrupted = true;
            } catch (ExecutionException e) {
                // the shares keep their tasks' failures; one reaching here is the pool's own
                throw new IllegalStateException(e.getCause());
            }
        }
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

    /** Runs {@code body} over {@code [0, n)}, in parallel when there is more than one block (see {@link #tasks}). */
    public static void forEach(int n, Body body) {
        int blocks = (n + SIZE - 1) / SIZE;
        if (blocks <= 1) {
            body.run(0, n);
            return;
        }
        tasks(blocks, b -> body.run(b * SIZE, Math.min(n, (b + 1) * SIZE)));
    }
}
