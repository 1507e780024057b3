package org.noisewise.measure;

import ij.ImagePlus;
import java.util.List;
import java.util.stream.IntStream;
import org.noisewise.estimate.InputException;
import org.noisewise.io.Arrangement;
import org.noisewise.io.StackPlanes;
import org.noisewise.report.ResultRow;

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
                    + imp.getStackSize() + (StackPlanes.hasTimeAxis(imp) ? " planes (" + imp.getNSlices()
                    + " z slice(s) x " + imp.getNFrames() + " repeat(s); this method measures one plane at a time)"
                    : " slice(s)") + ", numbered from 1");
        }
        return new int[] {n};
    }

    /**
     * Names each row's z slice and repeat after its stack plane ({@code slice}) when the image is a Z x T
     * series, so a plane says where it sits: a hyperstack's own positions (ImageJ's order, z fastest), or,
     * for a plain stack ImageJ opened from DICOM (File > Import > Image Sequence), the positions its
     * headers give (the plane numbers stay the user's). Other images' planes are their slices and the rows
     * stay as they are; so do a stack's rows when its headers do not make one series of one echo.
     */
    static List<ResultRow> withPositions(List<ResultRow> rows, ImagePlus imp) {
        java.util.function.IntFunction<int[]> position;
        if (StackPlanes.hasTimeAxis(imp)) {
            position = n -> {
                int[] czt = imp.convertIndexToPosition(n);
                return new int[] {czt[1], czt[2]};
            };
        } else if (imp.getStackSize() > 1 && !rows.isEmpty()) {
            ImagePlus view;
            try {
                // a stack of mosaics is refused (its planes are measured as the images they are)
                view = Arrangement.of(imp, null, "", "");
            } catch (InputException e) {
                return rows;
            }
            if (view == imp || view.getNFrames() < 2) {
                return rows;
            }
            position = n -> Arrangement.positionOf(view, n);
        } else {
            return rows;
        }
        for (ResultRow r : rows) {
            if (r.get("slice") instanceof Number n && n.intValue() >= 1 && n.intValue() <= imp.getStackSize()) {
                int[] zt = position.apply(n.intValue());
                if (zt != null) {
                    r.addAfter("slice", "z", "Z slice", zt[0]).addAfter("z", "repeat", "Repeat", zt[1]);
                }
            }
        }
        return rows;
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
