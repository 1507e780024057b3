package org.noisewise.estimate;

import java.util.Arrays;

/**
 * A named set of pixel indices ({@code y * width + x}) in one image plane. Built by the faces from
 * ImageJ ROIs or from rectangles given on the command line.
 */
public record Region(String name, int[] indices) {

    public Region {
        if (name == null || name.isBlank()) {
            throw new IllegalArgumentException("a region needs a name");
        }
        indices = indices.clone();
    }

    /** The pixel indices of the rectangle {@code (x, y, w, h)}; it must lie inside the image. */
    public static Region rectangle(String name, int x, int y, int w, int h, int width, int height)
            throws InputException {
        if (w <= 0 || h <= 0) {
            throw new InputException("region '" + name + "' is empty (" + w + "x" + h
                    + "): give a width and height of at least 1 pixel");
        }
        if (x < 0 || y < 0 || (long) x + w > width || (long) y + h > height) {
            throw new InputException(outside(name, x, y, w, h, width, height));
        }
        return new Region(name, rectangleIndices(x, y, w, h, width));
    }

    /**
     * The message for a region that does not fit the image: "partly" or "entirely" outside, and what to do.
     */
    public static String outside(String name, int x, int y, int w, int h, int width, int height) {
        boolean entirely = x >= width || y >= height || (long) x + w <= 0 || (long) y + h <= 0;
        return "region '" + name + "' (x=" + x + ", y=" + y + ", w=" + w + ", h=" + h + ") lies "
                + (entirely ? "entirely" : "partly") + " outside the " + width + "x" + height + " image: "
                + (entirely ? "move it onto the image" : "move or shrink it so that it fits");
    }

    /** The pixel indices of the ellipse inscribed in {@code (x, y, w, h)} (pixel centres inside). */
    public static Region oval(String name, int x, int y, int w, int h, int width, int height)
            throws InputException {
        Region box = rectangle(name, x, y, w, h, width, height);
        double cx = x + w / 2.0;
        double cy = y + h / 2.0;
        double rx = w / 2.0;
        double ry = h / 2.0;
        int[] idx = Arrays.stream(box.indices).filter(i -> {
            double dx = (i % width + 0.5 - cx) / rx;
            double dy = (i / width + 0.5 - cy) / ry;
            return dx * dx + dy * dy <= 1.0;
        }).toArray();
        if (idx.length == 0) {
            throw new InputException("oval region '" + name + "' contains no pixel centre: make it larger");
        }
        return new Region(name, idx);
    }

    public int size() {
        return indices.length;
    }

    /** The centroid {@code (x, y)} of the pixel centres (at +0.5) in a plane {@code width} pixels wide. */
    public double[] centroid(int width) {
        double sx = 0;
        double sy = 0;
        for (int i : indices) {
            sx += i % width + 0.5;
            sy += i / width + 0.5;
        }
        return new double[] {sx / indices.length, sy / indices.length};
    }

    /**
     * The indices of the rectangle {@code (x, y, w, h)}, row by row, in a plane {@code width} pixels wide
     * (the caller has checked that it fits).
     */
    public static int[] rectangleIndices(int x, int y, int w, int h, int width) {
        int[] idx = new int[w * h];
        int k = 0;
        for (int yy = y; yy < y + h; yy++) {
            for (int xx = x; xx < x + w; xx++) {
                idx[k++] = yy * width + xx;
            }
        }
        return idx;
    }

    @Override
    public int[] indices() {
        return indices.clone();
    }

    /**
     * The region's values in {@code pixels}. Checks that the region is non-empty, inside the image
     * and free of NaN or infinite values.
     */
    public double[] values(float[] pixels) throws InputException {
        if (indices.length == 0) {
            throw new InputException("region '" + name + "' contains no pixels: draw a larger region");
        }
        double[] v = new double[indices.length];
        int bad = 0;
        for (int k = 0; k < indices.length; k++) {
            int i = indices[k];
            if (i < 0 || i >= pixels.length) {
                throw new InputException("region '" + name + "' reaches outside the image: move it inside");
            }
            v[k] = pixels[i];
            if (!Double.isFinite(v[k])) {
                bad++;
            }
        }
        if (bad > 0) {
            throw new InputException("region '" + name + "' holds " + bad
                    + " NaN or infinite pixel(s): move it off masked or invalid pixels");
        }
        return v;
    }

    /**
     * The values of several regions pooled into one array, each checked as by {@link #values}; at
     * least two pixels, not signed ({@link SignedValues}: a magnitude image has no negative values).
     */
    public static double[] pooledMagnitudes(float[] pixels, java.util.List<Region> regions) throws InputException {
        int total = 0;
        double[][] parts = new double[regions.size()][];
        for (int i = 0; i < regions.size(); i++) {
            parts[i] = regions.get(i).values(pixels);
            total += parts[i].length;
        }
        if (total < 2) {
            throw new InputException("the background regions hold " + total + " pixel: draw larger regions");
        }
        double[] out = new double[total];
        int k = 0;
        for (double[] part : parts) {
            System.arraycopy(part, 0, out, k, part.length);
            k += part.length;
        }
        SignedValues.requireMagnitude(out, "the background regions", "every background method");
        return out;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Region r && r.name.equals(name) && Arrays.equals(r.indices, indices);
    }

    @Override
    public int hashCode() {
        return 31 * name.hashCode() + Arrays.hashCode(indices);
    }

    @Override
    public String toString() {
        return "Region[" + name + ", " + indices.length + " px]";
    }
}
