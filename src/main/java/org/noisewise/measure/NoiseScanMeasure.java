package org.noisewise.measure;

import ij.ImagePlus;
import ij.ImageStack;
import ij.process.FloatProcessor;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.stream.IntStream;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.NoiseScan;
import org.noisewise.diagnose.Verdict;
import org.noisewise.estimate.BackgroundNoise;
import org.noisewise.estimate.BackgroundSigma;
import org.noisewise.estimate.Cnr;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.SignedValues;
import org.noisewise.estimate.Warning;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.ResultImages;
import org.noisewise.report.CnrRows;
import org.noisewise.report.NoiseScanRows;
import org.noisewise.report.ResultRow;

/**
 * SNR with sigma from a noise-only scan ({@link NoiseScan}): per plane, the scan is checked, sigma is
 * measured over the signal region's own pixels of the scan, and the signal amplitude (corrected as the
 * background method corrects it) is divided by it; optionally a sigma map of the whole plane. When
 * background regions (or automatic air) are given too, the image's background sigma is compared with
 * the scan's in the same pixels: a scan scaled or reconstructed differently is caught there. Also the
 * scan's columns of the background check ({@link #checkColumns}).
 */
public final class NoiseScanMeasure {

    private NoiseScanMeasure() {
    }

    /**
     * @param channels stated channel count, or null to estimate it from the scan
     * @param window   side of the sigma map's window (odd, at least 3)
     * @param map      whether to make the sigma map
     */
    public record Options(Integer channels, int window, boolean map) {
        public Options {
            if (window < 3 || window % 2 == 0) {
                throw new IllegalArgumentException("window must be odd and at least 3");
            }
        }
    }

    /** The scan's slice for plane {@code n} of the image: its own when the counts match, else its only one. */
    static int scanPlane(ImagePlus imp, String title, ImagePlus scan, String scanTitle, int n) throws InputException {
        ImagePlanes.requireGrayscale(scan);
        if (scan.getWidth() != imp.getWidth() || scan.getHeight() != imp.getHeight()) {
            throw new InputException(String.format(Locale.ROOT, "the noise-only scan '%s' is %dx%d pixels but '%s' is "
                    + "%dx%d: the scan must be the same protocol, with the same matrix", scanTitle, scan.getWidth(),
                    scan.getHeight(), title, imp.getWidth(), imp.getHeight()));
        }
        int k = scan.getStackSize();
        if (k == 1) {
            return 1;
        }
        if (k != imp.getStackSize()) {
            throw new InputException(String.format(Locale.ROOT, "the noise-only scan '%s' has %d slices but '%s' has "
                    + "%d: give a scan of one slice (used for every slice) or one slice per slice", scanTitle, k, title,
                    imp.getStackSize()));
        }
        return n;
    }

    /** A scan plane's calibrated values and their check. */
    record ScanPlane(float[] pixels, NoiseScan.Check check) {
    }

    /**
     * The scan's planes, each read and checked once however many image planes use it (a one-slice scan
     * serves every slice).
     */
    static final class ScanPlanes {
        private final ImagePlus scan;
        private final String title;
        private final Integer channels;
        private final Region serve;
        private final Map<Integer, ScanPlane> done = new java.util.HashMap<>();

        ScanPlanes(ImagePlus scan, String title, Integer channels, Region serve) {
            this.scan = scan;
            this.title = title;
            this.channels = channels;
            this.serve = serve;
        }

        ScanPlane get(int plane) throws InputException {
            ScanPlane p = done.get(plane);
            if (p == null) {
                float[] np = ImagePlanes.calibratedPixels(scan, plane);
                p = new ScanPlane(np, check(scan, title, plane, channels, serve, np));
                done.put(plane, p);
            }
            return p;
        }
    }

    /** The checked scan plane, with the plane named in any refusal. */
    static NoiseScan.Check check(ImagePlus scan, String scanTitle, int plane, Integer channels, Region serve,
                                 float[] np) throws InputException {
        try {
            return NoiseScan.check(np, scan.getWidth(), scan.getHeight(), channels, BackgroundValues.storage(scan, plane),
                    serve);
        } catch (InputException e) {
            throw new InputException("noise-only scan '" + scanTitle + "'" + (scan.getStackSize() > 1 ? " slice "
                    + plane : "") + ": " + e.getMessage());
        }
    }

