package org.noisewise.io;

import org.noisewise.estimate.InputException;

/**
 * A Siemens mosaic: the slices of one volume tiled row by row, in their stored order, in one image of
 * {@code grid x grid} tiles, where {@code grid = ceil(sqrt(slices))} and the tiles past the last slice
 * are empty. Image Type (0008,0008) says MOSAIC and the private Number of Images in Mosaic (0019,100A)
 * says how many slices it holds.
 *
 * @param slices     the number of slices tiled
 * @param grid       tiles a side
 * @param tileWidth  columns of one slice
 * @param tileHeight rows of one slice
 */
public record Mosaic(int slices, int grid, int tileWidth, int tileHeight) {

    /**
     * The mosaic of an image of {@code columns x rows} pixels that Image Type calls a mosaic of
     * {@code slices} slices; null when those pixels cannot hold them in the square grid (not a mosaic as
     * Siemens writes it, e.g. an image cut out of one that kept the Image Type): it is then read as the
     * one image it is, and {@link #notCut} says so.
     *
     * @param where names the image in messages
     */
    public static Mosaic of(Integer slices, int columns, int rows, String where) throws InputException {
        if (slices == null || slices < 1) {
            throw new InputException("'" + where + "' is a Siemens mosaic (Image Type MOSAIC, 0008,0008) that does not "
                    + "say how many slices it tiles (the private Number of Images in Mosaic, 0019,100A, is missing, "
                    + "perhaps removed by anonymisation): export the series again with its private elements, or as "
                    + "one image per slice");
        }
        int grid = (int) Math.ceil(Math.sqrt(slices));
        if (columns % grid != 0 || rows % grid != 0) {
            return null;
        }
        return new Mosaic(slices, grid, columns / grid, rows / grid);
    }

    /** True when an Image Type (0008,0008) value names the image a MOSAIC. */
    static boolean named(String imageType) {
        if (imageType == null) {
            return false;
        }
        for (String v : imageType.split("\\\\")) {
            if (v.trim().equals("MOSAIC")) {
                return true;
            }
        }
        return false;
    }

    /**
     * The step between a mosaic's slices along the normal: Spacing Between Slices (0018,0088), else the
     * slice thickness (0018,0050), else 1 mm.
     */
    static double step(Double thickness, Double spacingBetween) {
        return spacingBetween != null && spacingBetween > 0 ? spacingBetween
                : thickness != null && thickness > 0 ? thickness : 1.0;
    }

    /** The words for a note when an image Image Type calls a mosaic cannot be one. */
    static String notCut(Integer slices, int columns, int rows) {
        int grid = (int) Math.ceil(Math.sqrt(slices));
        return "Image Type (0008,0008) says MOSAIC, but " + columns + " x " + rows + " pixels cannot hold " + slices
                + " slices in " + grid + " x " + grid + " tiles, so each image was read as one slice";
    }

    /** The mosaic of a DICOM file that Image Type calls a mosaic, or null for any other file. */
    static Mosaic of(DicomFile f) throws InputException {
        if (!f.mosaicType()) {
            return null;
        }
        if (f.frames().size() != 1) {
            throw new InputException("'" + f.path().getFileName() + "' is called a mosaic (Image Type MOSAIC, 0008,0008) "
                    + "but holds " + f.frames().size() + " frames, a form Noisewise does not read: export the series "
                    + "again as one image per slice");
        }
        return of(f.mosaicSlices(), f.columns(), f.rows(), f.path().getFileName().toString());
    }

    /** A copy of slice {@code k}'s tile (0-based) of a mosaic plane (byte[], short[] or float[]). */
    public Object tile(Object mosaic, int k) {
        int mw = grid * tileWidth;
        int from = k / grid * tileHeight * mw + k % grid * tileWidth;
        Object out = mosaic instanceof short[] ? new short[tileWidth * tileHeight]
                : mosaic instanceof byte[] ? new byte[tileWidth * tileHeight] : new float[tileWidth * tileHeight];
        for (int y = 0; y < tileHeight; y++) {
            System.arraycopy(mosaic, from + y * mw, out, y * tileWidth, tileWidth);
        }
        return out;
    }

    /**
     * Where slice {@code k} lies: the mosaic's position moved {@code k} steps of {@code stepMm} along the
     * slice normal of {@code orientation}, so the slices are ordered as stored (the in-plane offset of
     * the tile does not change where it lies along the normal).
     */
    static double[] position(double[] mosaicPosition, double[] orientation, int k, double stepMm) {
        double[] r = {orientation[0], orientation[1], orientation[2]};
        double[] c = {orientation[3], orientation[4], orientation[5]};
        double[] n = {r[1] * c[2] - r[2] * c[1], r[2] * c[0] - r[0] * c[2], r[0] * c[1] - r[1] * c[0]};
        double norm = Math.sqrt(n[0] * n[0] + n[1] * n[1] + n[2] * n[2]);
        if (norm > 0) {
            // direction cosines are stored rounded: steps of exactly stepMm
            n = new double[] {n[0] / norm, n[1] / norm, n[2] / norm};
        }
        return new double[] {mosaicPosition[0] + k * stepMm * n[0], mosaicPosition[1] + k * stepMm * n[1],
                mosaicPosition[2] + k * stepMm * n[2]};
    }

    /** An arrangement note with the slices said to be placed from the mosaics' tiles rather than from positions. */
    String placed(String layoutNote) {
        return layoutNote.replace(SeriesLayout.BY_POSITION, "the tiles of each Siemens mosaic (" + slices + " slices in "
                + grid + " x " + grid + " tiles of " + tileWidth + " x " + tileHeight + ", Number of Images in Mosaic "
                + "0019,100A), in their stored order");
    }
}
