package org.noisewise.cli;

import ij.ImagePlus;
import java.util.stream.IntStream;
import org.noisewise.estimate.InputException;

/** Which slices of an image a command measures. */
final class Slices {

    private Slices() {
    }

    /** The 1-based slice asked for, or every slice when none was. */
    static int[] select(ImagePlus imp, Integer slice) throws InputException {
        int size = imp.getStackSize();
        if (slice == null) {
            return IntStream.rangeClosed(1, size).toArray();
        }
        if (slice < 1 || slice > size) {
            throw new InputException("--slice " + slice + " does not exist: the image has " + size
                    + " slice(s), numbered from 1");
        }
        return new int[] {slice};
    }
}
