package org.noisewise.io;

import ij.ImagePlus;
import org.noisewise.diagnose.BackgroundCheck;

/** What an image's storage type implies about its values: quantisation step and largest storable value. */
public final class BackgroundValues {

    private BackgroundValues() {
    }

    /** Image property with the largest storable calibrated value of integer data read as 32-bit (NIfTI, mixed DICOM). */
    public static final String MAXIMUM_PROPERTY = "noisewise.maximum";
    /**
     * Image property with one {@code Storage} per stack slice, for a DICOM series whose slices were
     * stored with different scaling (read as 32-bit calibrated values).
     */
    public static final String PER_SLICE_PROPERTY = "noisewise.storage";
    /** Image property with the calibrated value of raw 0 of such data. */
    public static final String OFFSET_PROPERTY = "noisewise.offset";

    /**
     * Quantisation step, offset and range in calibrated units: 8- and 16-bit data step by the
     * calibration's slope (1 without calibration) from its value at raw 0, between the values of the
     * smallest and largest raw numbers; integer data that arrived as 32-bit (NIfTI, a DICOM series of
     * mixed scaling) carry the same facts as image properties; other 32-bit data are continuous.
     */
    public static BackgroundCheck.Storage storage(ImagePlus imp) {
        return storage(imp, 1);
    }

    /** The storage facts of stack slice {@code n} (1-based): the same for every slice unless recorded per slice. */
    public static BackgroundCheck.Storage storage(ImagePlus imp, int n) {
        if (imp.getProperty(PER_SLICE_PROPERTY) instanceof BackgroundCheck.Storage[] per && n >= 1 && n <= per.length) {
            return per[n - 1];
        }
        int depth = imp.getBitDepth();
        if (imp.getProperty(NiftiReader.STEP_PROPERTY) instanceof Double step) {
            double offset = imp.getProperty(OFFSET_PROPERTY) instanceof Double o ? o : 0.0;
            double max = imp.getProperty(MAXIMUM_PROPERTY) instanceof Double m ? m : Double.POSITIVE_INFINITY;
            return new BackgroundCheck.Storage(step, offset, Double.NEGATIVE_INFINITY, max);
        }
        if (depth == 32) {
            return BackgroundCheck.Storage.floatingPoint();
        }
        float[] ctable = imp.getCalibration().getCTable();
        int maxRaw = depth == 8 ? 255 : 65535;
        if (ctable == null) {
            return new BackgroundCheck.Storage(1.0, 0.0, 0.0, maxRaw);
        }
        double lo = ctable[0];
        double hi = ctable[Math.min(maxRaw, ctable.length - 1)];
        double step = Math.abs(ctable[Math.min(1, ctable.length - 1)] - ctable[0]);
        return new BackgroundCheck.Storage(step, ctable[0], Math.min(lo, hi), Math.max(lo, hi));
    }
}
