package org.noisewise.imagej;

import ij.IJ;
import ij.ImagePlus;
import ij.Macro;
import org.noisewise.estimate.InputException;
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

    /** An input error's message with its remedy in Fiji's words. */
    static String text(InputException e) {
        return e.remedy() == InputException.Remedy.REPLACE
                ? e.getMessage() + ", or tick Replace existing files in the dialog to replace it" : e.getMessage();
    }

    /** A command's body on the current image. */
    interface Body {
        void run(ImagePlus imp) throws InputException;
    }

    /**
     * Runs {@code body} on the current image (an error dialog when there is none); an input error becomes
     * one message in Fiji's words, anything unexpected or a full heap one message too, never a stack trace.
     */
    static void guard(String title, Body body) {
        ImagePlus imp = Face.currentImage(title);
        if (imp == null) {
            return;
        }
        try {
            body.run(imp);
        } catch (InputException e) {
            IJ.error(title, text(e));
        } catch (RuntimeException e) {
            unexpected(title, e);
        } catch (OutOfMemoryError e) {
            outOfMemory(title);
        }
    }
}
