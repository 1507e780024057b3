package org.noisewise.phantom;

import java.util.Locale;
import org.noisewise.estimate.InputException;

/**
 * Finds a uniform phantom on a slice: pixels above a threshold (chosen by the caller, e.g. with one
 * of ImageJ's auto-threshold methods), the largest 4-connected component, holes filled, then a
 * shape fitted from the component's second moments (an ellipse, or a rectangle when the object
 * fills at least 90% of its bounding box), with its axes along the image axes; the tilt of the
 * principal axis is kept, and placement warns when a visibly elongated phantom is tilted.
 *
 * <p>Clear failures: no object above the threshold, an object touching the image edge, or a second
 * object larger than 10% of the first.
 */
public final class PhantomFinder {

    /** A second component larger than this fraction of the largest means more than one object. */
    public static final double SECOND_OBJECT = 0.10;
    /** Components smaller than this (pixels) are noise, not objects. */
    public static final int MIN_PIXELS = 50;

    private PhantomFinder() {
    }

    public static Phantom find(float[] pixels, int width, int height, double threshold) throws InputException {
        int n = width * height;
        int[] label = new int[n];
        int[] sizes = new int[16];
        int labels = 0;
        Fill fill = new Fill(width, height);
        for (int i = 0; i < n; i++) {
            if (label[i] != 0 || !(pixels[i] > threshold)) {
                continue;
            }
            labels++;
            if (labels >= sizes.length) {
                sizes = java.util.Arrays.copyOf(sizes, sizes.length * 2);
            }
            int l = labels;
            sizes[labels] = fill.run(i, q -> label[q] == 0 && pixels[q] > threshold, q -> label[q] = l);
        }
        int best = 0;
        int second = 0;
        for (int l = 1; l <= labels; l++) {
            if (sizes[l] > sizes[best]) {
                second = best;
                best = l;
            } else if (sizes[l] > sizes[second]) {
                second = l;
            }
        }
        if (best == 0 || sizes[best] < MIN_PIXELS) {
            throw new InputException(String.format(Locale.ROOT, "no phantom found above the threshold %.4g: check "
                    + "that the slice shows the phantom, or place the regions by hand", threshold));
        }
        if (labels > 20 && sizes[best] < 0.02 * n) {
            throw new InputException(String.format(Locale.ROOT, "no phantom found: %d small specks above the threshold "
                    + "%.4g (the largest %d pixels) look like noise, not an object; check that the slice shows the "
                    + "phantom, or place the regions by hand", labels, threshold, sizes[best]));
        }
        if (second != 0 && sizes[second] >= MIN_PIXELS && sizes[second] > SECOND_OBJECT * sizes[best]) {
            throw new InputException(String.format(Locale.ROOT, "more than one object on the slice (%d and %d pixels): "
                    + "the QA expects one uniform phantom; crop the image or place the regions by hand",
                    sizes[best], sizes[second]));
        }
        boolean[] mask = fillHoles(label, best, width, height);
        int area = 0;
        double sx = 0;
        double sy = 0;
        int minX = width;
        int minY = height;
        int maxX = -1;
        int maxY = -1;
        for (int i = 0; i < n; i++) {
            if (mask[i]) {
                int x = i % width;
                int y = i / width;
                area++;
                sx += x + 0.5;
                sy += y + 0.5;
                minX = Math.min(minX, x);
                maxX = Math.max(maxX, x);
                minY = Math.min(minY, y);
                maxY = Math.max(maxY, y);
            }
        }
        if (minX == 0 || minY == 0 || maxX == width - 1 || maxY == height - 1) {
            throw new InputException("the phantom touches the image edge: it is cut off or the field of view is too "
                    + "small for automatic regions; re-centre the phantom or place the regions by hand");
        }
        double cx = sx / area;
        double cy = sy / area;
        double mxx = 0;
        double myy = 0;
        double mxy = 0;
        for (int i = 0; i < n; i++) {
            if (mask[i]) {
                double dx = i % width + 0.5 - cx;
                double dy = i / width + 0.5 - cy;
                mxx += dx * dx;
                myy += dy * dy;
                mxy += dx * dy;
            }
        }
        mxx /= area;
        myy /= area;
        mxy /= area;
        // orientation of the principal axis from the second moments (0 = along x); image y points down
        double tilt = Math.toDegrees(0.5 * Math.atan2(2 * mxy, mxx - myy));
        double spread = Math.sqrt(0.25 * (mxx - myy) * (mxx - myy) + mxy * mxy);
        double elongation = Math.sqrt((0.5 * (mxx + myy) + spread) / Math.max(1e-12, 0.5 * (mxx + myy) - spread));
        int boxW = maxX - minX + 1;
        int boxH = maxY - minY + 1;
        boolean rectangular = area >= 0.9 * boxW * boxH;
        // second moment of a uniform ellipse about its axis is a^2/4; of a rectangle of half-width a, a^2/3
        double k = rectangular ? 3.0 : 4.0;
        return new Phantom(mask, area, cx, cy, Math.sqrt(k * mxx), Math.sqrt(k * myy), rectangular, minX, minY, maxX, maxY,
                tilt, elongation);
    }

