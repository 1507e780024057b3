package org.noisewise.io;

import ij.ImagePlus;
import java.util.function.DoubleConsumer;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.RepeatedAcquisitions;

/**
 * The repeated-acquisition maps of an ImageJ image, the entry point for both faces, scripts and
 * benchmarks: the repeats of z slice {@code z} are a hyperstack's time frames at that z, or a plain
 * stack's slices (exactly as {@link StackPlanes} defines them).
 */
public final class RepeatedMaps {

    private RepeatedMaps() {
    }

    /** The maps of z slice {@code z} (1-based). */
    public static RepeatedAcquisitions.Maps compute(ImagePlus imp, int z) throws InputException {
        return compute(imp, z, null);
    }

    /**
     * The maps of z slice {@code z}, reporting progress (0..1) to {@code progress} (may be null). The
     * stack's own 8-, 16- or 32-bit arrays are read as they are (no converted copies); the image's
     * calibration is applied to the results when it is linear (DICOM rescale), per stored value otherwise.
     */
    public static RepeatedAcquisitions.Maps compute(ImagePlus imp, int z, DoubleConsumer progress)
            throws InputException {
        SeriesFrames f = SeriesFrames.of(imp, z);
        return RepeatedAcquisitions.maps(f.frames(), imp.getWidth(), imp.getHeight(), f.offset(), f.slope(), f.table(),
                progress);
    }

    /** The repeats of z slice {@code z}, read as calibrated planes (or values at chosen pixels) when asked for. */
    public static RepeatedAcquisitions.Frames frames(ImagePlus imp, int z) {
        return new RepeatedAcquisitions.Frames() {
            private SeriesFrames stored;

            @Override
            public void gather(int frame, int[] indices, double[] out) throws InputException {
                if (stored == null) {
                    stored = SeriesFrames.of(imp, z);
                }
                stored.gather(frame, indices, out);
            }

            @Override
            public int count() {
                return StackPlanes.repeatCount(imp);
            }

            @Override
            public float[] plane(int frame) throws InputException {
                return ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, frame + 1));
            }
        };
    }
}
