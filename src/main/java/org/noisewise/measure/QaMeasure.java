package org.noisewise.measure;

import ij.ImagePlus;
import ij.measure.Calibration;
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
                          boolean force, int slice, Path trendDir, boolean repeats, boolean autoAir) {
        public Options(double fraction, PhaseDirection phase, Integer channels, Double fieldTesla, boolean limits,
                       String scanner, String coil, String protocol, int baseline, Path log, Path report,
                       boolean force, int slice, Path trendDir, boolean repeats) {
            this(fraction, phase, channels, fieldTesla, limits, scanner, coil, protocol, baseline, log, report, force,
                    slice, trendDir, repeats, false);
        }

        public Options(double fraction, PhaseDirection phase, Integer channels, Double fieldTesla, boolean limits,
                       String scanner, String coil, String protocol, int baseline, Path log, Path report,
                       boolean force, int slice) {
            this(fraction, phase, channels, fieldTesla, limits, scanner, coil, protocol, baseline, log, report, force,
                    slice, null, false, false);
        }
    }

    /**
     * What a run produced.
     *
     * @param baselines each metric's baseline as it judged this session
     */
    public record Outcome(PhantomQa.Result result, ResultRow row, List<String> flags, List<QaLog.Entry> history,
                          QaLog.Entry entry, Map<String, QaLog.Baseline> baselines, List<String> notes) {
    }

    /**
     * @param first     the image (a single slice, a stack of repeats, or the first of two acquisitions)
     * @param second    the second acquisition, or null
     * @param placement regions to use instead of automatic ones (e.g. adjusted in the ROI Manager), or null
     * @param source    the file the image came from (never replaced by an output); may be null
     */
    public static Outcome run(ImagePlus first, ImagePlus second, QaRegions.Placement placement, Options o, Path source)
            throws InputException {
        return run(first, second, placement, o, source, Progress.NONE);
    }

    /** The same, reporting each stage to {@code progress}. */
    public static Outcome run(ImagePlus first, ImagePlus second, QaRegions.Placement placement, Options o, Path source,
                              Progress progress) throws InputException {
        ImagePlanes.requireGrayscale(first);
        progress.report(0.0, "Phantom QA: reading the slice");
        checkOutputs(o, source);
        List<String> notes = new ArrayList<>(Measurement.imageNotes(first, second));
        int w = first.getWidth();
        int h = first.getHeight();
        // Repeats are a hyperstack's time frames, or a plain stack's slices when the user says so;
        // otherwise a plain stack holds z slices and one of them is measured.
        boolean repeats = StackPlanes.hasTimeAxis(first) || (o.repeats() && first.getStackSize() > 1);
        if (o.repeats() && !repeats) {
            throw new InputException("repeated acquisitions were declared, but '" + first.getTitle() + "' holds a single "
                    + "frame: give a stack of repeats, or leave the repeats option off to use the background method");
        }
        float[][] frames;
        if (second != null) {
            ImagePlanes.requireGrayscale(second);
            ImagePlanes.requireSameShape(first, first.getTitle(), second, second.getTitle());
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
        PhaseDirection phase = o.phase();
        if (phase == null) {
            phase = ImageMetadata.phaseDirection(first);
            if (phase != PhaseDirection.UNKNOWN) {
                notes.add("phase-encoding direction from DICOM 0018,1312: " + phase.name());
            }
        }
        ActionLimits limits = null;
        if (o.limits()) {
            Double field = o.fieldTesla();
            if (field != null && !(field > 0)) {
                throw new InputException("the field strength must be a positive number of tesla, was " + field);
            }
            if (field == null) {
                field = ImageMetadata.number(first, "0018,0087");
                if (field == null || !(field > 0)) {
                    throw new InputException("the published limits depend on field strength, which the image does not "
                            + "state (DICOM 0018,0087): give the field strength in tesla");
                }
                notes.add("field strength from DICOM 0018,0087: " + field + " T");
            }
            limits = ActionLimits.largePhantom(field);
        }
        int plane = StackPlanes.hasTimeAxis(first) || repeats ? StackPlanes.index(first, o.slice(), 1) : o.slice();
        if (placement == null) {
            progress.report(0.1, "Phantom QA: finding the phantom");
            Phantom phantom = PhantomFinder.find(frames[0], w, h, PhantomLocator.threshold(frames[0]));
            progress.report(0.25, "Phantom QA: placing the regions");
            placement = rasterize(QaRegions.place(phantom, w, h, o.fraction(), phase, pw, ph), w, h);
        }
        progress.report(0.35, "Phantom QA: SNR and noise check");
        Progress stages = progress.part(0.35, 0.85);
        PhantomQa.Result r = PhantomQa.run(new PhantomQa.Input(frames, w, h, Double.NaN, o.fraction(), phase, pw, ph,
                o.channels(), BackgroundValues.storage(first, plane), limits, placement, o.autoAir()),
                f -> stages.report(f, f < 0.75 ? "Phantom QA: uniformity windows" : "Phantom QA: non-uniformity"));
        progress.report(0.85, "Phantom QA: log and report");
        if (r.air() != null) {
            notes.add(String.format(Locale.ROOT, "background: automatic air, %d pixels of pure noise (%.1f%% of the "
                    + "slice) instead of the placed background regions", r.air().pixels(), 100 * r.air().share()));
        }
        String unit = ImagePlanes.valueUnit(first);
        String title = source != null ? source.getFileName().toString() : first.getTitle();
        ResultRow row = QaRows.row(title, o.slice(), unit, r);
        Acquisition.addEfficiency(List.of(row), first, notes);

        Map<String, String> values = new LinkedHashMap<>();
        values.put("recorded_utc", Instant.now().truncatedTo(ChronoUnit.SECONDS).toString());
        String acquired = ImageMetadata.acquired(first);
        if (acquired == null) {
            notes.add("the image states no acquisition date (DICOM 0008,0022): the log records it as unknown and trend "
                    + "plots place the session at the time it was recorded");
        }
        values.put("acquired", acquired == null ? "unknown" : acquired);
        values.put("scanner", ImageMetadata.key(o.scanner(), first, "0008,1090", "0018,1000"));
        values.put("coil", ImageMetadata.key(o.coil(), first, "0018,1250", null));
        values.put("protocol", ImageMetadata.key(o.protocol(), first, "0018,1030", null));
        values.put("image", title);
        values.put("data_id", dataId(frames));
        values.put("method", r.method());
        values.put("verdict", r.verdict().key());
        values.put("snr", num(r.snr()));
        values.put("snr_ci95_low", num(r.snrCi95().low()));
        values.put("snr_ci95_high", num(r.snrCi95().high()));
        values.put("snr_magnitude", num(r.figures() == null ? Double.NaN : r.figures().magnitudeSnr()));
        values.put("signal_amplitude", num(r.figures() == null ? Double.NaN : r.figures().amplitude()));
        values.put("sigma", num(r.sigma()));
        values.put("signal_mean", num(r.signalMean()));
        values.put("snr_efficiency", row.get("snr_efficiency") instanceof Number e ? num(e.doubleValue()) : "");
        values.put("uniformity_piu", num(r.piu()));
        values.put("nema_nonuniformity_percent", num(r.nemaNonUniformity()));
        values.put("ghosting_percent", num(r.ghostingPercent()));
        List<String> flags = new ArrayList<>();
        Map<String, QaLog.Baseline> baselines = new LinkedHashMap<>();
        List<QaLog.Entry> history = List.of();
        if (o.log() != null) {
            List<String> missing = QaLogFile.missingColumns(o.log());
            if (!missing.isEmpty()) {
                notes.add("the QA log was started by an earlier version and has no columns " + missing + ": they are not "
                        + "recorded; start a new log to record them");
            }
            ActionLimits lim = limits;
            history = QaLogFile.append(o.log(), hist -> {
                flags.addAll(flags(hist, values, o.baseline(), r, lim, baselines));
                Map<String, String> v = new LinkedHashMap<>(values);
                v.put("flags", String.join("; ", flags));
                return new QaLog.Entry(v);
            });
        } else {
            flags.addAll(flags(List.of(), values, o.baseline(), r, limits, baselines));
        }
        values.put("flags", String.join("; ", flags));
        QaLog.Entry entry = new QaLog.Entry(values);
        row.add("acquired", "Acquired", values.get("acquired"))
                .add("data_id", null, values.get("data_id"))
                .add("flags", "Flags", String.join("; ", flags));
        for (Map.Entry<String, QaLog.Baseline> b : baselines.entrySet()) {
            QaLog.Baseline bl = b.getValue();
            String k = "baseline." + b.getKey() + ".";
            row.add(k + "center", null, bl.center())
                    .add(k + "warning_low", null, bl.usable() ? bl.warningLow() : null)
                    .add(k + "warning_high", null, bl.usable() ? bl.warningHigh() : null)
                    .add(k + "action_low", null, bl.usable() ? bl.actionLow() : null)
                    .add(k + "action_high", null, bl.usable() ? bl.actionHigh() : null)
                    .add(k + "sessions", null, bl.sessions());
        }
        Outcome out = new Outcome(r, row, flags, history, entry, baselines, notes);
        if (o.report() != null) {
            ImageWriter.writeText(report(out, frames[0], w, h, unit, o), o.report(), o.force());
        }
        if (o.trendDir() != null && o.log() != null) {
            for (Map.Entry<String, byte[]> t : trends(out, o).entrySet()) {
                Path png = o.trendDir().resolve("trend_" + t.getKey() + ".png");
                ImageWriter.checkWritable(png, o.force(), source);
                ImageWriter.writeBytes(t.getValue(), png);
            }
        }
        progress.report(1.0, "");
        return out;
    }

    /** Every output can be written (and none is an input) before anything is measured. */
    private static void checkOutputs(Options o, Path source) throws InputException {
        if (o.report() != null) {
            ImageWriter.checkWritable(o.report(), o.force(), source);
            ImageWriter.checkFolderWritable(o.report());
        }
        if (o.log() != null) {
            if (source != null && ImageWriter.sameFile(o.log(), source)) {
                throw new InputException("the QA log '" + o.log() + "' is the input image: give another file name");
            }
            ImageWriter.checkFolderWritable(o.log());
            QaLogFile.requireLog(o.log());
        }
        if (o.trendDir() != null) {
            if (o.log() == null) {
                throw new InputException("trend plots need a QA log to plot: give a log file as well");
            }
            ImageWriter.outputFolder(o.trendDir(), "trend plots");
            for (String metric : QaLog.METRICS.keySet()) {
                ImageWriter.checkWritable(o.trendDir().resolve("trend_" + metric + ".png"), o.force(), source);
            }
            ImageWriter.checkFolderWritable(o.trendDir().resolve("x.png"));
        }
    }

    /** A short fingerprint of the measured pixels: the same acquisition logged twice has the same one. */
    static String dataId(float[][] frames) {
        try {
            java.security.MessageDigest md = java.security.MessageDigest.getInstance("SHA-256");
            java.nio.ByteBuffer b = java.nio.ByteBuffer.allocate(4096 * 4);
            for (float[] f : frames) {
                for (int i = 0; i < f.length; i++) {
                    if (!b.hasRemaining()) {
                        md.update(b.array(), 0, b.position());
                        b.clear();
                    }
                    b.putFloat(f[i]);
                }
            }
            md.update(b.array(), 0, b.position());
            return java.util.HexFormat.of().formatHex(md.digest(), 0, 8);
        } catch (java.security.NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is part of every Java runtime", e);
        }
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

    /** Duplicate, baseline and published-limit flags of a session; {@code baselines} receives each metric's. */
    static List<String> flags(List<QaLog.Entry> history, Map<String, String> values, int n, PhantomQa.Result r,
                              ActionLimits limits, Map<String, QaLog.Baseline> baselines) {
        List<String> f = logFlags(history, values, n, baselines);
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

    /** Duplicate and baseline flags of a session (any method); {@code baselines} receives each metric's. */
    static List<String> logFlags(List<QaLog.Entry> history, Map<String, String> values, int n,
                                 Map<String, QaLog.Baseline> baselines) {
        List<String> f = new ArrayList<>();
        QaLog.Entry probe = new QaLog.Entry(values);
        QaLog.Entry dup = QaLog.duplicateOf(history, values.get("data_id"));
        if (dup != null) {
            f.add("duplicate: the same pixels as the session recorded " + dup.get("recorded_utc") + " (" + dup.get("image")
                    + "); not used for the baseline");
        }
        for (Map.Entry<String, String> m : QaLog.METRICS.entrySet()) {
            if (!Double.isFinite(probe.number(m.getKey()))) {
                continue;
            }
            QaLog.Baseline b = QaLog.baseline(history, probe.key(), m.getKey(), n);
            baselines.put(m.getKey(), b);
            String flag = QaLog.flag(b, probe.number(m.getKey()), m.getValue());
            if (!flag.isEmpty()) {
                f.add(flag);
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
        html.image("Slice with the regions used (" + QaImages.LEGEND + (r.air() == null ? ""
                        : "; the automatic air outlined in cyan") + ")", QaImages.png(QaImages.sliceWithRegions(
                "regions", slice, w, h, QaRows.regions(r), null, r.air() == null ? null : r.air().mask())));
        html.heading("Results");
        html.resultTable(out.row(), "results");
        html.heading("Limits");
        List<List<String>> lim = new ArrayList<>();
        if (r.limits() == null) {
            lim.add(List.of("published action limits", "not applied: they were not asked for (they hold only for scans "
                    + "made by the large-phantom QC procedure)"));
        } else {
            lim.add(List.of("PIU", String.format(Locale.ROOT, "at least %.1f%% at %.1f T: %s", r.limits().minimumPiu(),
                    r.limits().fieldTesla(), Boolean.TRUE.equals(r.piuPasses()) ? "within" : "outside")));
            lim.add(List.of("ghosting", Double.isFinite(r.ghostingPercent())
                    ? String.format(Locale.ROOT, "at most %.1f%%: %s", r.limits().maximumGhostingPercent(),
                            Boolean.TRUE.equals(r.ghostingPasses()) ? "within" : "outside")
                    : "not applied: no room for ghosting regions on all four sides"));
        }
        html.table(List.of("Limit", "Applied"), lim);
        if (!out.baselines().isEmpty()) {
            html.heading("Baseline (site's own control limits)");
            List<List<String>> rows = new ArrayList<>();
            for (Map.Entry<String, QaLog.Baseline> e : out.baselines().entrySet()) {
                QaLog.Baseline b = e.getValue();
                rows.add(List.of(QaLog.METRICS.get(e.getKey()), b.sessions() + " of " + b.needed(),
                        b.usable() ? Formats.sig(b.center(), 4) : "forming",
                        b.usable() ? Formats.sig(b.warningLow(), 4) + " - " + Formats.sig(b.warningHigh(), 4) : "",
                        b.usable() ? Formats.sig(b.actionLow(), 4) + " - " + Formats.sig(b.actionHigh(), 4) : ""));
            }
            html.table(List.of("Metric", "Sessions", "Centre", "Warning limits", "Action limits"), rows);
        }
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
                html.image(QaLog.METRICS.get(t.getKey()) + " against acquisition date", t.getValue());
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

    /**
     * One trend plot (PNG) per metric this session has, for its key, from the log's history plus this
     * session, against acquisition date (the recording time where the acquisition date is unknown).
     */
    static Map<String, byte[]> trends(Outcome out, Options o) {
        return trends(out.history(), out.entry(), out.result().limits(), o.baseline());
    }

    /** The trend plots of a session's metrics against its key's history (any method). */
    static Map<String, byte[]> trends(List<QaLog.Entry> history, QaLog.Entry entry, ActionLimits limits, int baseline) {
        List<QaLog.Entry> all = new ArrayList<>(history);
        all.add(entry);
        String key = entry.key();
        List<QaLog.Entry> mine = all.stream().filter(e -> e.key().equals(key)).toList();
        double[] when = mine.stream().mapToDouble(QaMeasure::epochDays).toArray();
        double origin = java.util.Arrays.stream(when).filter(Double::isFinite).min().orElse(0);
        double[] days = java.util.Arrays.stream(when).map(d -> Double.isFinite(d) ? d - Math.floor(origin) : 0)
                .toArray();
        long originDay = (long) Math.floor(origin);
        Map<String, byte[]> pngs = new LinkedHashMap<>();
        for (Map.Entry<String, String> m : QaLog.METRICS.entrySet()) {
            if (!Double.isFinite(entry.number(m.getKey()))) {
                continue;
            }
            double[] v = mine.stream().mapToDouble(e -> e.number(m.getKey())).toArray();
            QaLog.Baseline b = QaLog.baseline(all, key, m.getKey(), baseline);
            boolean[] members = members(all, mine, key, m.getKey(), baseline);
            pngs.put(m.getKey(), QaImages.png(QaImages.trend(m.getValue(), days, v, members, b,
                    limits, m.getKey(), originDay).getImagePlus()));
        }
        return pngs;
    }

    /** Which of {@code mine} are members of the metric's baseline. */
    private static boolean[] members(List<QaLog.Entry> all, List<QaLog.Entry> mine, String key, String metric, int n) {
        boolean[] out = new boolean[mine.size()];
        List<QaLog.Entry> sofar = new ArrayList<>();
        int members = 0;
        for (int i = 0; i < mine.size(); i++) {
            int before = QaLog.baseline(sofar, key, metric, n).sessions();
            sofar.add(mine.get(i));
            int after = QaLog.baseline(sofar, key, metric, n).sessions();
            out[i] = after > before && members < n;
            members = after;
        }
        return out;
    }

    /** An entry's acquisition time in days since 1970 (the recording time when unknown), NaN if neither parses. */
    static double epochDays(QaLog.Entry e) {
        for (String c : new String[] {"acquired", "recorded_utc"}) {
            String t = e.get(c);
            try {
                java.time.LocalDateTime dt = t.endsWith("Z") ? java.time.LocalDateTime.ofInstant(
                        Instant.parse(t), java.time.ZoneOffset.UTC) : java.time.LocalDateTime.parse(t);
                return dt.toEpochSecond(java.time.ZoneOffset.UTC) / 86400.0;
            } catch (java.time.DateTimeException ignored) {
                // not a time: try the next column
            }
        }
        return Double.NaN;
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
