package org.noisewise.measure;

import ij.ImagePlus;
import ij.gui.Plot;
import ij.measure.Calibration;
import java.nio.file.Path;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.Warning;
import org.noisewise.io.ImageMetadata;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.ImageWriter;
import org.noisewise.io.PhantomLocator;
import org.noisewise.io.QaImages;
import org.noisewise.io.QaLogFile;
import org.noisewise.io.ResultImages;
import org.noisewise.io.SeriesFrames;
import org.noisewise.io.StabilityPlots;
import org.noisewise.io.StackPlanes;
import org.noisewise.phantom.Phantom;
import org.noisewise.phantom.PhantomFinder;
import org.noisewise.phantom.PlacedRegion;
import org.noisewise.phantom.QaLog;
import org.noisewise.report.Formats;
import org.noisewise.report.HtmlReport;
import org.noisewise.report.ResultRow;
import org.noisewise.report.StabilityRows;
import org.noisewise.series.Stability;
import org.noisewise.series.StabilityMaps;
import org.noisewise.series.StabilityResult;

/**
 * The time-series stability method for both faces and batch: per z slice, the stability maps, the
 * region (a square centred on the phantom, or the user's signal region), the figures, three plots,
 * and optionally a QA log row per slice (with baseline flags) and an HTML report.
 */
public final class StabilityMeasure {

    private StabilityMeasure() {
    }

    /**
     * Options.
     *
     * @param zs       1-based z slices
     * @param skip     frames dropped at the start
     * @param roiSize  side of the square centred on the phantom (ignored when a signal region is given)
     * @param maps     return the map images
     * @param plots    return the three plots per slice (made only when asked for: they cost more than the figures)
     * @param log      QA log to append to, or null
     * @param report   HTML report, or null
     * @param force    replace an existing report
     * @param scanner  scanner key for the log (null: DICOM)
     * @param coil     coil key (null: DICOM)
     * @param protocol protocol key (null: DICOM)
     * @param baseline sessions forming the baseline
     */
    public record Options(int[] zs, int skip, int roiSize, boolean maps, boolean plots, Path log, Path report,
                          boolean force, String scanner, String coil, String protocol, int baseline) {
        public Options {
            zs = zs.clone();
        }

        @Override
        public int[] zs() {
            return zs.clone();
        }

        /** Measure only, no log or report. */
        public static Options measure(int[] zs, int skip, int roiSize, boolean maps, boolean plots) {
            return new Options(zs, skip, roiSize, maps, plots, null, null, false, null, null, null,
                    QaLog.DEFAULT_BASELINE);
        }
    }

    /** What a run produced: the measurement (rows, maps, plots, notes), the figures and the log entries per slice. */
    public record Outcome(Measurement measurement, List<StabilityResult> results, List<Stability.Placement> placements,
                          List<QaLog.Entry> entries) {
    }

