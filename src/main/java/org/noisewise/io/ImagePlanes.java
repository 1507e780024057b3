package org.noisewise.io;

import ij.ImagePlus;
import ij.measure.Calibration;
import ij.process.ImageProcessor;
import org.noisewise.estimate.InputException;

/**
 * Turns an ImageJ image plane into the core's input: calibrated values as {@code float[]}, row by
 * row. Never changes the image.
 */
public final class ImagePlanes {

    private ImagePlanes() {
    }

    /** Checks that the image is grayscale (8, 16 or 32 bit). */
    public static void requireGrayscale(ImagePlus imp) throws InputException {
        if (imp == null) {
            throw new InputException("no image: open an MR magnitude image first");
        }
        int type = imp.getType();
        if (type == ImagePlus.COLOR_RGB || type == ImagePlus.COLOR_256) {
            throw new InputException("'" + imp.getTitle() + "' is a colour image (" + (type == ImagePlus.COLOR_RGB
                    ? "RGB" : "8-bit indexed colour, whose values index a palette") + "): Noisewise measures grayscale "
                    + "magnitude images (8, 16 or 32 bit); open the original data, not a screenshot or a colour export");
        }
    }

    /**
     * The calibrated values of stack slice {@code n} (1-based): for 8- and 16-bit images the
     * calibration table is applied (e.g. DICOM rescale), 32-bit values are taken as they are.
     */
    public static float[] calibratedPixels(ImagePlus imp, int n) throws InputException {
        requireGrayscale(imp);
        int size = imp.getStackSize();
        if (n < 1 || n > size) {
            throw new InputException("slice " + n + " does not exist: '" + imp.getTitle() + "' has "
                    + size + " slice(s), numbered from 1");
        }
        ImageProcessor ip = imp.getStack().getProcessor(n);
        int count = ip.getPixelCount();
        float[] out = new float[count];
        float[] ctable = imp.getCalibration().getCTable();
        if (ip.getBitDepth() == 32) {
            System.arraycopy((float[]) ip.getPixels(), 0, out, 0, count);
        } else {
            for (int i = 0; i < count; i++) {
                int raw = ip.get(i);
                out[i] = ctable != null && raw < ctable.length ? ctable[raw] : raw;
            }
        }
        return out;
    }

    /**
     * A note when the image carries a colour lookup table (its stored grey values are measured, not the
     * colours shown), or null.
     */
    public static String lookupTableNote(ImagePlus imp) {
        ImageProcessor ip = imp.getProcessor();
        if (ip != null && !imp.isComposite() && ip.isColorLut()) {
            return "'" + imp.getTitle() + "' has a colour lookup table attached: its stored grey values are measured, "
                    + "not the colours shown";
        }
        return null;
    }

    /** Checks that two images have the same width, height and number of planes. */
    public static void requireSameShape(ImagePlus a, String titleA, ImagePlus b, String titleB) throws InputException {
        if (a.getWidth() != b.getWidth() || a.getHeight() != b.getHeight() || a.getStackSize() != b.getStackSize()) {
            throw new InputException(String.format(java.util.Locale.ROOT, "'%s' (%dx%dx%d) and '%s' (%dx%dx%d) differ "
                            + "in size: choose two acquisitions of the same matrix and slices", titleA, a.getWidth(),
                    a.getHeight(), a.getStackSize(), titleB, b.getWidth(), b.getHeight(), b.getStackSize()));
        }
    }

    /** The unit of the calibrated values, "a.u." when ImageJ has none. */
    public static String valueUnit(ImagePlus imp) {
        Calibration cal = imp.getCalibration();
        String u = cal.getValueUnit();
        if (u == null || u.isBlank() || u.equalsIgnoreCase("Gray Value")) {
            return "a.u.";
        }
        return u;
    }
}
