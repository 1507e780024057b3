package org.noisewise.measure;

import ij.ImagePlus;
import ij.measure.Calibration;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.HistogramPlot;
import org.noisewise.io.ImageMetadata;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.ImageWriter;
import org.noisewise.io.PhantomLocator;
import org.noisewise.io.QaImages;
import org.noisewise.io.QaLogFile;
import org.noisewise.io.StackPlanes;
import org.noisewise.io.RoiRegions;
import org.noisewise.phantom.ActionLimits;
import org.noisewise.phantom.Phantom;
import org.noisewise.phantom.PhantomFinder;
import org.noisewise.phantom.PlacedRegion;
import org.noisewise.phantom.PhantomQa;
import org.noisewise.phantom.QaLog;
import org.noisewise.phantom.QaRegions;
import org.noisewise.report.Formats;
import org.noisewise.report.HtmlReport;
import org.noisewise.report.QaRows;
import org.noisewise.report.ResultRow;

/**
 * Runs phantom QA on ImageJ images for both faces: chooses the frames (two images, the repeats of a
 * stack, or one slice), finds the threshold, reads calibration and DICOM facts, measures, appends to
 * the QA log with baseline and limit flags, and writes the HTML report.
 */
public final class QaMeasure {

    /** The cautions printed in every report. */
    public static final String CAUTION = "This is an image-quality QA measurement for trending and research. It is not "
            + "an acceptance test by itself and not a diagnostic device. Whether the scanner is fit for clinical use is "
            + "decided by the site's qualified medical physicist under local regulations and procedures.";

    private QaMeasure() {
    }

    /**
     * Options.
     *
     * @param fraction   signal-region fraction of the phantom area
     * @param phase      phase-encoding direction, or null to take it from DICOM 0018,1312
     * @param channels   stated channel count, or null for auto
     * @param fieldTesla field strength, or null to take it from DICOM 0018,0087
     * @param limits     apply the published large-phantom action limits
     * @param scanner    scanner key, or null to take it from DICOM
     * @param coil       coil key, or null
     * @param protocol   protocol key, or null
     * @param baseline   sessions forming the baseline
     * @param log        QA log to append to, or null
     * @param report     HTML report to write, or null
     * @param force      replace an existing report
     * @param slice      1-based z slice
     * @param trendDir   folder for one trend PNG per metric, or null
     * @param repeats    a plain stack (no time axis) holds repeated acquisitions of one slice rather than z slices
     */
    public record Options(double fraction, PhaseDirection phase, Integer channels, Double fieldTesla, boolean limits,
                          String scanner, String coil, String protocol, int baseline, Path log, Path report,
                          boolean force, int slice, Path trendDir, boolean repeats) {
        public Options(double fraction, PhaseDirection phase, Integer channels, Double fieldTesla, boolean limits,
                       String scanner, String coil, String protocol, int baseline, Path log, Path report,
                       boolean force, int slice) {
            this(fraction, phase, channels, fieldTesla, limits, scanner, coil, protocol, baseline, log, report, force,
                    slice, null, false);
        }
    }

    /** What a run produced. */
    public record Outcome(PhantomQa.Result result, ResultRow row, List<String> flags, List<QaLog.Entry> history,
                          QaLog.Entry entry) {
    }

