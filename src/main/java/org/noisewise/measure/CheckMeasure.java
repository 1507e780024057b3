package org.noisewise.measure;

import ij.ImagePlus;
import ij.gui.Plot;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.diagnose.NoiseScan;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.Warning;
import org.noisewise.report.NoiseScanRows;
import org.noisewise.estimate.BackgroundNoise;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.HistogramPlot;
import org.noisewise.io.ImageMetadata;
import org.noisewise.io.ImagePlanes;
import org.noisewise.report.MethodRows;
import org.noisewise.report.ResultRow;

/**
 * The background noise check: the diagnostics of the background regions per plane, each with its
 * histogram plot (fitted Rayleigh / chi(2L) and a Gaussian). A signal region, when given, tells which
 * background regions lie beside the object and which above or below it (for the ghosting check).
 */
public final class CheckMeasure {

    private CheckMeasure() {
    }

    /** @param phase phase-encoding direction, or {@code null} to read DICOM 0018,1312 */
    public record Options(Integer channels, PhaseDirection phase) {
    }

    public static Measurement run(ImagePlus imp, String title, Roles roles, Options o, int[] planes,
                                  Progress progress) throws InputException {
        return run(imp, title, roles, o, planes, null, null, progress);
    }

    /**
     * The check with a noise-only scan: its sigma in the background regions and at the signal region
     * are added, with the scale check ({@code noise_scan_scale}) and the noise variation between them
     * ({@code noise_varies}, which makes the verdict invalid: the background sigma misstates the signal
     * region's noise).
     *
     * @param scan the noise-only scan, or null
     */
    public static Measurement run(ImagePlus imp, String title, Roles roles, Options o, int[] planes, ImagePlus scan,
                                  String scanTitle, Progress progress) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        Air air = new Air(roles, imp.getWidth(), imp.getHeight());
        if (!roles.autoAir()) {
            roles.backgrounds();
        }
        Region signal = roles.signal().isEmpty() ? null : roles.signal().get(0);
        List<String> notes = Measurement.imageNotes(imp);
        PhaseDirection phase = o.phase();
        if (phase == null) {
            phase = ImageMetadata.phaseDirection(imp);
            if (phase != PhaseDirection.UNKNOWN) {
                notes.add("phase-encoding direction from DICOM 0018,1312: " + phase.name());
            }
        }
        String unit = ImagePlanes.valueUnit(imp);
        List<ResultRow> rows = new ArrayList<>();
        List<Plot> plots = new ArrayList<>();
        NoiseScanMeasure.ScanPlanes scanPlanes = scan == null ? null
                : new NoiseScanMeasure.ScanPlanes(scan, scanTitle, o.channels(), signal);
        for (int k = 0; k < planes.length; k++) {
            int n = planes[k];
            progress.report((double) k / planes.length, "Background check: slice " + n);
            float[] px = ImagePlanes.calibratedPixels(imp, n);
            List<Region> background = air.regions(px, n, o.channels(), BackgroundValues.storage(imp, n), notes);
            BackgroundNoise noise = BackgroundNoise.measure(px, imp.getWidth(), background);
            BackgroundDiagnostics.Diagnosis d = BackgroundDiagnostics.diagnose(px, imp.getWidth(), imp.getHeight(),
                    signal, background, noise, new BackgroundDiagnostics.Options(o.channels(), phase,
                            BackgroundValues.storage(imp, n)));
            Warning louder = air.louderNoise(px, d.channels());
            if (louder != null) {
                d = d.withReason(louder, org.noisewise.diagnose.Verdict.QUESTIONABLE);
            }
            Warning above = air.crossCheck(px, d.channels(), BackgroundValues.storage(imp, n), background);
            if (above != null) {
                d = d.withReason(above, org.noisewise.diagnose.Verdict.QUESTIONABLE);
            }
            NoiseScanMeasure.CheckPart part = null;
            if (scan != null) {
                int sp = NoiseScanMeasure.scanPlane(imp, title, scan, scanTitle, n);
                NoiseScanMeasure.ScanPlane plane = scanPlanes.get(sp);
                float[] np = plane.pixels();
                NoiseScan.Check c = plane.check();
                notes.add(NoiseScanMeasure.scanNote(n, scanTitle, sp, c));
                part = NoiseScanMeasure.checkPart(px, np, imp.getWidth(), background, signal, c,
                        BackgroundValues.storage(imp, n).step());
                for (Warning w : part.warnings()) {
                    d = d.withReason(w, part.verdict());
                }
            }
            ResultRow row = MethodRows.check(title, n, unit, d);
            if (part != null) {
                row = NoiseScanRows.checkColumns(row, unit, scanTitle, part.background(), part.scale(), part.atSignal(),
                        part.variation());
            }
            rows.add(air.addShare(row));
            plots.add(HistogramPlot.build("Background histogram - " + title + (planes.length > 1 ? " slice " + n : ""),
                    noise.values(), d, unit));
        }
        progress.report(1.0, "");
        ImagePlus mask = air.maskImage(title);
        return new Measurement(Planes.withPositions(rows, imp), mask == null ? List.of() : List.of(mask), plots, notes);
    }
}
