package org.noisewise.measure;

import ij.ImagePlus;
import java.util.List;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.BackgroundSnrResult;
import org.noisewise.diagnose.Verdict;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImageMetadata;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.RepeatedMaps;
import org.noisewise.io.StackPlanes;

/**
 * One input's corrected SNR by the method its shape allows: repeated acquisitions for a series of three
 * or more frames, the difference method for a pair, the background method (with its verdict) for a single
 * image. Shared by protocol comparison and the g-factor.
 *
 * @param method  {@code repeated}, {@code difference} or {@code background}
 * @param figures the corrected amplitude, sigma and SNR
 * @param repeats frames per z slice (1 for a single image)
 */
record InputSnr(String method, CorrectedSnr figures, int repeats) {

    /** The kind of input an image is: its frame count per z slice. */
    static String kind(ImagePlus imp) {
        int k = StackPlanes.repeatCount(imp);
        return k >= 3 ? "repeated" : k == 2 ? "difference" : "background";
    }

    /**
     * @param maps the slice's temporal maps when already computed (series), else null
     */
    static InputSnr measure(ImagePlus imp, String title, int z, Region signal, List<Region> background, int channels,
                            RepeatedAcquisitions.Maps maps) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        int k = StackPlanes.repeatCount(imp);
        if (k >= 3) {
            RepeatedAcquisitions.Maps m = maps != null ? maps : RepeatedMaps.compute(imp, z);
            return positive(new InputSnr("repeated", RepeatedAcquisitions.summarize(m, RepeatedMaps.frames(imp, z),
                    signal, channels, Planes.step(imp, z)).figures(), k), title, signal);
        }
        if (k == 2) {
            float[] a = ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, 1));
            float[] b = ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, 2));
            return positive(new InputSnr("difference", DifferenceSnr.analyze(a, b, imp.getWidth(), signal, channels,
                    Planes.step(imp, z)).figures(), 2), title, signal);
        }
        if (background.isEmpty()) {
            throw new InputException("'" + title + "' is a single image, so its SNR comes from background regions: give "
                    + "background regions in air, or use a pair or a series of repeated acquisitions");
        }
        BackgroundSnrResult r = BackgroundSnr.analyze(ImagePlanes.calibratedPixels(imp, z), imp.getWidth(),
                imp.getHeight(), signal, background, new BackgroundSnr.Options(channels, SigmaEstimator.ML,
                        ImageMetadata.phaseDirection(imp), BackgroundValues.storage(imp, z)));
        if (r.figures() == null || r.verdict() == Verdict.INVALID) {
            throw new InputException("the background of '" + title + "' is not valid for an SNR ("
                    + String.join("; ", r.diagnosis().reasons().stream().map(w -> w.message()).toList())
                    + "): measure with a pair or a series of repeated acquisitions instead");
        }
        return new InputSnr("background (" + r.verdict().key() + ")", r.figures(), 1);
    }

    /**
     * Refuses an SNR at or below zero from signed data (the Gaussian model, {@code channels() == 0}): a
     * ratio of SNRs needs a signal above zero.
     */
    private static InputSnr positive(InputSnr s, String title, Region signal) throws InputException {
        if (s.figures().channels() == 0 && !(s.figures().snr() > 0)) {
            throw new InputException(String.format(java.util.Locale.ROOT, "region '%s' of '%s' holds signed values "
                    + "(below zero: not a magnitude image) with a mean at or below zero (SNR %.3g): a ratio of SNRs "
                    + "needs a signal above zero; measure magnitude images, with the region on the object",
                    signal.name(), title, s.figures().snr()));
        }
        return s;
    }
}
