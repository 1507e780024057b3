package org.noisewise.io;

import ij.ImagePlus;
import org.noisewise.diagnose.BackgroundCheck;

/** What an image's storage type implies about its values: quantisation step and largest storable value. */
public final class BackgroundValues {

    private BackgroundValues() {
    }

    /**
     * Quantisation step and largest storable value in calibrated units: 8- and 16-bit data step by the
     * calibration's slope (1 without calibration); 32-bit data are treated as continuous.
     */
    public static BackgroundCheck.Storage storage(ImagePlus imp) {
        int depth = imp.getBitDepth();
        if (imp.getProperty(NiftiReader.STEP_PROPERTY) instanceof Double step) {
            return new BackgroundCheck.Storage(step, Double.POSITIVE_INFINITY);
        }
        if (depth == 32) {
            return BackgroundCheck.Storage.floatingPoint();
        }
        float[] ctable = imp.getCalibration().getCTable();
        int maxRaw = depth == 8 ? 255 : 65535;
        if (ctable == null) {
            return new BackgroundCheck.Storage(1.0, maxRaw);
        }
        double step = Math.abs(ctable[Math.min(1, ctable.length - 1)] - ctable[0]);
        return new BackgroundCheck.Storage(step, ctable[Math.min(maxRaw, ctable.length - 1)]);
    }
}