    /** The component with holes filled: everything not reachable from the border through non-component pixels. */
    private static boolean[] fillHoles(int[] label, int keep, int width, int height) {
        int n = width * height;
        boolean[] outside = new boolean[n];
        Fill fill = new Fill(width, height);
        Fill.Test open = q -> !outside[q] && label[q] != keep;
        Fill.Mark mark = q -> outside[q] = true;
        for (int x = 0; x < width; x++) {
            fill.run(x, open, mark);
            fill.run((height - 1) * width + x, open, mark);
        }
        for (int y = 0; y < height; y++) {
            fill.run(y * width, open, mark);
            fill.run(y * width + width - 1, open, mark);
        }
        boolean[] mask = new boolean[n];
        for (int i = 0; i < n; i++) {
            mask[i] = !outside[i];
        }
        return mask;
    }

    /**
     * 4-connected scanline flood fill: each popped seed is extended to its whole run along the row,
     * the run marked, and one seed pushed per open run in the rows above and below (a stack of pixel
     * indices, no boxing; memory grows with the outline, not the area).
     */
    private static final class Fill {
        interface Test {
            boolean open(int index);
        }

        interface Mark {
            void mark(int index);
        }

        private final int width;
        private final int height;
        private int[] stack = new int[1024];
        private int size;

        Fill(int width, int height) {
            this.width = width;
            this.height = height;
        }

        /** Fills from {@code seed}; the number of pixels marked (0 when the seed is not open). */
        int run(int seed, Test test, Mark mark) {
            if (!test.open(seed)) {
                return 0;
            }
            int count = 0;
            size = 0;
            push(seed);
            while (size > 0) {
                int p = stack[--size];
                if (!test.open(p)) {
                    continue;
                }
                int y = p / width;
                int row = y * width;
                int xl = p - row;
                int xr = xl;
                while (xl > 0 && test.open(row + xl - 1)) {
                    xl--;
                }
                while (xr < width - 1 && test.open(row + xr + 1)) {
                    xr++;
                }
                for (int x = xl; x <= xr; x++) {
                    mark.mark(row + x);
                }
                count += xr - xl + 1;
                if (y > 0) {
                    seeds(row - width, xl, xr, test);
                }
                if (y < height - 1) {
                    seeds(row + width, xl, xr, test);
                }
            }
            return count;
        }

        private void seeds(int row, int xl, int xr, Test test) {
            boolean inRun = false;
            for (int x = xl; x <= xr; x++) {
                boolean o = test.open(row + x);
                if (o && !inRun) {
                    push(row + x);
                }
                inRun = o;
            }
        }

        private void push(int v) {
            if (size == stack.length) {
                stack = java.util.Arrays.copyOf(stack, stack.length * 2);
            }
            stack[size++] = v;
        }
    }
}
