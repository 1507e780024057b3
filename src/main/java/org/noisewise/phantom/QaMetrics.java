package org.noisewise.phantom;

import java.util.Locale;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;

/**
 * Phantom QA metrics.
 *
 * <ul>
 *   <li>Percent integral uniformity {@code PIU = 100 (1 - (high - low) / (high + low))}, from the
 *       means of the highest and lowest ~1 cm^2 windows inside the large region (large-phantom QC
 *       procedure of the American College of Radiology, via AAPM TG-284).</li>
 *   <li>NEMA-style non-uniformity {@code NU = 100 (max - min) / (max + min)} of the 3x3-smoothed
 *       image inside the signal region (NEMA MS 3).</li>
 *   <li>Percent-signal ghosting {@code 100 |((top + bottom) - (left + right)) / (2 large)|} from
 *       the means of four air regions beside the phantom and the large-region mean.</li>
 * </ul>
 */
public final class QaMetrics {

    private QaMetrics() {
    }

    public static double piu(double high, double low) {
        return 100.0 * (1.0 - (high - low) / (high + low));
    }

    public static double ghostingPercent(double top, double bottom, double left, double right, double large) {
        return 100.0 * Math.abs(((top + bottom) - (left + right)) / (2.0 * large));
    }

    /** Uniformity windows ({@code w x h} pixels): position and mean of the brightest and darkest. */
    public record Windows(int w, int h, int highX, int highY, double high, int lowX, int lowY, double low) {
        public PlacedRegion highRegion(int width) {
            return window("uniformity high", highX, highY, width);
        }

        public PlacedRegion lowRegion(int width) {
            return window("uniformity low", lowX, lowY, width);
        }

        private PlacedRegion window(String name, int x, int y, int width) {
            return new PlacedRegion(name, PlacedRegion.Kind.RECTANGLE, x, y, w, h,
                    new Region(name, Region.rectangleIndices(x, y, w, h, width)));
        }
    }

    /**
     * The {@code sideW x sideH} windows lying wholly inside {@code region} with the highest and lowest
     * mean (sliding sums over columns and rows, so every position is tried with one row of memory). Non-finite pixels outside the region
     * change nothing (they are summed as 0 and no window holding them is inside the region).
     *
     * @throws InputException when no such window fits inside the region
     */
    public static Windows searchWindows(float[] pixels, int width, int height, Region region, int sideW, int sideH)
            throws InputException {
        boolean[] in = new boolean[width * height];
        for (int i : region.indices()) {
            in[i] = true;
        }
        // sliding sums: per column over the current sideH rows, then along the row; memory of one row
        double[] colSum = new double[width];
        int[] colCnt = new int[width];
        double best = Double.NEGATIVE_INFINITY;
        double worst = Double.POSITIVE_INFINITY;
        int bx = -1;
        int by = -1;
        int wx = -1;
        int wy = -1;
        int full = sideW * sideH;
        for (int y = 0; y < height; y++) {
            addRow(pixels, in, width, y, colSum, colCnt, 1);
            if (y >= sideH) {
                addRow(pixels, in, width, y - sideH, colSum, colCnt, -1);
            }
            int top = y - sideH + 1;
            if (top < 0 || sideW > width) {
                continue;
            }
            double s = 0;
            int c = 0;
            for (int x = 0; x < width; x++) {
                s += colSum[x];
                c += colCnt[x];
                if (x >= sideW) {
                    s -= colSum[x - sideW];
                    c -= colCnt[x - sideW];
                }
                if (x < sideW - 1 || c != full) {
                    continue;
                }
                double mean = s / full;
                if (mean > best) {
                    best = mean;
                    bx = x - sideW + 1;
                    by = top;
                }
                if (mean < worst) {
                    worst = mean;
                    wx = x - sideW + 1;
                    wy = top;
                }
            }
        }
        if (bx < 0) {
            throw new InputException(String.format(Locale.ROOT, "no %d x %d pixel uniformity window fits inside the "
                    + "signal region (%d pixels): use a larger signal region (fraction), or check the pixel size",
                    sideW, sideH, region.size()));
        }
        return new Windows(sideW, sideH, bx, by, best, wx, wy, worst);
    }

    private static boolean ascending(int[] v) {
        for (int i = 1; i < v.length; i++) {
            if (v[i - 1] > v[i]) {
                return false;
            }
        }
        return true;
    }

    /** The sum and count of the finite values among {@code x - 1, x, x + 1} of row {@code y}, for every x. */
    private static void rowSums(float[] pixels, int width, int y, double[] sum, int[] cnt) {
        int row = y * width;
        for (int x = 0; x < width; x++) {
            double s = 0;
            int n = 0;
            for (int xx = Math.max(0, x - 1); xx <= Math.min(width - 1, x + 1); xx++) {
                float v = pixels[row + xx];
                if (Float.isFinite(v)) {
                    s += v;
                    n++;
                }
            }
            sum[x] = s;
            cnt[x] = n;
        }
    }

    /** Adds ({@code sign = 1}) or removes ({@code -1}) row {@code y} from the column sums. */
    private static void addRow(float[] pixels, boolean[] in, int width, int y, double[] colSum, int[] colCnt,
                               int sign) {
        int row = y * width;
        for (int x = 0; x < width; x++) {
            float v = pixels[row + x];
            boolean finite = Float.isFinite(v);
            colSum[x] += finite ? sign * (double) v : 0.0;
            colCnt[x] += in[row + x] && finite ? sign : 0;
        }
    }

    /**
     * NEMA-style non-uniformity (percent) of the 3x3 mean-smoothed image over the region's pixels
     * (neighbours outside the image or not finite are left out of the 3x3 mean).
     */
    public static double nemaNonUniformity(float[] pixels, int width, int height, Region region) {
        int[] idx = region.indices();
        if (!ascending(idx)) {
            idx = idx.clone();
            java.util.Arrays.sort(idx);
        }
        double max = Double.NEGATIVE_INFINITY;
        double min = Double.POSITIVE_INFINITY;
        // 3-pixel sums along each row (finite neighbours only), three rows kept in a ring as the rows go by
        double[][] rowSum = new double[3][width];
        int[][] rowCnt = new int[3][width];
        int[] held = {-1, -1, -1};
        for (int i : idx) {
            int x = i % width;
            int y = i / width;
            double s = 0;
            int n = 0;
            for (int yy = Math.max(0, y - 1); yy <= Math.min(height - 1, y + 1); yy++) {
                int slot = yy % 3;
                if (held[slot] != yy) {
                    rowSums(pixels, width, yy, rowSum[slot], rowCnt[slot]);
                    held[slot] = yy;
                }
                s += rowSum[slot][x];
                n += rowCnt[slot][x];
            }
            double m = s / n;
            max = Math.max(max, m);
            min = Math.min(min, m);
        }
        return 100.0 * (max - min) / (max + min);
    }
}
