package org.noisewise.measure;

import ij.ImagePlus;
import ij.ImageStack;
import ij.process.FloatProcessor;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.estimate.BackgroundNoise;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.RicianCorrection;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.SignedValues;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.ResultImages;
import org.noisewise.report.ResultRow;

/**
 * Rician bias correction of every plane into a new 32-bit image (the input is never changed), with
 * sigma given or measured per plane from background regions (maximum likelihood); one row per plane
 * says which sigma was used and where it came from.
 */
public final class CorrectionMeasure {

    private CorrectionMeasure() {
    }

    /**
     * @param sigma    per-channel noise SD in calibrated units; 0 = measure it on each plane from the background
     * @param channels L
     * @param method   the correction
     * @param window   the local method's neighbourhood side (odd)
     */
    public record Options(double sigma, int channels, RicianCorrection.Method method, int window) {
    }

    public static Measurement run(ImagePlus imp, String title, Roles roles, Options o, Progress progress)
            throws InputException {
        ImagePlanes.requireGrayscale(imp);
        if (o.sigma() < 0 || !Double.isFinite(o.sigma())) {
            throw new InputException("sigma must be a positive number (or 0 to measure it from background regions), "
                    + "was " + o.sigma());
        }
        if (o.channels() < 1) {
            throw new InputException("the channel count must be at least 1, was " + o.channels());
        }
        boolean measure = o.sigma() == 0;
        if (measure && roles.background().isEmpty()) {
            throw new InputException("sigma is 0 (measure it) but there is no background region to measure it from: "
                    + "give sigma, or mark regions in air as background");
        }
        int w = imp.getWidth();
        int h = imp.getHeight();
        int n = imp.getStackSize();
        String unit = ImagePlanes.valueUnit(imp);
        ImageStack out = new ImageStack(w, h);
        List<ResultRow> rows = new ArrayList<>();
        List<String> notes = Measurement.imageNotes(imp);
        for (int s = 1; s <= n; s++) {
            progress.report((s - 1.0) / n, "Rician bias correction: slice " + s + " of " + n);
            float[] px = ImagePlanes.calibratedPixels(imp, s);
            SignedValues.requireMagnitude(px, "slice " + s, "Rician bias correction");
            double sigma = o.sigma();
            SigmaEstimate measured = null;
            if (measure) {
                measured = BackgroundNoise.measure(px, w, roles.background()).estimates(o.channels(),
                        BackgroundValues.storage(imp, s).step()).get(SigmaEstimator.ML);
                sigma = measured.sigma();
                if (!(sigma > 0)) {
                    throw new InputException("slice " + s + ": the background regions hold no noise (sigma 0: masked "
                            + "or zero-filled background); give sigma measured another way");
                }
                notes.add(String.format(Locale.ROOT, "slice %d: sigma measured from the background regions: %.5g %s "
                                + "(maximum likelihood, 95%% interval %.5g-%.5g)", s, sigma, unit, measured.ci95().low(),
                        measured.ci95().high()));
            }
            float[] corrected = RicianCorrection.correct(px, w, h, sigma, o.channels(), o.method(), o.window());
            out.addSlice(imp.getStack().getSliceLabel(s), new FloatProcessor(w, h, corrected));
            int zeros = 0;
            int before = 0;
            for (int i = 0; i < corrected.length; i++) {
                zeros += corrected[i] == 0 ? 1 : 0;
                before += px[i] == 0 ? 1 : 0;
            }
            if (zeros > 0.99 * corrected.length && before < 0.5 * px.length) {
                notes.add(String.format(Locale.ROOT, "slice %d: the corrected slice is zero (or nearly) everywhere: the "
                        + "noise floor of sigma %.5g %s with %d channel(s) lies above the image's values, so every pixel "
                        + "is taken as pure noise; check sigma and the channel count (sigma is usually a few units, "
                        + "like the SD of the air divided by 0.655 for one channel)", s, sigma, unit, o.channels()));
            }
            String u = " [" + unit + "]";
            rows.add(new ResultRow()
                    .add("image", "Image", title)
                    .add("slice", "Slice", s)
                    .add("method", "Correction", o.method().key())
                    .add("window", "Window [px]", o.method() == RicianCorrection.Method.LOCAL ? (Object) o.window() : null)
                    .add("channels", "Channels", o.channels())
                    .add("sigma", "Sigma used" + u, sigma)
                    .add("sigma_source", "Sigma from", measure ? "background regions (ML)" : "given")
                    .add("sigma_ci95[0]", "Sigma 95% low" + u, measured == null ? null : measured.ci95().low())
                    .add("sigma_ci95[1]", "Sigma 95% high" + u, measured == null ? null : measured.ci95().high()));
        }
        ImagePlus res = ResultImages.floatImage(title + " (bias-corrected)", w, h, (float[]) out.getPixels(1), imp, unit);
        if (n > 1) {
            res.setStack(out, imp.getNChannels(), imp.getNSlices(), imp.getNFrames());
        }
        progress.report(1.0, "");
        return new Measurement(Planes.withPositions(rows, imp), List.of(res), List.of(), notes);
    }
}
