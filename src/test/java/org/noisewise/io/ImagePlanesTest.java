package org.noisewise.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.measure.Calibration;
import ij.process.ByteProcessor;
import ij.process.ColorProcessor;
import ij.process.ShortProcessor;
import org.junit.jupiter.api.Test;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.estimate.InputException;

/** Image planes become calibrated values; the image itself is untouched; colour images are refused. */
class ImagePlanesTest {

    @Test
    void sixteenBitWithAStraightLineCalibration() throws InputException {
        ShortProcessor sp = new ShortProcessor(4, 2);
        for (int i = 0; i < 8; i++) {
            sp.set(i, 100 * i);
        }
        ImagePlus imp = new ImagePlus("calibrated", sp);
        Calibration cal = imp.getCalibration();
        cal.setFunction(Calibration.STRAIGHT_LINE, new double[] {-50, 0.5}, "T2 units");
        float[] v = ImagePlanes.calibratedPixels(imp, 1);
        for (int i = 0; i < 8; i++) {
            assertEquals(-50 + 0.5 * 100 * i, v[i], 1e-4);
            assertEquals(100 * i, sp.get(i), "the image's own pixels changed");
        }
        assertEquals("T2 units", ImagePlanes.valueUnit(imp));
        BackgroundCheck.Storage s = BackgroundValues.storage(imp);
        assertEquals(0.5, s.step(), 1e-9);
        assertEquals(-50 + 0.5 * 65535, s.maximum(), 1e-3);
    }

    @Test
    void eightBitWithoutCalibrationAndUnits() throws InputException {
        ByteProcessor bp = new ByteProcessor(3, 1);
        bp.set(0, 7);
        bp.set(2, 255);
        ImagePlus imp = new ImagePlus("raw", bp);
        float[] v = ImagePlanes.calibratedPixels(imp, 1);
        assertEquals(7f, v[0]);
        assertEquals(255f, v[2]);
        assertEquals("a.u.", ImagePlanes.valueUnit(imp));
        assertEquals(new BackgroundCheck.Storage(1.0, 255), BackgroundValues.storage(imp));
    }

    @Test
    void refusals() {
        ImagePlus rgb = new ImagePlus("photo", new ColorProcessor(4, 4));
        InputException e = assertThrows(InputException.class, () -> ImagePlanes.calibratedPixels(rgb, 1));
        assertTrue(e.getMessage().contains("colour image"));
        ImagePlus one = new ImagePlus("one", new ByteProcessor(2, 2));
        InputException s = assertThrows(InputException.class, () -> ImagePlanes.calibratedPixels(one, 2));
        assertTrue(s.getMessage().contains("slice 2 does not exist"));
        assertThrows(InputException.class, () -> ImagePlanes.requireGrayscale(null));
    }
}
