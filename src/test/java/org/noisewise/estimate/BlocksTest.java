package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Duration;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicIntegerArray;
import org.junit.jupiter.api.Test;

/** The parallel loop every kernel and reader shares: each index once, and failures back in the caller. */
class BlocksTest {

    @Test
    void everyIndexRunsExactlyOnceNestedOrNot() {
        for (int n : new int[] {0, 1, 2, 3, 17, 1000}) {
            AtomicIntegerArray runs = new AtomicIntegerArray(n);
            Blocks.tasks(n, i -> {
                runs.incrementAndGet(i);
                // a nested loop from inside a task (a slice's tiles inside the slices): runs to the end too
                AtomicInteger inner = new AtomicInteger();
                Blocks.tasks(5, k -> inner.incrementAndGet());
                assertEquals(5, inner.get());
            });
            int[] want = new int[n];
            java.util.Arrays.fill(want, 1);
            int[] got = new int[n];
            for (int i = 0; i < n; i++) {
                got[i] = runs.get(i);
            }
            assertArrayEquals(want, got, "n = " + n);
        }
    }

    /**
     * A task's exception, or an error such as a full heap, reaches the caller as it was thrown (the same
     * object), without waiting for ever, and no further task starts once it is seen.
     */
    @Test
    void aFailureIsRethrownInTheCallerAndStopsTheRest() {
        for (Throwable thrown : new Throwable[] {new IllegalStateException("task 3"),
            new OutOfMemoryError("task 3 (a test, not a real full heap)")}) {
            AtomicInteger started = new AtomicInteger();
            Throwable got = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> assertThrows(Throwable.class,
                    () -> Blocks.tasks(2000, i -> {
                        started.incrementAndGet();
                        if (i == 3) {
                            sneakyThrow(thrown);
                        }
                        sleep();
                    })));
            assertSame(thrown, got);
            assertTrue(started.get() < 100, "tasks went on after the failure: " + started.get() + " of 2000 started");
        }
    }

    private static void sleep() {
        try {
            Thread.sleep(2);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    @SuppressWarnings("unchecked")
    private static <T extends Throwable> void sneakyThrow(Throwable t) throws T {
        throw (T) t;
    }
}