    /**
     * @param signal the user's signal region, or null for the square centred on the phantom
     * @param source the file the series came from (never replaced by an output); may be null
     */
    public static Outcome run(ImagePlus imp, String title, Region signal, Options o, Path source, Progress progress)
            throws InputException {
        ImagePlanes.requireGrayscale(imp);
        if (o.roiSize() < 1) {
            throw new InputException("the square size must be at least 1 pixel, was " + o.roiSize());
        }
        if (o.report() != null) {
            ImageWriter.checkWritable(o.report(), o.force(), source);
            ImageWriter.checkFolderWritable(o.report());
        }
        if (o.log() != null) {
            if (source != null && ImageWriter.sameFile(o.log(), source)) {
                throw new InputException("the QA log '" + o.log() + "' is the input series: give another file name");
            }
            ImageWriter.checkFolderWritable(o.log());
            QaLogFile.requireLog(o.log());
        }
        if (o.baseline() < 2) {
            throw new InputException("the baseline must be at least 2 sessions (control limits need a spread), was "
                    + o.baseline());
        }
        List<String> notes = new ArrayList<>(Measurement.imageNotes(imp));
        if (!StackPlanes.hasTimeAxis(imp) && imp.getStackSize() > 1) {
            notes.add("'" + title + "' is a plain stack: its " + imp.getStackSize() + " slices are taken as the frames "
                    + "of one slice (a hyperstack's time frames are used per z slice)");
        }
        double tr = frameSeconds(imp, notes);
        String unit = ImagePlanes.valueUnit(imp);
        int w = imp.getWidth();
        int h = imp.getHeight();
        int zCount = StackPlanes.zCount(imp);
        int[] zs = o.zs();
        // each slice's figures on Noisewise's workers; the images, plots and notes afterwards, in slice order
        record Slice(StabilityMaps maps, Stability.Placement place, StabilityResult result, List<String> notes) {
        }
        List<Slice> slices = PerSlice.run(imp, zs, progress, "Stability", (i, z, part) -> {
            String where = zCount > 1 ? " z " + z + " of " + zCount : "";
            SeriesFrames f = SeriesFrames.of(imp, z);
            requireFinite(f, w, zCount > 1 ? z : 0);
            StabilityMaps maps = Stability.maps(f.frames(), w, h, o.skip(), f.offset(), f.slope(), f.table(),
                    x -> part.report(0.7 * x, "Stability: maps" + where));
            part.report(0.7, "Stability: region figures" + where);
            int negativeMeans = org.noisewise.estimate.SignedValues.negatives(maps.signal());
            if (org.noisewise.estimate.SignedValues.signed(negativeMeans, maps.signal().length)) {
                throw new InputException(String.format(Locale.ROOT, "the temporal mean is below zero in %.1f%% of the "
                        + "pixels%s: this is not a magnitude series (a phase-sensitive or real-part reconstruction, or a "
                        + "difference), and the stability figures are defined on magnitude images; measure the magnitude "
                        + "series", 100.0 * negativeMeans / maps.signal().length, where));
            }
            List<String> sliceNotes = new ArrayList<>();
            Stability.Placement place = placement(maps, signal, o.roiSize(), w, h, sliceNotes, zCount > 1 ? z : 0);
            StabilityResult r = Stability.summarize(maps, f::gather, place, tr);
            return new Slice(maps, place, r, sliceNotes);
        });
        List<ResultRow> rows = new ArrayList<>();
        List<ImagePlus> images = new ArrayList<>();
        List<Plot> plots = new ArrayList<>();
        List<StabilityResult> results = new ArrayList<>();
        List<Stability.Placement> places = new ArrayList<>();
        List<StabilityMaps> allMaps = new ArrayList<>();
        for (int i = 0; i < zs.length; i++) {
            int z = zs[i];
            Slice sl = slices.get(i);
            StabilityResult r = sl.result();
            Stability.Placement place = sl.place();
            notes.addAll(sl.notes());
            results.add(r);
            places.add(place);
            allMaps.add(sl.maps());
            rows.add(StabilityRows.row(title, z, unit, place.region().name(), r)
                    .add("square.x", null, place.x0()).add("square.y", null, place.y0())
                    .add("square.side", null, place.side()));
            String suffix = zCount > 1 ? " z" + z : "";
            if (o.maps()) {
                images.add(ResultImages.stabilityStack(title + " stability maps" + suffix, sl.maps(), imp, unit));
            }
            if (o.plots()) {
                plots.add(StabilityPlots.series("Stability series - " + title + suffix, r, unit));
                plots.add(StabilityPlots.spectrum("Stability spectrum - " + title + suffix, r, unit));
                plots.add(StabilityPlots.weisskoff("Weisskoff curve - " + title + suffix, r));
            }
        }
        Acquisition.addEfficiency(rows, imp, notes);
        List<QaLog.Entry> entries = new ArrayList<>();
        if (o.log() != null || o.report() != null) {
            progress.report(0.95, "Stability: log and report");
            List<List<String>> flagsPerSlice = new ArrayList<>();
            List<Map<String, QaLog.Baseline>> baselines = new ArrayList<>();
            List<QaLog.Entry> history = List.of();
            for (int i = 0; i < zs.length; i++) {
                Map<String, String> values = values(imp, title, zs[i], zCount, results.get(i), allMaps.get(i), o);
                Object eff = rows.get(i).get("snr_efficiency");
                values.put("snr_efficiency", eff instanceof Number e ? Formats.csvValue(e.doubleValue()) : "");
                List<String> flags = new ArrayList<>();
                Map<String, QaLog.Baseline> b = new LinkedHashMap<>();
                if (o.log() != null) {
                    history = QaLogFile.append(o.log(), hist -> {
                        flags.addAll(QaMeasure.logFlags(hist, values, o.baseline(), b));
                        Map<String, String> v = new LinkedHashMap<>(values);
                        v.put("flags", String.join("; ", flags));
                        return new QaLog.Entry(v);
                    });
                } else {
                    flags.addAll(QaMeasure.logFlags(List.of(), values, o.baseline(), b));
                }
                values.put("flags", String.join("; ", flags));
                entries.add(new QaLog.Entry(values));
                flagsPerSlice.add(flags);
                baselines.add(b);
                rows.get(i).add("acquired", "Acquired", values.get("acquired"))
                        .add("data_id", null, values.get("data_id"))
                        .add("flags", "Flags", String.join("; ", flags));
            }
            if (o.log() != null && ImageMetadata.acquired(imp) == null) {
                notes.add("the series states no acquisition date (DICOM 0008,0022): the log records it as unknown");
            }
            if (o.report() != null) {
                ImageWriter.writeText(report(title, unit, zs, zCount, results, places, allMaps, rows, entries,
                        flagsPerSlice, baselines, history, o), o.report(), o.force());
            }
        }
        progress.report(1.0, "");
        return new Outcome(new Measurement(rows, images, plots, notes), results, places, entries);
    }