    public static Measurement run(ImagePlus imp, String title, ImagePlus scan, String scanTitle, Roles roles, Options o,
                                  int[] planes, Progress progress) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        Region signal = roles.oneSignal();
        Region contrast = roles.oneContrast();
        if (contrast != null) {
            Contrast.requireApart(signal, contrast);
        }
        Region serve = contrast == null ? signal : union("signal and contrast", List.of(signal, contrast));
        boolean compare = roles.autoAir() || !roles.background().isEmpty();
        Air air = new Air(roles, imp.getWidth(), imp.getHeight());
        List<String> notes = Measurement.imageNotes(imp, scan);
        String unit = ImagePlanes.valueUnit(imp);
        int w = imp.getWidth();
        int h = imp.getHeight();
        List<ResultRow> rows = new ArrayList<>();
        ImageStack maps = o.map() ? new ImageStack(w, h) : null;
        ScanPlanes scanPlanes = new ScanPlanes(scan, scanTitle, o.channels(), serve);
        for (int k = 0; k < planes.length; k++) {
            int n = planes[k];
            progress.report((double) k / planes.length, "SNR (noise-only scan): slice " + n);
            int sp = scanPlane(imp, title, scan, scanTitle, n);
            float[] px = ImagePlanes.calibratedPixels(imp, n);
            SignedValues.requireMagnitude(signal.values(px), "signal region '" + signal.name() + "'",
                    "the noise-only scan method");
            ScanPlane plane = scanPlanes.get(sp);
            float[] np = plane.pixels();
            NoiseScan.Check c = plane.check();
            notes.add(scanNote(n, scanTitle, sp, c));
            SigmaEstimate sigma = NoiseScan.sigma(np, signal, c);
            List<Warning> warnings = new ArrayList<>();
            Verdict verdict = Verdict.VALID;
            NoiseScan.Ratio scale = null;
            if (compare) {
                List<Region> bg = air.regions(px, n, c.channels(), BackgroundValues.storage(imp, n), notes);
                scale = scale(px, np, w, bg, c, BackgroundValues.storage(imp, n).step());
                Warning sw = scaleWarning(scale);
                if (sw != null) {
                    warnings.add(sw);
                    verdict = Verdict.INVALID;
                }
            }
            BackgroundSnr.Signal sig = BackgroundSnr.Signal.of(px, w, signal);
            CorrectedSnr f = null;
            if (verdict == Verdict.INVALID) {
                warnings.add(new Warning("no_snr", "no SNR is reported: the noise-only scan's sigma does not apply to "
                        + "this image (see the scale warning)"));
            } else {
                f = BackgroundSnr.figures(sig, sigma, c.channels());
                warnings.addAll(f.warnings());
            }
            ResultRow row = air.addShare(NoiseScanRows.row(title, n, unit, verdict, f, sig, sigma, c, scanTitle, sp,
                    scale, warnings));
            if (contrast != null) {
                Cnr cnr = null;
                if (f != null) {
                    SigmaEstimate pooled = NoiseScan.sigma(np, serve, c);
                    BackgroundSnr.Signal cs = BackgroundSnr.Signal.of(px, w, contrast);
                    cnr = Cnr.of(sig.stats().mean(), sig.standardError(), cs.stats().mean(), cs.standardError(),
                            pooled.sigma(), pooled.ci95(), c.channels(), contrast.name());
                }
                row = CnrRows.with(row, cnr, contrast.name(), unit);
            }
            rows.add(row);
            if (maps != null) {
                maps.addSlice("sigma, window " + o.window() + " [" + unit + "], slice " + n,
                        new FloatProcessor(w, h, NoiseScan.sigmaMap(np, w, h, c, o.window())));
            }
        }
        progress.report(1.0, "");
        Acquisition.addEfficiency(rows, imp, notes);
        List<ImagePlus> images = new ArrayList<>();
        if (maps != null) {
            ImagePlus m = ResultImages.floatImage(title + " sigma map", w, h, (float[]) maps.getPixels(1), imp, unit);
            m.setStack(maps);
            m.resetDisplayRange();
            images.add(m);
            notes.add(String.format(Locale.ROOT, "sigma map: the ML sigma of the noise-only scan over the %dx%d window "
                    + "around each pixel (NaN where the scan is masked)", o.window(), o.window()));
        }
        ImagePlus mask = air.maskImage(title);
        if (mask != null) {
            images.add(mask);
        }
        return new Measurement(Planes.withPositions(rows, imp), images, List.of(), notes);
    }

    /** The image's background ML sigma over the scan's in the same pixels. */
    static NoiseScan.Ratio scale(float[] px, float[] np, int width, List<Region> background, NoiseScan.Check c,
                                 double step) throws InputException {
        BackgroundNoise noise = BackgroundNoise.measure(px, width, background);
        Map<SigmaEstimator, Double> counts = new EnumMap<>(SigmaEstimator.class);
        counts.put(SigmaEstimator.ML, noise.effectivePixels(SigmaEstimator.ML));
        SigmaEstimate image = BackgroundSigma.estimate(noise.values(), noise.stats(), c.channels(), counts, step)
                .get(SigmaEstimator.ML);
        SigmaEstimate onScan = NoiseScan.sigma(np, union("background", background), c);
        return NoiseScan.ratio(image, onScan);
    }

    /** A scale difference is reported beyond this share, at {@value #SCALE_Z} standard errors. */
    static final double SCALE_SHARE = 0.02;
    static final double SCALE_Z = 3.29;

    static Warning scaleWarning(NoiseScan.Ratio r) {
        if (!r.differs(SCALE_SHARE, SCALE_Z)) {
            return null;
        }
        return new Warning("noise_scan_scale", String.format(Locale.ROOT, "in the same background pixels the image's "
                + "sigma is %.3f times the noise-only scan's (95%% interval %.3f-%.3f): the scan was scaled or "
                + "reconstructed differently (receiver gain, scaling, filter), so its sigma does not apply; acquire the "
                + "noise-only scan with the same settings", r.value(), r.ci95().low(), r.ci95().high()));
    }

    /**
     * The background check's noise-scan columns: the scan's sigma in the background and at the signal
     * region, the scale check, and how far the noise at the signal region differs from the background's
     * ({@code noise_varies}: the background method's sigma misstates the signal region's noise).
     */
    static CheckPart checkPart(float[] px, float[] np, int width, List<Region> background, Region signal,
                               NoiseScan.Check c, double step) throws InputException {
        NoiseScan.Ratio scale = scale(px, np, width, background, c, step);
        SigmaEstimate bg = NoiseScan.sigma(np, union("background", background), c);
        List<Warning> warnings = new ArrayList<>();
        Verdict verdict = Verdict.VALID;
        Warning sw = scaleWarning(scale);
        if (sw != null) {
            warnings.add(sw);
            verdict = Verdict.QUESTIONABLE;
        }
        SigmaEstimate at = null;
        NoiseScan.Ratio variation = null;
        if (signal != null) {
            at = NoiseScan.sigma(np, signal, c);
            variation = NoiseScan.ratio(at, bg);
            if (variation.differs(VARIATION, SCALE_Z)) {
                warnings.add(new Warning("noise_varies", String.format(Locale.ROOT, "the noise-only scan's sigma at the "
                        + "signal region is %.3f times its sigma in the background regions (95%% interval %.3f-%.3f): "
                        + "noise varies over the image (parallel imaging, filters), so the background sigma misstates "
                        + "the signal region's noise; measure the SNR with the noise-only scan", variation.value(),
                        variation.ci95().low(), variation.ci95().high())));
                verdict = Verdict.INVALID;
            }
        }
        return new CheckPart(bg, scale, at, variation, warnings, verdict);
    }

    /**
     * Variations of the noise within this share are not reported (the background sigma is close enough);
     * beyond it, a variation is reported at {@value #SCALE_Z} standard errors (an invalid verdict needs
     * more than a 95% test: one clean image in twenty would be called invalid).
     */
    static final double VARIATION = 0.05;

    record CheckPart(SigmaEstimate background, NoiseScan.Ratio scale, SigmaEstimate atSignal,
                     NoiseScan.Ratio variation, List<Warning> warnings, Verdict verdict) {
    }

    static String scanNote(int n, String scanTitle, int sp, NoiseScan.Check c) {
        String ch = c.estimate() == null ? String.format(Locale.ROOT, "%d channel%s as stated", c.channels(),
                c.channels() == 1 ? "" : "s")
                : String.format(Locale.ROOT, "channel count estimated from the scan: %.2f (95%% interval %.2f-%.2f), "
                + "%d used", c.estimate().channels(), c.estimate().low(), c.estimate().high(), c.channels());
        return String.format(Locale.ROOT, "slice %d: noise-only scan '%s'%s: no structure in %d blocks; %s; noise "
                        + "variance inflation %.2f from the scan's correlation%s", n, scanTitle,
                sp == 1 ? "" : " slice " + sp, c.blocks(), ch, c.inflation(), c.maskedShare() > 0
                        ? String.format(Locale.ROOT, "; %.1f%% masked (no sigma there)", 100 * c.maskedShare()) : "");
    }

    static Region union(String name, List<Region> regions) {
        int[] idx = regions.stream().flatMapToInt(r -> IntStream.of(r.indices())).distinct().sorted().toArray();
        return new Region(name, idx);
    }
}
