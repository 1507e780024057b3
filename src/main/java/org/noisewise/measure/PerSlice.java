package org.noisewise.measure;

import ij.ImagePlus;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;
import org.noisewise.estimate.Blocks;
import org.noisewise.estimate.InputException;

/**
 * The per-slice work of a measurement over several z slices, one slice per task on Noisewise's
 * workers, the results in slice order. Each slice's work reads the shared image and writes only its
 * own results, so the slices are independent; an error is the one the first failing slice (in slice
 * order) gives, as a loop over the slices would have thrown it. A single slice runs on the calling
 * thread with the whole progress range, so its own progress shows; several report how many slices are
 * done. The slices of a virtual stack (planes read from disk on demand) run one after another.
 */
final class PerSlice {

    private PerSlice() {
    }

    /** One slice's work: {@code index} into the slices asked for, {@code z} the 1-based slice. */
    @FunctionalInterface
    interface Work<T> {
        T run(int index, int z, Progress part) throws InputException;
    }

    /**
     * @param label what the progress line says is being done, e.g. "Repeated acquisitions"
     */
    static <T> List<T> run(ImagePlus imp, int[] zs, Progress progress, String label, Work<T> work)
            throws InputException {
        if (zs.length == 1 || imp.getStack().isVirtual()) {
            // a virtual stack reads its planes from disk on demand: one slice at a time
            List<T> out = new ArrayList<>(zs.length);
            for (int i = 0; i < zs.length; i++) {
                out.add(work.run(i, zs[i], progress.part((double) i / zs.length, (i + 1.0) / zs.length)));
            }
            return out;
        }
        if (imp.getCalibration().calibrated()) {
            imp.getCalibration().getCTable(); // made once here, not by several slices at a time
        }
        Object[] results = new Object[zs.length];
        InputException[] failed = new InputException[zs.length];
        AtomicInteger done = new AtomicInteger();
        Object lock = new Object();
        Blocks.tasks(zs.length, i -> {
            try {
                results[i] = work.run(i, zs[i], Progress.NONE);
            } catch (InputException e) {
                failed[i] = e;
            }
            int d = done.incrementAndGet();
            synchronized (lock) {
                progress.report((double) d / zs.length, label + ": " + d + " of " + zs.length + " z slices");
            }
        });
        for (InputException e : failed) {
            if (e != null) {
                throw e;
            }
        }
        List<T> out = new ArrayList<>(zs.length);
        for (Object r : results) {
            @SuppressWarnings("unchecked")
            T t = (T) r;
            out.add(t);
        }
        return out;
    }
}