    /**
     * @param first     the image (a single slice, a stack of repeats, or the first of two acquisitions)
     * @param second    the second acquisition, or null
     * @param placement regions to use instead of automatic ones (e.g. adjusted in the ROI Manager), or null
     * @param source    the file the image came from, for the acquisition time when DICOM has none; may be null
     */
    public static Outcome run(ImagePlus first, ImagePlus second, QaRegions.Placement placement, Options o, Path source)
            throws InputException {
        ImagePlanes.requireGrayscale(first);
        if (o.report() != null) {
            ImageWriter.checkWritable(o.report(), o.force());
        }
        int w = first.getWidth();
        int h = first.getHeight();
        // Repeats are a hyperstack's time frames, or a plain stack's slices when the user says so;
        // otherwise a plain stack holds z slices and one of them is measured.
        boolean repeats = StackPlanes.hasTimeAxis(first) || (o.repeats() && first.getStackSize() > 1);
        float[][] frames;
        if (second != null) {
            ImagePlanes.requireGrayscale(second);
            if (second.getWidth() != w || second.getHeight() != h || second.getStackSize() != first.getStackSize()) {
                throw new InputException("the two acquisitions differ in size (" + w + "x" + h + "x"
                        + first.getStackSize() + " and " + second.getWidth() + "x" + second.getHeight() + "x"
                        + second.getStackSize() + "): give two scans of the same matrix and slices");
            }
            frames = new float[][] {slicePixels(first, o.slice()), slicePixels(second, o.slice())};
        } else if (repeats) {
            frames = StackPlanes.repeats(first, o.slice());
        } else {
            frames = new float[][] {slicePixels(first, o.slice())};
        }
        Calibration cal = first.getCalibration();
        double toMm = mmPerUnit(cal.getUnit());
        double pw = cal.scaled() && Double.isFinite(toMm) ? cal.pixelWidth * toMm : Double.NaN;
        double ph = cal.scaled() && Double.isFinite(toMm) ? cal.pixelHeight * toMm : Double.NaN;
        PhaseDirection phase = o.phase() != null ? o.phase() : ImageMetadata.phaseDirection(first);
        ActionLimits limits = null;
        if (o.limits()) {
            Double field = o.fieldTesla() != null ? o.fieldTesla() : number(ImageMetadata.tag(first, "0018,0087"));
            if (field == null || !(field > 0)) {
                throw new InputException("the published limits depend on field strength, which the image does not state "
                        + "(DICOM 0018,0087): give it with --field T (or the dialog's field strength)");
            }
            limits = ActionLimits.largePhantom(field);
        }
        if (placement == null) {
            Phantom phantom = PhantomFinder.find(frames[0], w, h, PhantomLocator.threshold(frames[0]));
            placement = rasterize(QaRegions.place(phantom, w, h, o.fraction(), phase, pw, ph), w, h);
        }
        PhantomQa.Result r = PhantomQa.run(new PhantomQa.Input(frames, w, h, Double.NaN, o.fraction(), phase, pw, ph,
                o.channels(), BackgroundValues.storage(first, StackPlanes.hasTimeAxis(first) || repeats
                        ? StackPlanes.index(first, o.slice(), 1) : o.slice()), limits, placement));
        String unit = ImagePlanes.valueUnit(first);
        String title = source != null ? source.getFileName().toString() : first.getTitle();
        ResultRow row = QaRows.row(title, o.slice(), unit, r);

        Map<String, String> values = new LinkedHashMap<>();
        values.put("recorded_utc", Instant.now().truncatedTo(ChronoUnit.SECONDS).toString());
        values.put("acquired", acquired(first, source));
        values.put("scanner", key(o.scanner(), first, "0008,1090", "0018,1000"));
        values.put("coil", key(o.coil(), first, "0018,1250", null));
        values.put("protocol", key(o.protocol(), first, "0018,1030", null));
        values.put("image", title);
        values.put("method", r.method());
        values.put("verdict", r.verdict().key());
        values.put("snr", num(r.snr()));
        values.put("sigma", num(r.sigma()));
        values.put("signal_mean", num(r.signalMean()));
        values.put("uniformity_piu", num(r.piu()));
        values.put("nema_nonuniformity_percent", num(r.nemaNonUniformity()));
        values.put("ghosting_percent", num(r.ghostingPercent()));
        List<String> flags = new ArrayList<>();
        List<QaLog.Entry> history = List.of();
        QaLog.Entry entry;
        if (o.log() != null) {
            List<List<String>> flagHolder = new ArrayList<>();
            ActionLimits lim = limits;
            history = QaLogFile.append(o.log(), hist -> {
                List<String> f = flags(hist, values, o.baseline(), r, lim);
                flagHolder.add(f);
                Map<String, String> v = new LinkedHashMap<>(values);
                v.put("flags", String.join("; ", f));
                return new QaLog.Entry(v);
            });
            flags.addAll(flagHolder.get(0));
        } else {
            flags.addAll(flags(List.of(), values, o.baseline(), r, limits));
        }
        values.put("flags", String.join("; ", flags));
        entry = new QaLog.Entry(values);
        row.add("flags", "Flags", String.join("; ", flags));
        Outcome out = new Outcome(r, row, flags, history, entry);
        if (o.report() != null) {
            ImageWriter.writeText(report(out, frames[0], w, h, unit, o), o.report(), o.force());
        }
        if (o.trendDir() != null && o.log() != null) {
            for (Map.Entry<String, byte[]> t : trends(out, o).entrySet()) {
                Path png = o.trendDir().resolve("trend_" + t.getKey() + ".png");
                ImageWriter.checkWritable(png, true);
                ImageWriter.writeBytes(t.getValue(), png);
            }
        }
        return out;
    }

