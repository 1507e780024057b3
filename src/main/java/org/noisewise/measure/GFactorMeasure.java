package org.noisewise.measure;

import ij.ImagePlus;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.RepeatedMaps;
import org.noisewise.io.ResultImages;
import org.noisewise.io.StackPlanes;
import org.noisewise.protocol.GFactor;
import org.noisewise.report.ProtocolRows;
import org.noisewise.report.ResultRow;

/**
 * The g-factor of an accelerated acquisition against a full one: per z slice a pixel map from the temporal
 * mean and SD maps, and per signal region the pooled value with its interval. Each input is a series of
 * repeated acquisitions of the same slices, or a pair.
 */
public final class GFactorMeasure {

    /** Default smoothing window of the pixel map for a pair (K = 2 leaves one degree of freedom per pixel). */
    public static final int PAIR_WINDOW = 9;

    private GFactorMeasure() {
    }

    /**
     * @param window odd side of the variance-smoothing window of the pixel map, or null for the default
     *               (1 for series, {@value #PAIR_WINDOW} when either input is a pair)
     * @param maps   return the g maps as images
     */
    public static Measurement run(ImagePlus full, String titleFull, ImagePlus accel, String titleAccel,
                                  double acceleration, Roles roles, int channels, int[] zs, Integer window, boolean maps,
                                  Progress progress) throws InputException {
        ImagePlanes.requireGrayscale(full);
        ImagePlanes.requireGrayscale(accel);
        if (!(acceleration >= 1) || !Double.isFinite(acceleration)) {
            throw new InputException("the acceleration factor R must be a number of at least 1, was " + acceleration);
        }
        if (full.getWidth() != accel.getWidth() || full.getHeight() != accel.getHeight()
                || StackPlanes.zCount(full) != StackPlanes.zCount(accel)) {
            throw new InputException("'" + titleFull + "' (" + shape(full) + ") and '" + titleAccel + "' (" + shape(accel)
                    + ") differ in matrix or slices: the g-factor compares the same slices reconstructed at the same "
                    + "matrix");
        }
        int kf = StackPlanes.repeatCount(full);
        int ka = StackPlanes.repeatCount(accel);
        if (kf < 2 || ka < 2) {
            throw new InputException("'" + (kf < 2 ? titleFull : titleAccel) + "' holds a single frame: the g-factor "
                    + "needs each acquisition repeated (a pair, or a series of repeats as the repeated method takes)");
        }
        if (roles.signal().isEmpty() && !maps) {
            throw new InputException("nothing to do: give a signal region for the g-factor of a region, or ask for the map");
        }
        int w = window != null ? window : (kf == 2 || ka == 2 ? PAIR_WINDOW : 1);
        int largest = Math.min(full.getWidth(), full.getHeight());
        largest -= largest % 2 == 0 ? 1 : 0;
        if (w < 1 || w % 2 == 0 || w > largest) {
            throw new InputException("the map window must be an odd number of pixels from 1 to " + largest + " (the "
                    + full.getWidth() + "x" + full.getHeight() + " image), was " + w);
        }
        Planes.requireDifferent(full, titleFull, accel, titleAccel);
        List<String> notes = Measurement.imageNotes(full, accel);
        if (window == null && w > 1) {
            notes.add("pixel map: variances averaged over " + w + "x" + w + " pixels, as one input is a pair");
        }
        List<ResultRow> rows = new ArrayList<>();
        List<ImagePlus> images = new ArrayList<>();
        int zCount = StackPlanes.zCount(full);
        for (int i = 0; i < zs.length; i++) {
            int z = zs[i];
            progress.report((double) i / zs.length, "g-factor: z " + z + " of " + zCount);
            RepeatedAcquisitions.Maps mf = RepeatedMaps.compute(full, z);
            RepeatedAcquisitions.Maps ma = RepeatedMaps.compute(accel, z);
            float[] g = GFactor.map(mf.mean(), mf.sd(), ma.mean(), ma.sd(), full.getWidth(), full.getHeight(),
                    acceleration, w, kf, ka);
            if (maps) {
                ImagePlus imp = ResultImages.floatImage(titleAccel + " g-factor" + (zCount > 1 ? " z" + z : ""),
                        full.getWidth(), full.getHeight(), g, full, "g");
                imp.setProperty("Label", "g = SNR_full / (SNR_accelerated sqrt(R)), R = " + acceleration);
                images.add(imp);
            }
            for (Region reg : roles.signal()) {
                InputSnr sf = InputSnr.measure(full, titleFull, z, reg, List.of(), channels, kf >= 3 ? mf : null);
                InputSnr sa = InputSnr.measure(accel, titleAccel, z, reg, List.of(), channels, ka >= 3 ? ma : null);
                GFactor.Result r = GFactor.region(sf.figures(), sa.figures(), acceleration, g, reg, kf, ka, w);
                rows.add(ProtocolRows.gfactor(titleFull, titleAccel, z, reg.name(), sf.method(), sf.figures().snr(),
                        sa.figures().snr(), r, w));
            }
        }
        progress.report(1.0, "");
        return new Measurement(rows, images, List.of(), notes);
    }

    private static String shape(ImagePlus imp) {
        return imp.getWidth() + "x" + imp.getHeight() + ", " + StackPlanes.zCount(imp) + " z";
    }
}
