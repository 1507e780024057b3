package org.noisewise.io;

import ij.ImagePlus;
import ij.ImageStack;
import ij.process.FloatProcessor;
import java.util.List;
import java.util.function.BiConsumer;
import org.noisewise.estimate.BackgroundSigma;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RicianCorrection;
import org.noisewise.estimate.SigmaEstimator;

/** Applies {@link RicianCorrection} to every slice of an image, making a new 32-bit image. */
public final class CorrectedImages {

    private CorrectedImages() {
    }

    /**
     * @param sigma      per-channel noise SD; 0 = measure it on each slice from {@code background} (ML)
     * @param progress   receives (slices done, slices in all); may be {@code null}
     */
    public static ImagePlus correct(ImagePlus imp, double sigma, List<Region> background, int channels,
                                    RicianCorrection.Method method, BiConsumer<Integer, Integer> progress)
            throws InputException {
        ImagePlanes.requireGrayscale(imp);
        if (sigma < 0 || Double.isNaN(sigma) || Double.isInfinite(sigma)) {
            throw new InputException("sigma must be positive (or 0 to measure it from background regions), was " + sigma);
        }
        if (sigma == 0 && (background == null || background.isEmpty())) {
            throw new InputException("sigma is 0 and there is no background region to measure it from: give sigma, "
                    + "or add regions in air named 'background'");
        }
        int n = imp.getStackSize();
        ImageStack out = new ImageStack(imp.getWidth(), imp.getHeight());
        for (int s = 1; s <= n; s++) {
            if (progress != null) {
                progress.accept(s - 1, n);
            }
            float[] px = ImagePlanes.calibratedPixels(imp, s);
            double sg = sigma > 0 ? sigma : BackgroundSigma.estimate(Region.pooledMagnitudes(px, background), channels)
                    .get(SigmaEstimator.ML).sigma();
            out.addSlice(imp.getStack().getSliceLabel(s),
                    new FloatProcessor(imp.getWidth(), imp.getHeight(), RicianCorrection.correct(px, sg, channels, method)));
        }
        ImagePlus res = ResultImages.floatImage(imp.getTitle() + " (bias-corrected)", imp.getWidth(), imp.getHeight(),
                (float[]) out.getPixels(1), imp, ImagePlanes.valueUnit(imp));
        if (n > 1) {
            res.setStack(out, imp.getNChannels(), imp.getNSlices(), imp.getNFrames());
        }
        return res;
    }
}