    /** Refuses a frame holding NaN or infinite values (8- and 16-bit frames cannot), naming it. */
    static void requireFinite(SeriesFrames f, int width, int z) throws InputException {
        Object[] frames = f.frames();
        for (int t = 0; t < frames.length; t++) {
            if (frames[t] instanceof float[] p) {
                for (int i = 0; i < p.length; i++) {
                    if (!Float.isFinite(p[i])) {
                        throw new InputException(String.format(Locale.ROOT, "frame %d%s holds a %s value at x=%d, y=%d: "
                                + "a damaged frame; export the series again (or skip past it when it is among the "
                                + "first frames)", t + 1, z > 0 ? " of z slice " + z : "", Float.isNaN(p[i]) ? "NaN"
                                : "infinite", i % width, i / width));
                    }
                }
            }
        }
    }

    /** The frame interval in seconds: the image's frame interval, else DICOM 0018,0080; NaN (with a note) when unknown. */
    static double frameSeconds(ImagePlus imp, List<String> notes) {
        Calibration cal = imp.getCalibration();
        if (cal.frameInterval > 0) {
            String u = cal.getTimeUnit() == null ? "sec" : cal.getTimeUnit().trim().toLowerCase(Locale.ROOT);
            double scale = switch (u) {
                case "ms", "msec" -> 1e-3;
                case "min" -> 60;
                default -> 1.0;
            };
            return cal.frameInterval * scale;
        }
        Double tr = ImageMetadata.number(imp, "0018,0080");
        if (tr != null && tr > 0) {
            notes.add(String.format(Locale.ROOT, "frame interval from DICOM 0018,0080 (repetition time): %.4g s", tr / 1000));
            return tr / 1000;
        }
        notes.add("the frame interval is unknown (no time calibration, no DICOM 0018,0080): the spectrum is in cycles "
                + "per frame");
        return Double.NaN;
    }

