package org.noisewise.imagej;

import ij.IJ;
import ij.Macro;
import org.noisewise.measure.Memory;

/** How the commands report an unexpected failure: one message, no stack trace. */
final class Errors {

    private Errors() {
    }

    /** Reports {@code e}; ImageJ's own macro cancellation passes through untouched. */
    static void unexpected(String title, RuntimeException e) {
        if (Macro.MACRO_CANCELED.equals(e.getMessage())) {
            throw e;
        }
        IJ.error(title, "Noisewise could not finish (" + e.getClass().getSimpleName()
                + (e.getMessage() == null ? "" : ": " + e.getMessage()) + "). Nothing was changed. Please report it "
                + "with the image type, size and regions used.");
    }

    /** Reports that the Java heap ran out, and what to do; nothing of the user's was changed. */
    static void outOfMemory(String title) {
        IJ.error(title, "Noisewise ran out of memory (" + Memory.heapText() + "). Nothing was changed. Give ImageJ more "
                + "memory (Edit > Options > Memory & Threads), or measure fewer slices or a cropped copy of the image.");
    }
}
