package org.noisewise.cli;

import ij.ImagePlus;
import org.noisewise.estimate.InputException;
import org.noisewise.measure.Planes;

/** {@code --slice N}: which planes a command measures (every one when none is given). */
final class Slices {

    private Slices() {
    }

    /** Stack planes: the one asked for, or every plane. */
    static int[] select(ImagePlus imp, Integer slice) throws InputException {
        return slice == null ? Planes.all(imp) : Planes.one(imp, slice);
    }

    /** z slices of a hyperstack (1 for a plain stack of repeats): the one asked for, or every one. */
    static int[] selectZ(ImagePlus imp, Integer slice) throws InputException {
        return slice == null ? Planes.allZ(imp) : Planes.oneZ(imp, slice);
    }
}