    /** The user's region, or the square centred on the phantom in the signal map. */
    private static Stability.Placement placement(StabilityMaps maps, Region signal, int side, int w, int h,
                                                 List<String> notes, int z) throws InputException {
        if (signal != null) {
            int minX = w;
            int minY = h;
            int maxX = -1;
            int maxY = -1;
            for (int i : signal.indices()) {
                minX = Math.min(minX, i % w);
                maxX = Math.max(maxX, i % w);
                minY = Math.min(minY, i / w);
                maxY = Math.max(maxY, i / w);
            }
            int bw = maxX - minX + 1;
            int bh = maxY - minY + 1;
            int s = Math.min(bw, bh);
            return new Stability.Placement(signal, minX + (bw - s) / 2, minY + (bh - s) / 2, s);
        }
        float[] mean = maps.signal();
        Phantom p = PhantomFinder.find(mean, w, h, PhantomLocator.threshold(mean));
        int x0 = (int) Math.round(p.cx() - side / 2.0);
        int y0 = (int) Math.round(p.cy() - side / 2.0);
        if (x0 < 0 || y0 < 0 || x0 + side > w || y0 + side > h) {
            throw new InputException(String.format(Locale.ROOT, "the %dx%d square centred on the phantom (at x=%.1f, "
                    + "y=%.1f) does not fit in the %dx%d image: choose a smaller square or mark the region yourself",
                    side, side, p.cx(), p.cy(), w, h));
        }
        if (z <= 1) {
            notes.add(String.format(Locale.ROOT, "region: the %dx%d square centred on the phantom at x=%d, y=%d "
                    + "(top-left corner)", side, side, x0, y0));
        }
        return new Stability.Placement(Region.rectangle("square " + side + "x" + side, x0, y0, side, side, w, h), x0, y0,
                side);
    }

    private static Map<String, String> values(ImagePlus imp, String title, int z, int zCount, StabilityResult r,
                                              StabilityMaps maps, Options o) {
        Map<String, String> v = new LinkedHashMap<>();
        v.put("recorded_utc", Instant.now().truncatedTo(ChronoUnit.SECONDS).toString());
        String acquired = ImageMetadata.acquired(imp);
        v.put("acquired", acquired == null ? "unknown" : acquired);
        v.put("scanner", ImageMetadata.key(o.scanner(), imp, "0008,1090", "0018,1000"));
        v.put("coil", ImageMetadata.key(o.coil(), imp, "0018,1250", null));
        v.put("protocol", ImageMetadata.key(o.protocol(), imp, "0018,1030", null));
        v.put("image", zCount > 1 ? title + " (z " + z + ")" : title);
        v.put("data_id", QaMeasure.dataId(new float[][] {maps.signal(), maps.staticNoise()}));
        v.put("method", "stability");
        boolean ok = r.warnings().stream().noneMatch(w -> w.code().equals("no_signal"));
        v.put("verdict", ok ? "valid" : "invalid");
        v.put("snr", Formats.csvValue(r.snr()));
        v.put("snr_ci95_low", Formats.csvValue(r.snrCi95().low()));
        v.put("snr_ci95_high", Formats.csvValue(r.snrCi95().high()));
        v.put("signal_mean", Formats.csvValue(r.signalMean()));
        v.put("sfnr", Formats.csvValue(r.sfnr()));
        v.put("percent_fluctuation", Formats.csvValue(r.percentFluctuation()));
        v.put("drift_percent", Formats.csvValue(r.driftPercent()));
        v.put("rdc", Formats.csvValue(r.rdc()));
        return v;
    }

