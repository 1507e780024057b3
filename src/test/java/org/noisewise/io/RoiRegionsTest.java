package org.noisewise.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import ij.gui.OvalRoi;
import ij.gui.PolygonRoi;
import ij.gui.Roi;
import java.awt.Point;
import org.junit.jupiter.api.Test;

/** A region's pixels are exactly those ImageJ counts as inside the ROI ({@link Roi#getContainedPoints}, the definition). */
class RoiRegionsTest {

    private static void sameAsImageJ(Roi roi, int width) {
        Point[] pts = roi.getContainedPoints();
        int[] want = new int[pts.length];
        for (int i = 0; i < pts.length; i++) {
            want[i] = pts[i].y * width + pts[i].x;
        }
        assertArrayEquals(want, RoiRegions.containedIndices(roi, roi.getBounds(), width), roi.toString());
    }

    @Test
    void rectanglesOvalsAndPolygons() {
        int w = 200;
        sameAsImageJ(new Roi(10, 20, 30, 7), w);
        sameAsImageJ(new Roi(0, 0, 1, 1), w);
        sameAsImageJ(new OvalRoi(12.3, 40.7, 51.4, 33.9), w);
        sameAsImageJ(new OvalRoi(5, 5, 3, 3), w);
        sameAsImageJ(new Roi(30, 30, 40, 40, 12), w);
        sameAsImageJ(new PolygonRoi(new float[] {10, 90, 60, 15}, new float[] {10, 30, 95, 70}, Roi.POLYGON), w);
    }
}
