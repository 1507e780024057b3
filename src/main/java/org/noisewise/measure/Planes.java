package org.noisewise.measure;

import ij.ImagePlus;
import java.util.stream.IntStream;
import org.noisewise.estimate.InputException;
import org.noisewise.io.StackPlanes;

/**
 * Which planes a measurement covers. Single-plane methods (background, check, correction) count stack
 * planes 1..N; methods over repeats (difference of two frames, repeated acquisitions, stability) count
 * z slices of a hyperstack (1 for a plain stack of repeats).
 */
public final class Planes {

    private Planes() {
    }

    /**
     * The storage step of z slice {@code z}'s frames in calibrated units (0 for continuous values), for
     * the Sheppard correction of the difference and repeated methods' sigma.
     */
    public static double step(ImagePlus imp, int z) throws InputException {
        return org.noisewise.io.BackgroundValues.storage(imp, StackPlanes.index(imp, z, 1)).step();
    }

    /**
     * Refuses two inputs that hold the same pixels (the same file given twice): a comparison of two
     * acquisitions needs two acquisitions.
     */
    public static void requireDifferent(ImagePlus a, String titleA, ImagePlus b, String titleB) throws InputException {
        if (a == b || a.getStackSize() == b.getStackSize() && a.getBitDepth() == b.getBitDepth()
                && samePixels(a, b)) {
            throw new InputException("'" + titleA + "' and '" + titleB + "' hold the same pixels: the same acquisition "
                    + "was given twice; give two different acquisitions");
        }
    }

    private static boolean samePixels(ImagePlus a, ImagePlus b) {
        for (int n = 1; n <= a.getStackSize(); n++) {
            Object pa = a.getStack().getPixels(n);
            Object pb = b.getStack().getPixels(n);
            boolean same = pa instanceof float[] fa && pb instanceof float[] fb ? java.util.Arrays.equals(fa, fb)
                    : pa instanceof short[] sa && pb instanceof short[] sb ? java.util.Arrays.equals(sa, sb)
                    : pa instanceof byte[] ba && pb instanceof byte[] bb && java.util.Arrays.equals(ba, bb);
            if (!same) {
                return false;
            }
        }
        return true;
    }

    /** Every stack plane. */
    public static int[] all(ImagePlus imp) {
        return IntStream.rangeClosed(1, imp.getStackSize()).toArray();
    }

    /** Stack plane {@code n} (1-based), checked. */
    public static int[] one(ImagePlus imp, int n) throws InputException {
        if (n < 1 || n > imp.getStackSize()) {
            throw new InputException("slice " + n + " does not exist: '" + imp.getTitle() + "' has "
                    + imp.getStackSize() + " slice(s), numbered from 1");
        }
        return new int[] {n};
    }

    /** Every z slice (time frames are repeats). */
    public static int[] allZ(ImagePlus imp) {
        return IntStream.rangeClosed(1, StackPlanes.zCount(imp)).toArray();
    }

    /** z slice {@code z} (1-based), checked. */
    public static int[] oneZ(ImagePlus imp, int z) throws InputException {
        int zs = StackPlanes.zCount(imp);
        if (z < 1 || z > zs) {
            throw new InputException("z slice " + z + " does not exist: '" + imp.getTitle() + "' has " + zs
                    + " z slice(s), numbered from 1");
        }
        return new int[] {z};
    }
}