    /**
     * The placement with every region's pixels taken as ImageJ rasterises its ROI, so regions placed
     * automatically and the same regions read back from the ROI Manager hold the same pixels.
     */
    public static QaRegions.Placement rasterize(QaRegions.Placement p, int w, int h) throws InputException {
        List<PlacedRegion> bg = new ArrayList<>();
        for (PlacedRegion b : p.background()) {
            bg.add(rasterize(b, w, h));
        }
        return new QaRegions.Placement(rasterize(p.signal(), w, h), bg, rasterize(p.top(), w, h),
                rasterize(p.bottom(), w, h), rasterize(p.left(), w, h), rasterize(p.right(), w, h), p.windowW(), p.windowH(),
                p.warnings());
    }

    private static PlacedRegion rasterize(PlacedRegion p, int w, int h) throws InputException {
        if (p == null) {
            return null;
        }
        return new PlacedRegion(p.name(), p.kind(), p.x(), p.y(), p.w(), p.h(),
                RoiRegions.toRegion(QaImages.roi(p), p.name(), w, h));
    }

    /** Slice {@code z} of an image: the first time frame of a hyperstack, else stack slice z. */
    private static float[] slicePixels(ImagePlus imp, int z) throws InputException {
        return ImagePlanes.calibratedPixels(imp, StackPlanes.hasTimeAxis(imp) ? StackPlanes.index(imp, z, 1) : z);
    }

    static List<String> flags(List<QaLog.Entry> history, Map<String, String> values, int n, PhantomQa.Result r,
                              ActionLimits limits) {
        List<String> f = new ArrayList<>();
        QaLog.Entry probe = new QaLog.Entry(values);
        for (Map.Entry<String, String> m : QaLog.METRICS.entrySet()) {
            QaLog.Baseline b = QaLog.baseline(history, probe.key(), m.getKey(), n);
            String flag = QaLog.flag(b, probe.number(m.getKey()), m.getValue());
            if (!flag.isEmpty()) {
                f.add(flag);
            }
        }
        if (limits != null) {
            if (Boolean.FALSE.equals(r.piuPasses())) {
                f.add(String.format(Locale.ROOT, "PIU %.1f%% below the published limit %.1f%% (action)", r.piu(),
                        limits.minimumPiu()));
            }
            if (Boolean.FALSE.equals(r.ghostingPasses())) {
                f.add(String.format(Locale.ROOT, "ghosting %.2f%% above the published limit %.1f%% (action)",
                        r.ghostingPercent(), limits.maximumGhostingPercent()));
            }
        }
        return f;
    }

    private static String report(Outcome out, float[] slice, int w, int h, String unit, Options o) {
        PhantomQa.Result r = out.result();
        HtmlReport html = new HtmlReport("Noisewise phantom QA - " + out.entry().get("image"));
        html.paragraph(CAUTION, "caution");
        html.table(List.of("Acquired", "Scanner", "Coil", "Protocol", "SNR method", "Verdict"),
                List.of(List.of(out.entry().get("acquired"), out.entry().get("scanner"), out.entry().get("coil"),
                        out.entry().get("protocol"), r.method(), r.verdict().key())));
        html.heading("Flags");
        if (out.flags().isEmpty()) {
            html.paragraph("No value outside the baseline control limits" + (r.limits() != null
                    ? " or the published action limits." : "."), null);
        }
        for (String f : out.flags()) {
            html.paragraph(f, "flag");
        }
        html.heading("Regions");
        html.image("Slice with the regions used (signal yellow, background cyan, ghosting magenta, uniformity "
                + "high green / low orange)", QaImages.png(QaImages.sliceWithRegions("regions", slice, w, h,
                QaRows.regions(r))));
        html.heading("Results");
        html.resultTable(out.row(), "results");
        if (r.backgroundDiagnosis() != null && r.backgroundValues().length > 1) {
            html.heading("Background noise");
            html.image("Background histogram with the fitted " + org.noisewise.diagnose.BackgroundCheck.modelName(
                    r.backgroundDiagnosis().channels()) + " curve and a Gaussian for comparison",
                    QaImages.png(HistogramPlot.build("Background histogram", r.backgroundValues(),
                            r.backgroundDiagnosis(), unit).getImagePlus()));
        }
        if (o.log() != null) {
            html.heading("Trends (" + o.log().getFileName() + ")");
            String key = out.entry().key();
            long sessions = out.history().stream().filter(e -> e.key().equals(key)).count() + 1;
            html.paragraph("Key: " + key + " - " + sessions + " session(s)", null);
            for (Map.Entry<String, byte[]> t : trends(out, o).entrySet()) {
                html.image(QaLog.METRICS.get(t.getKey()) + " by session", t.getValue());
            }
        }
        html.heading("Cautions");
        html.paragraph(CAUTION, "caution");
        if (r.limits() != null) {
            html.paragraph("Published action limits applied (large-phantom QC procedure, as tabulated by AAPM TG-284): "
                    + "they hold only for scans made by that procedure.", null);
        }
        return html.html();
    }

