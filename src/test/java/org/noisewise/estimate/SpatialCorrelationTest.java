package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The lag sums against their definition: at lag {@code h} the sample autocorrelation is the mean
 * product of the deviations of every pair of region pixels {@code h} apart over the mean square
 * deviation, pooled over every plane added. The pair counts are counted once per patch and reused
 * while the same patch comes again; patches given in turn must still count their own pairs.
 */
class SpatialCorrelationTest {

    private static final int W = 24;

    /** The definition, pixel pair by pixel pair, over planes {@code planes[i]} in regions {@code regions[i]}. */
    private static double bruteForce(float[][] planes, Region[] regions, double mean, int hx, int hy) {
        double products = 0;
        long pairs = 0;
        double squares = 0;
        long count = 0;
        for (int i = 0; i < planes.length; i++) {
            boolean[] in = new boolean[W * W];
            for (int a : regions[i].indices()) {
                in[a] = true;
            }
            for (int a : regions[i].indices()) {
                double da = planes[i][a] - mean;
                squares += da * da;
                count++;
                int x = a % W + hx;
                int y = a / W + hy;
                if (x >= 0 && x < W && y < W && in[y * W + x]) {
                    products += da * (planes[i][y * W + x] - mean);
                    pairs++;
                }
            }
        }
        return products / pairs / (squares / count);
    }

    private static float[] plane(long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        float[] white = new float[W * W];
        for (int i = 0; i < white.length; i++) {
            white[i] = (float) rng.nextGaussian();
        }
        // neighbours share noise (a 2-tap filter along x), so the lags are not all near zero
        float[] p = new float[W * W];
        for (int i = 0; i < p.length; i++) {
            p[i] = 3 + white[i] + (i % W > 0 ? 0.6f * white[i - 1] : 0);
        }
        return p;
    }

    @Test
    void lagSumsEqualTheDefinitionWithPatchesInTurn() throws InputException {
        Region box = Region.rectangle("box", 3, 4, 12, 9, W, W);
        Region disk = Region.oval("disk", 5, 6, 15, 13, W, W);
        Region[] order = {box, box, disk, box, disk, disk};
        float[][] planes = new float[order.length][];
        SpatialCorrelation.Patch boxPatch = SpatialCorrelation.Patch.of(box, W);
        SpatialCorrelation.Patch diskPatch = SpatialCorrelation.Patch.of(disk, W);
        SpatialCorrelation.LagSums sums = new SpatialCorrelation.LagSums(SpatialCorrelation.SQUARE_WINDOW);
        double mean = 3.0;
        for (int i = 0; i < order.length; i++) {
            planes[i] = plane(100 + i);
            sums.add(order[i] == box ? boxPatch : diskPatch, planes[i], W, mean);
        }
        for (int hy = 0; hy <= SpatialCorrelation.SQUARE_WINDOW; hy++) {
            for (int hx = hy == 0 ? 1 : -SpatialCorrelation.SQUARE_WINDOW; hx <= SpatialCorrelation.SQUARE_WINDOW;
                 hx++) {
                assertEquals(bruteForce(planes, order, mean, hx, hy), sums.at(hx, hy), 1e-12,
                        "lag (" + hx + ", " + hy + ")");
            }
        }
        // the 2-tap filter's neighbour correlation, 0.6 / (1 + 0.36) = 0.44, within sampling error
        assertEquals(0.44, sums.at(1, 0), 0.08);
    }
}
