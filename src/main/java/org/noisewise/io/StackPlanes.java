package org.noisewise.io;

import ij.ImagePlus;
import org.noisewise.estimate.InputException;

/**
 * Picks planes out of stacks and hyperstacks. Repeats and acquisition pairs are the time frames of
 * a hyperstack (one z slice at a time), or the slices of a plain stack when it has no time axis.
 */
public final class StackPlanes {

    private StackPlanes() {
    }

    /**
     * True when repeats lie along a time axis: a hyperstack's time frames, or a series whose Z x T
     * layout was read from its headers (then even a single repeat per slice is known as such).
     */
    public static boolean hasTimeAxis(ImagePlus imp) {
        return imp.getNFrames() > 1 || Arrangement.known(imp);
    }

    /** Number of z positions to treat separately (1 for a plain stack of repeats). */
    public static int zCount(ImagePlus imp) {
        return hasTimeAxis(imp) ? imp.getNSlices() : 1;
    }

    /** Number of repeats: time frames, or stack slices without a time axis. */
    public static int repeatCount(ImagePlus imp) {
        return hasTimeAxis(imp) ? imp.getNFrames() : imp.getStackSize();
    }

    /** The 1-based stack index of repeat {@code t} at z position {@code z} (channel 1). */
    public static int index(ImagePlus imp, int z, int t) throws InputException {
        int k = repeatCount(imp);
        if (t < 1 || t > k) {
            throw new InputException("frame " + t + " does not exist: '" + imp.getTitle() + "' has " + k
                    + (hasTimeAxis(imp) ? " time points" : " slices") + ", numbered from 1");
        }
        if (hasTimeAxis(imp)) {
            if (z < 1 || z > imp.getNSlices()) {
                throw new InputException("slice " + z + " does not exist: '" + imp.getTitle() + "' has "
                        + imp.getNSlices() + " z slices");
            }
            return imp.getStackIndex(1, z, t);
        }
        return t;
    }

    /** All repeats at z position {@code z}, as calibrated planes. */
    public static float[][] repeats(ImagePlus imp, int z) throws InputException {
        int k = repeatCount(imp);
        float[][] frames = new float[k][];
        for (int t = 1; t <= k; t++) {
            frames[t - 1] = ImagePlanes.calibratedPixels(imp, index(imp, z, t));
        }
        return frames;
    }
}