    /** One trend plot (PNG) per metric, for this result's key, from the log's history plus this session. */
    static Map<String, byte[]> trends(Outcome out, Options o) {
        List<QaLog.Entry> all = new ArrayList<>(out.history());
        all.add(out.entry());
        String key = out.entry().key();
        List<QaLog.Entry> mine = all.stream().filter(e -> e.key().equals(key)).toList();
        Map<String, byte[]> pngs = new LinkedHashMap<>();
        for (Map.Entry<String, String> m : QaLog.METRICS.entrySet()) {
            double[] v = mine.stream().mapToDouble(e -> e.number(m.getKey())).toArray();
            QaLog.Baseline b = QaLog.baseline(all, key, m.getKey(), o.baseline());
            pngs.put(m.getKey(), QaImages.png(QaImages.trend(m.getValue(), v, b, out.result().limits(), m.getKey())
                    .getImagePlus()));
        }
        return pngs;
    }

    private static String key(String option, ImagePlus imp, String tag, String extraTag) {
        if (option != null && !option.isBlank()) {
            return option;
        }
        String v = ImageMetadata.tag(imp, tag);
        String e = extraTag == null ? null : ImageMetadata.tag(imp, extraTag);
        String s = v == null ? "" : v;
        if (e != null) {
            s = s.isEmpty() ? e : s + " " + e;
        }
        return s.isEmpty() ? "unknown" : s;
    }

    private static String acquired(ImagePlus imp, Path source) {
        String date = firstNonNull(ImageMetadata.tag(imp, "0008,0022"), ImageMetadata.tag(imp, "0008,0020"));
        String time = firstNonNull(ImageMetadata.tag(imp, "0008,0032"), ImageMetadata.tag(imp, "0008,0030"));
        if (date != null && date.length() == 8) {
            String d = date.substring(0, 4) + "-" + date.substring(4, 6) + "-" + date.substring(6, 8);
            if (time != null && time.length() >= 4) {
                d += "T" + time.substring(0, 2) + ":" + time.substring(2, 4) + (time.length() >= 6 ? ":" + time.substring(4, 6) : "");
            }
            return d;
        }
        if (source != null && Files.exists(source)) {
            try {
                return Files.getLastModifiedTime(source).toInstant().truncatedTo(ChronoUnit.SECONDS).toString();
            } catch (java.io.IOException e) {
                return "";
            }
        }
        return "";
    }

    private static String firstNonNull(String a, String b) {
        return a != null && !a.isBlank() ? a : b != null && !b.isBlank() ? b : null;
    }

    private static Double number(String s) {
        if (s == null) {
            return null;
        }
        try {
            return Double.parseDouble(s.trim());
        } catch (NumberFormatException e) {
            return null;
        }
    }

    private static String num(double v) {
        return Formats.csvValue(v);
    }

    private static double mmPerUnit(String unit) {
        if (unit == null) {
            return Double.NaN;
        }
        return switch (unit.trim().toLowerCase(Locale.ROOT)) {
            case "mm", "millimeter", "millimetre" -> 1.0;
            case "cm", "centimeter", "centimetre" -> 10.0;
            case "micron", "um", "\u00B5m" -> 1e-3;
            case "m", "meter", "metre" -> 1000.0;
            case "inch", "in" -> 25.4;
            default -> Double.NaN;
        };
    }
}