    private static String report(String title, String unit, int[] zs, int zCount, List<StabilityResult> results,
                                 List<Stability.Placement> places, List<StabilityMaps> maps, List<ResultRow> rows,
                                 List<QaLog.Entry> entries, List<List<String>> flags,
                                 List<Map<String, QaLog.Baseline>> baselines, List<QaLog.Entry> history, Options o) {
        HtmlReport html = new HtmlReport("Noisewise stability - " + title);
        html.paragraph(QaMeasure.CAUTION, "caution");
        for (int i = 0; i < zs.length; i++) {
            StabilityResult r = results.get(i);
            QaLog.Entry e = entries.get(i);
            if (zCount > 1) {
                html.heading("Slice z " + zs[i]);
            }
            html.table(List.of("Acquired", "Scanner", "Coil", "Protocol", "Frames used", "Skipped"),
                    List.of(List.of(e.get("acquired"), e.get("scanner"), e.get("coil"), e.get("protocol"),
                            String.valueOf(r.framesUsed()), String.valueOf(r.skipped()))));
            html.heading("Flags");
            if (flags.get(i).isEmpty()) {
                html.paragraph("No value outside the baseline control limits.", null);
            }
            for (String f : flags.get(i)) {
                html.paragraph(f, "flag");
            }
            for (Warning w : r.warnings()) {
                html.paragraph(w.message(), "flag");
            }
            Stability.Placement p = places.get(i);
            StabilityMaps m = maps.get(i);
            List<PlacedRegion> drawn = new ArrayList<>();
            drawn.add(new PlacedRegion("signal", PlacedRegion.Kind.RECTANGLE, p.x0(), p.y0(), p.side(), p.side(), null));
            html.image("Signal (temporal mean) map with the square used (yellow); grey levels from the 1st to the "
                    + "99th percentile of the phantom", QaImages.png(QaImages.sliceWithRegions("signal map", m.signal(),
                    m.width(), m.height(), drawn, QaImages.objectRange(m.signal()))));
            html.image("SFNR map (signal over the fluctuation noise of each voxel); grey levels from the 1st to the "
                    + "99th percentile of the phantom", QaImages.png(QaImages.sliceWithRegions("SFNR map", m.sfnr(),
                    m.width(), m.height(), drawn, QaImages.objectRange(m.sfnr()))));
            html.image("Static spatial noise map (sum of odd minus sum of even frames); grey levels from the 1st to "
                    + "the 99th percentile", QaImages.png(QaImages.sliceWithRegions("static noise map", m.staticNoise(),
                    m.width(), m.height(), drawn, QaImages.percentileRange(m.staticNoise()))));
            html.heading("Results");
            html.resultTable(rows.get(i), "results" + i);
            html.image("Region-mean series and its second-order fit", QaImages.png(
                    StabilityPlots.series("series", r, unit).getImagePlus()));
            html.image("Spectrum of the residuals", QaImages.png(StabilityPlots.spectrum("spectrum", r, unit).getImagePlus()));
            html.image("Weisskoff curve with the ideal 1/n line", QaImages.png(
                    StabilityPlots.weisskoff("weisskoff", r).getImagePlus()));
            if (!baselines.get(i).isEmpty() && o.log() != null) {
                html.heading("Baseline (site's own control limits)");
                List<List<String>> t = new ArrayList<>();
                for (Map.Entry<String, QaLog.Baseline> b : baselines.get(i).entrySet()) {
                    QaLog.Baseline bl = b.getValue();
                    t.add(List.of(QaLog.METRICS.get(b.getKey()), bl.sessions() + " of " + bl.needed(),
                            bl.usable() ? Formats.sig(bl.center(), 4) : "forming",
                            bl.usable() ? Formats.sig(bl.warningLow(), 4) + " - " + Formats.sig(bl.warningHigh(), 4) : "",
                            bl.usable() ? Formats.sig(bl.actionLow(), 4) + " - " + Formats.sig(bl.actionHigh(), 4) : ""));
                }
                html.table(List.of("Metric", "Sessions", "Centre", "Warning limits", "Action limits"), t);
                html.heading("Trends (" + o.log().getFileName() + ")");
                for (Map.Entry<String, byte[]> t2 : QaMeasure.trends(priorTo(history, e), e, null, o.baseline())
                        .entrySet()) {
                    html.image(QaLog.METRICS.get(t2.getKey()) + " against acquisition date", t2.getValue());
                }
            }
        }
        html.heading("Cautions");
        html.paragraph(QaMeasure.CAUTION, "caution");
        return html.html();
    }

    /** The log's history before a session (the history returned by the last append ends with the sessions of this run). */
    private static List<QaLog.Entry> priorTo(List<QaLog.Entry> history, QaLog.Entry e) {
        List<QaLog.Entry> out = new ArrayList<>();
        for (QaLog.Entry h : history) {
            if (h.get("data_id").equals(e.get("data_id")) && h.get("recorded_utc").equals(e.get("recorded_utc"))) {
                break;
            }
            out.add(h);
        }
        return out;
    }
}
