package org.noisewise.io;

import ij.ImagePlus;
import ij.ImageStack;
import ij.measure.Calibration;
import ij.process.FloatProcessor;
import org.noisewise.estimate.RepeatedAcquisitions;

/** New ImageJ images made from core results; the source image's spatial calibration is copied. */
public final class ResultImages {

    private ResultImages() {
    }

    /** A new 32-bit image with the spatial calibration of {@code like} and the given value unit. */
    public static ImagePlus floatImage(String title, int width, int height, float[] pixels, ImagePlus like,
                                       String valueUnit) {
        ImagePlus imp = new ImagePlus(title, new FloatProcessor(width, height, pixels));
        copyCalibration(like, imp, valueUnit);
        imp.resetDisplayRange();
        return imp;
    }

    /** A three-slice stack: temporal mean, temporal SD and SNR maps (slice labels say which, with units). */
    public static ImagePlus mapStack(String title, RepeatedAcquisitions.Maps maps, ImagePlus like, String unit) {
        ImageStack st = new ImageStack(maps.width(), maps.height());
        st.addSlice("temporal mean [" + unit + "]", new FloatProcessor(maps.width(), maps.height(), maps.mean()));
        st.addSlice("temporal SD [" + unit + "]", new FloatProcessor(maps.width(), maps.height(), maps.sd()));
        st.addSlice("SNR map (mean/SD)", new FloatProcessor(maps.width(), maps.height(), maps.snr()));
        ImagePlus imp = new ImagePlus(title, st);
        copyCalibration(like, imp, null);
        imp.setSlice(3);
        imp.resetDisplayRange();
        return imp;
    }

    /**
     * A four-slice stack of the stability maps: signal (temporal mean), fluctuation noise (residual SD
     * after the quadratic fit), SFNR and static spatial noise (odd minus even frames), with the source's
     * spatial calibration.
     */
    public static ImagePlus stabilityStack(String title, org.noisewise.series.StabilityMaps maps, ImagePlus like,
                                           String unit) {
        int w = maps.width();
        int h = maps.height();
        ImageStack st = new ImageStack(w, h);
        st.addSlice("signal (temporal mean) [" + unit + "]", new FloatProcessor(w, h, maps.signal().clone()));
        st.addSlice("fluctuation noise (residual SD) [" + unit + "]", new FloatProcessor(w, h, maps.fluctuation().clone()));
        st.addSlice("SFNR (signal / fluctuation noise)", new FloatProcessor(w, h, maps.sfnr().clone()));
        st.addSlice("static spatial noise (odd - even frames) [" + unit + "]",
                new FloatProcessor(w, h, maps.staticNoise().clone()));
        ImagePlus imp = new ImagePlus(title, st);
        copyCalibration(like, imp, null);
        imp.setSlice(3);
        imp.resetDisplayRange();
        return imp;
    }

    private static void copyCalibration(ImagePlus from, ImagePlus to, String valueUnit) {
        if (from == null) {
            return;
        }
        Calibration src = from.getCalibration();
        Calibration cal = new Calibration();
        cal.pixelWidth = src.pixelWidth;
        cal.pixelHeight = src.pixelHeight;
        cal.pixelDepth = src.pixelDepth;
        cal.xOrigin = src.xOrigin;
        cal.yOrigin = src.yOrigin;
        cal.setUnit(src.getUnit());
        if (valueUnit != null && !valueUnit.equals("a.u.")) {
            cal.setValueUnit(valueUnit);
        }
        to.setCalibration(cal);
    }
}
