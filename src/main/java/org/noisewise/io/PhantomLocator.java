package org.noisewise.io;

import ij.process.AutoThresholder;

/**
 * The intensity that separates phantom from air, by ImageJ's Otsu auto-threshold on a 256-bin
 * histogram of the slice's calibrated values.
 */
public final class PhantomLocator {

    private PhantomLocator() {
    }

    public static double threshold(float[] pixels) {
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        for (float v : pixels) {
            if (Float.isFinite(v)) {
                min = Math.min(min, v);
                max = Math.max(max, v);
            }
        }
        if (!(max > min)) {
            return max;
        }
        int[] hist = new int[256];
        double scale = 255.999 / (max - min);
        for (float v : pixels) {
            if (Float.isFinite(v)) {
                hist[(int) ((v - min) * scale)]++;
            }
        }
        int bin = new AutoThresholder().getThreshold(AutoThresholder.Method.Otsu, hist);
        return min + (bin + 1) / scale;
    }
}
