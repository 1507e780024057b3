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
     * mean (summed-area tables, so every position is tried). Non-finite pixels outside the region
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
        double[] sum = new double[(width + 1) * (height + 1)];
        int[] cnt = new int[(width + 1) * (height + 1)];
        int w1 = width + 1;
        for (int y = 0; y < height; y++) {
            double rowSum = 0;
            int rowCnt = 0;
            for (int x = 0; x < width; x++) {
                int i = y * width + x;
                float v = pixels[i];
                rowSum += Float.isFinite(v) ? v : 0.0;
                rowCnt += in[i] && Float.isFinite(v) ? 1 : 0;
                sum[(y + 1) * w1 + x + 1] = sum[y * w1 + x + 1] + rowSum;
                cnt[(y + 1) * w1 + x + 1] = cnt[y * w1 + x + 1] + rowCnt;
            }
        }
        double best = Double.NEGATIVE_INFINITY;
        double worst = Double.POSITIVE_INFINITY;
        int bx = -1;
        int by = -1;
        int wx = -1;
        int wy = -1;
        int full = sideW * sideH;
        for (int y = 0; y + sideH <= height; y++) {
            for (int x = 0; x + sideW <= width; x++) {
                int a = y * w1 + x;
                int b = y * w1 + x + sideW;
                int c = (y + sideH) * w1 + x;
                int d = (y + sideH) * w1 + x + sideW;
                if (cnt[d] - cnt[b] - cnt[c] + cnt[a] != full) {
                    continue;
                }
                double mean = (sum[d] - sum[b] - sum[c] + sum[a]) / full;
                if (mean > best) {
                    best = mean;
                    bx = x;
                    by = y;
                }
                if (mean < worst) {
                    worst = mean;
                    wx = x;
                    wy = y;
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

    /**
     * NEMA-style non-uniformity (percent) of the 3x3 mean-smoothed image over the region's pixels
     * (neighbours outside the image or not finite are left out of the 3x3 mean).
     */
    public static double nemaNonUniformity(float[] pixels, int width, int height, Region region) {
        double max = Double.NEGATIVE_INFINITY;
        double min = Double.POSITIVE_INFINITY;
        for (int i : region.indices()) {
            int x = i % width;
            int y = i / width;
            double s = 0;
            int n = 0;
            for (int dy = -1; dy <= 1; dy++) {
                for (int dx = -1; dx <= 1; dx++) {
                    int xx = x + dx;
                    int yy = y + dy;
                    if (xx >= 0 && yy >= 0 && xx < width && yy < height && Float.isFinite(pixels[yy * width + xx])) {
                        s += pixels[yy * width + xx];
                        n++;
                    }
                }
            }
            double m = s / n;
            max = Math.max(max, m);
            min = Math.min(min, m);
        }
        return 100.0 * (max - min) / (max + min);
    }
}
