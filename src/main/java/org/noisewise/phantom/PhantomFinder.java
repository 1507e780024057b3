package org.noisewise.phantom;

import java.util.ArrayDeque;
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
        ArrayDeque<Integer> queue = new ArrayDeque<>();
        for (int i = 0; i < n; i++) {
            if (label[i] != 0 || !(pixels[i] > threshold)) {
                continue;
            }
            labels++;
            if (labels >= sizes.length) {
                sizes = java.util.Arrays.copyOf(sizes, sizes.length * 2);
            }
            label[i] = labels;
            queue.add(i);
            int size = 0;
            while (!queue.isEmpty()) {
                int p = queue.poll();
                size++;
                int x = p % width;
                int y = p / width;
                if (x > 0) {
                    visit(p - 1, pixels, threshold, label, labels, queue);
                }
                if (x < width - 1) {
                    visit(p + 1, pixels, threshold, label, labels, queue);
                }
                if (y > 0) {
                    visit(p - width, pixels, threshold, label, labels, queue);
                }
                if (y < height - 1) {
                    visit(p + width, pixels, threshold, label, labels, queue);
                }
            }
            sizes[labels] = size;
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

    private static void visit(int q, float[] pixels, double threshold, int[] label, int l, ArrayDeque<Integer> queue) {
        if (label[q] == 0 && pixels[q] > threshold) {
            label[q] = l;
            queue.add(q);
        }
    }

    /** The component with holes filled: everything not reachable from the border through non-component pixels. */
    private static boolean[] fillHoles(int[] label, int keep, int width, int height) {
        int n = width * height;
        boolean[] outside = new boolean[n];
        ArrayDeque<Integer> queue = new ArrayDeque<>();
        for (int i = 0; i < n; i++) {
            int x = i % width;
            int y = i / width;
            if ((x == 0 || y == 0 || x == width - 1 || y == height - 1) && label[i] != keep) {
                outside[i] = true;
                queue.add(i);
            }
        }
        while (!queue.isEmpty()) {
            int p = queue.poll();
            int x = p % width;
            int y = p / width;
            int[] nb = {x > 0 ? p - 1 : -1, x < width - 1 ? p + 1 : -1, y > 0 ? p - width : -1,
                y < height - 1 ? p + width : -1};
            for (int q : nb) {
                if (q >= 0 && !outside[q] && label[q] != keep) {
                    outside[q] = true;
                    queue.add(q);
                }
            }
        }
        boolean[] mask = new boolean[n];
        for (int i = 0; i < n; i++) {
            mask[i] = !outside[i];
        }
        return mask;
    }
}
