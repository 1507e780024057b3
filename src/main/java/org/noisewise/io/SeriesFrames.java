package org.noisewise.io;

import ij.ImagePlus;
import ij.measure.Calibration;
import org.noisewise.estimate.InputException;

/**
 * The frames of one z slice as the stack stores them (no converted copies) and how to calibrate
 * them: a hyperstack's time frames at that z, or a plain stack's slices (as {@link StackPlanes}
 * defines them). {@code calibrated = offset + slope * stored}, or {@code table[stored]} for a
 * non-linear 8- or 16-bit calibration; 32-bit values are taken as they are.
 */
public record SeriesFrames(Object[] frames, double offset, double slope, float[] table) {

    public SeriesFrames {
        frames = frames.clone();
    }

    @Override
    public Object[] frames() {
        return frames.clone();
    }

    /** The stored frames of z slice {@code z} (1-based). */
    public static SeriesFrames of(ImagePlus imp, int z) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        int k = StackPlanes.repeatCount(imp);
        Object[] frames = new Object[k];
        for (int t = 1; t <= k; t++) {
            frames[t - 1] = imp.getStack().getPixels(StackPlanes.index(imp, z, t));
        }
        double offset = 0.0;
        double slope = 1.0;
        float[] table = null;
        Calibration cal = imp.getCalibration();
        if (imp.getBitDepth() != 32 && cal.calibrated()) {
            double[] c = cal.getCoefficients();
            if (cal.getFunction() == Calibration.STRAIGHT_LINE && c != null && c.length >= 2) {
                offset = c[0];
                slope = c[1];
            } else {
                table = cal.getCTable();
            }
        }
        return new SeriesFrames(frames, offset, slope, table);
    }

    /** The number of frames. */
    public int count() {
        return frames.length;
    }

    /** The calibrated values of frame {@code f} (0-based) at {@code indices}, into {@code out}. */
    public void gather(int f, int[] indices, double[] out) {
        Object a = frames[f];
        if (a instanceof float[] p) {
            for (int i = 0; i < indices.length; i++) {
                out[i] = p[indices[i]];
            }
            return;
        }
        if (a instanceof short[] s) {
            if (table == null) {
                for (int i = 0; i < indices.length; i++) {
                    out[i] = offset + slope * (s[indices[i]] & 0xffff);
                }
            } else {
                for (int i = 0; i < indices.length; i++) {
                    out[i] = table[s[indices[i]] & 0xffff];
                }
            }
            return;
        }
        byte[] b = (byte[]) a;
        for (int i = 0; i < indices.length; i++) {
            int raw = b[indices[i]] & 0xff;
            out[i] = table != null ? table[raw] : offset + slope * raw;
        }
    }

    /** Frame {@code f} (0-based) as calibrated values (a new array). */
    public float[] calibrated(int f) {
        Object a = frames[f];
        if (a instanceof float[] p) {
            return p.clone();
        }
        int n = a instanceof short[] s ? s.length : ((byte[]) a).length;
        float[] out = new float[n];
        for (int i = 0; i < n; i++) {
            int raw = a instanceof short[] s ? s[i] & 0xffff : ((byte[]) a)[i] & 0xff;
            out[i] = table != null ? table[raw] : (float) (offset + slope * raw);
        }
        return out;
    }
}
