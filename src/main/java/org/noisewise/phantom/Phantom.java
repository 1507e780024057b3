package org.noisewise.phantom;

/**
 * A phantom found on a slice: its pixel mask, centroid, fitted ellipse (or rectangle) and bounding box.
 *
 * @param mask        true inside the phantom (the largest connected component above threshold)
 * @param area        pixels in the mask
 * @param cx          centroid x (pixel coordinates, pixel centres at +0.5)
 * @param cy          centroid y
 * @param semiX       half-width of the fitted shape along x
 * @param semiY       half-height along y
 * @param rectangular true when the object fills its bounding box like a rectangle rather than an ellipse
 * @param minX        bounding box, inclusive pixel indices
 * @param minY        bounding box
 * @param maxX        bounding box
 * @param maxY        bounding box
 * @param tiltDegrees angle of the principal axis from the x axis (second moments; meaningless for a disk)
 * @param elongation  ratio of the principal axes' extents (1 for a disk or a square)
 */
public record Phantom(boolean[] mask, int area, double cx, double cy, double semiX, double semiY, boolean rectangular,
                      int minX, int minY, int maxX, int maxY, double tiltDegrees, double elongation) {

    public Phantom {
        mask = mask.clone();
    }

    @Override
    public boolean[] mask() {
        return mask.clone();
    }

    boolean inside(int index) {
        return mask[index];
    }
}
