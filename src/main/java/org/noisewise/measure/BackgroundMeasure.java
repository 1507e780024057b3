package org.noisewise.measure;

import ij.ImagePlus;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.BackgroundSnrResult;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImageMetadata;
import org.noisewise.io.ImagePlanes;
import org.noisewise.report.BackgroundSnrRows;
import org.noisewise.report.CnrRows;
import org.noisewise.report.ResultRow;

/**
 * The background (single-image) SNR method on an image: one row per plane, each judged by the
 * background diagnostics ({@link BackgroundSnr}); optionally checked against a second acquisition's
 * difference sigma over the signal region, and with a contrast region its contrast-to-noise ratio.
 */
public final class BackgroundMeasure {

    private BackgroundMeasure() {
    }

    /**
     * @param channels  stated channel count, or {@code null} to estimate it
     * @param estimator the sigma reported
     * @param phase     phase-encoding direction, or {@code null} to read DICOM 0018,1312
     */
    public record Options(Integer channels, SigmaEstimator estimator, PhaseDirection phase) {
        public Options {
            estimator = estimator == null ? SigmaEstimator.ML : estimator;
        }
    }

    /**
     * @param title  the image's name in the rows
     * @param planes 1-based stack planes to measure
     * @param second a second identical acquisition of the same size, or null
     */
    public static Measurement run(ImagePlus imp, String title, Roles roles, Options o, int[] planes,
                                  ImagePlus second, Progress progress) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        Region signal = roles.oneSignal();
        Air air = new Air(roles, imp.getWidth(), imp.getHeight());
        if (!roles.autoAir()) {
            roles.backgrounds();
        }
        Region contrast = roles.oneContrast();
        if (second != null) {
            ImagePlanes.requireGrayscale(second);
            ImagePlanes.requireSameShape(imp, title, second, second.getTitle());
        }
        List<String> notes = Measurement.imageNotes(imp, second);
        PhaseDirection phase = o.phase();
        if (phase == null) {
            phase = ImageMetadata.phaseDirection(imp);
            if (phase != PhaseDirection.UNKNOWN) {
                notes.add("phase-encoding direction from DICOM 0018,1312: " + phase.name());
            }
        }
        String unit = ImagePlanes.valueUnit(imp);
        int w = imp.getWidth();
        int h = imp.getHeight();
        List<ResultRow> rows = new ArrayList<>();
        for (int k = 0; k < planes.length; k++) {
            int n = planes[k];
            progress.report((double) k / planes.length, "SNR (background): slice " + n);
            float[] px = ImagePlanes.calibratedPixels(imp, n);
            List<Region> background = air.regions(px, n, o.channels(), BackgroundValues.storage(imp, n), notes);
            BackgroundSnr.Options po = new BackgroundSnr.Options(o.channels(), o.estimator(), phase,
                    BackgroundValues.storage(imp, n));
            if (second != null) {
                DifferenceSnrResult d = DifferenceSnr.analyze(px, ImagePlanes.calibratedPixels(second, n), w, signal,
                        o.channels() == null ? 1 : o.channels(), BackgroundValues.storage(imp, n).step());
                po = po.withDifference(new BackgroundSnr.DifferenceSigma(d.sigma(), d.sigmaCi95()));
            }
            BackgroundSnrResult r = BackgroundSnr.analyze(px, w, h, signal, background, po);
            org.noisewise.estimate.Warning louder = air.louderNoise(px, r.channels());
            if (louder != null) {
                r = r.withReason(louder, org.noisewise.diagnose.Verdict.QUESTIONABLE);
            }
            org.noisewise.estimate.Warning above = air.crossCheck(px, r.channels(), BackgroundValues.storage(imp, n),
                    background);
            if (above != null) {
                r = r.withReason(above, org.noisewise.diagnose.Verdict.QUESTIONABLE);
            }
            if (r.diagnosis().channelsEstimated() && r.diagnosis().channelEstimate() != null) {
                notes.add(String.format(Locale.ROOT, "slice %d: channel count estimated from the background: %.2f "
                                + "(95%% interval %.2f-%.2f), %d used", n, r.diagnosis().channelEstimate().channels(),
                        r.diagnosis().channelEstimate().low(), r.diagnosis().channelEstimate().high(), r.channels()));
            }
            ResultRow row = air.addShare(BackgroundSnrRows.row(title, n, unit, r));
            if (contrast != null) {
                row = CnrRows.with(row, Contrast.background(px, w, signal, contrast, r), contrast.name(), unit);
            }
            rows.add(row);
        }
        progress.report(1.0, "");
        Acquisition.addEfficiency(rows, imp, notes);
        ImagePlus mask = air.maskImage(title);
        return new Measurement(Planes.withPositions(rows, imp), mask == null ? List.of() : List.of(mask), List.of(),
                notes);
    }
}
