package org.noisewise.cli;

import org.noisewise.measure.BackgroundMeasure;
import org.noisewise.measure.CompareMeasure;
import org.noisewise.measure.GFactorMeasure;
import org.noisewise.measure.Progress;
import org.noisewise.measure.Roles;
import org.noisewise.measure.StabilityMeasure;
import org.noisewise.sample.DicomSample;
import org.noisewise.sample.ProtocolSamples;
import org.noisewise.sample.StabilitySample;
import org.noisewise.sample.TissueSample;
import ij.ImagePlus;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.BackgroundSnrResult;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.estimate.RepeatedSnrResult;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.Warning;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.RepeatedMaps;
import org.noisewise.measure.QaMeasure;
import org.noisewise.sample.SampleCatalog;
import org.noisewise.sample.SampleCatalog.Rect;
import org.noisewise.sample.SampleCatalog.Sample;
import org.noisewise.sample.SampleCatalog.Use;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code noisewise demo}: runs every method on the bundled samples and prints each result beside the
 * known truth and beside the uncorrected hand method.
 */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = "Measure the bundled sample images with every method and compare with their known truth.")
public class DemoCommand implements Callable<Integer> {

    private static final String ROW = "  %-36s %10s %10s   %s%n";

    @Spec
    CommandSpec spec;

    @Option(names = "--samples", paramLabel = "DIR", defaultValue = "sample-images",
            description = "Folder of the sample images (default: ${DEFAULT-VALUE}).")
    Path samples;

    @Option(names = "--out", paramLabel = "DIR", defaultValue = "target/noisewise-demo",
            description = "Folder for the demo's QA log and report (default: ${DEFAULT-VALUE}); its demo files are replaced.")
    Path outDir;

    private PrintWriter out;

    @Override
    public Integer call() throws InputException {
        if (!Files.isDirectory(samples)) {
            throw new InputException("sample folder '" + samples + "' not found: run the demo from the "
                    + "repository's top folder or give --samples DIR");
        }
        out = spec.commandLine().getOut();
        out.println("Noisewise demo: every method on the bundled samples in " + samples);
        out.println("Scenario (invented): the imaging-physics bench of the fictional Fernhollow Institute.");
        out.println("Truth is known because the images were generated (org.noisewise.sample.SampleCatalog).");
        heading("1. Background method (single image), corrected for the magnitude noise model");
        for (Sample s : SampleCatalog.SAMPLES) {
            if (s.use() == Use.BACKGROUND) {
                background(s);
            }
        }
        heading("2. Two acquisitions (NEMA difference method)");
        difference(SampleCatalog.first(Use.PAIR_FIRST), SampleCatalog.first(Use.PAIR_SECOND));
        heading("3. Repeated acquisitions, corrected for magnitude bias (Koay-Basser)");
        repeated(SampleCatalog.first(Use.REPEATS));
        heading("4. Background noise check: is the background fit for the background method?");
        check(SampleCatalog.first(Use.BACKGROUND));
        check(SampleCatalog.first(Use.MASKED));
        heading("5. Phantom QA: automatic regions, SNR, uniformity, ghosting, QA log and report");
        phantomQa();
        heading("6. Stability of a time series (SFNR, static-noise SNR, fluctuation, drift, Weisskoff)");
        stability();
        heading("7. Protocols: predicted against measured SNR ratio, and the g-factor of parallel imaging");
        protocols();
        heading("8. A DICOM series as the scanner exports it: every slice measured on its own");
        dicomSeries();
        heading("9. Contrast-to-noise ratio of two tissues, corrected for the magnitude bias");
        contrast();
        heading("10. Sigma without drawn air: all the air, and a noise-only scan where noise varies");
        airAndNoiseScan();
        out.println();
        out.println("Hand method = signal mean / SD of air, uncorrected: too high by 1/0.655 = 1.53x for one channel.");
        out.println("For image-quality QA and research only, not diagnosis; acceptance decisions rest with your site's");
        out.println("qualified medical physicist and local regulations.");
        out.flush();
        return 0;
    }

    /** The bundled stability series beside the truth its generator states. */
    private void stability() throws InputException {
        ImagePlus imp = ImageFiles.open(samples.resolve(StabilitySample.FILE));
        var r = StabilityMeasure.run(imp, StabilitySample.FILE, null,
                StabilityMeasure.Options.measure(new int[] {1}, 2, 21, false, false), null, Progress.NONE).results().get(0);
        out.printf(Locale.ROOT, "%n%s  (%d frames used, 21x21 square on the phantom)%n", StabilitySample.FILE,
                r.framesUsed());
        out.printf(Locale.ROOT, ROW, "", "true", "measured", "95% interval");
        out.printf(Locale.ROOT, ROW, "SFNR (corrected)", fmt(StabilitySample.trueSfnr()), fmt(r.sfnr()),
                ci(r.sfnrCi95().low(), r.sfnrCi95().high()));
        out.printf(Locale.ROOT, ROW, "static-noise SNR", fmt(StabilitySample.trueSnr()), fmt(r.snr()),
                ci(r.snrCi95().low(), r.snrCi95().high()));
        out.printf(Locale.ROOT, ROW, "percent fluctuation", fmt(StabilitySample.truePercentFluctuation()),
                fmt(r.percentFluctuation()), "");
        out.printf(Locale.ROOT, ROW, "radius of decorrelation", fmt(StabilitySample.trueRdc()), fmt(r.rdc()), "");
    }

    /** The bundled DICOM folder: arranged from its headers, the repeated method per slice beside the truth. */
    private void dicomSeries() throws InputException {
        Path folder = samples.resolve(DicomSample.FOLDER);
        ImagePlus imp = ImageFiles.open(folder);
        Rect r = DicomSample.SIGNAL;
        Region sig = Region.rectangle("signal", r.x(), r.y(), r.w(), r.h(), imp.getWidth(), imp.getHeight());
        var m = org.noisewise.measure.RepeatedMeasure.run(imp, DicomSample.FOLDER, Roles.of(sig, List.of()), 1,
                org.noisewise.measure.Planes.allZ(imp), false, Progress.NONE);
        out.printf(Locale.ROOT, "%n%s/  (%d files)%n", DicomSample.FOLDER, imp.getStackSize());
        out.println("  read as " + org.noisewise.io.Arrangement.note(imp).replaceFirst("^'[^']*': ", ""));
        out.printf(Locale.ROOT, ROW, "", "true", "measured", "95% interval");
        for (int z = 1; z <= DicomSample.SLICES; z++) {
            var row = m.rows().get(z - 1);
            out.printf(Locale.ROOT, ROW, "slice " + z + ", SNR (corrected)", fmt(DicomSample.trueSnr(z)),
                    fmt(((Number) row.get("snr")).doubleValue()), ci(((Number) row.get("snr_ci95[0]")).doubleValue(),
                            ((Number) row.get("snr_ci95[1]")).doubleValue()));
        }
    }

    /** The two-tissue sample: the CNR by the background and repeated methods beside the truth and the plain CNR. */
    private void contrast() throws InputException {
        ImagePlus imp = ImageFiles.open(samples.resolve(TissueSample.FILE));
        int n = TissueSample.SIZE;
        Rect r = TissueSample.SIGNAL;
        Rect c = TissueSample.CONTRAST;
        List<Region> bg = new java.util.ArrayList<>();
        for (Rect b : SampleCatalog.BACKGROUND) {
            bg.add(Region.rectangle("background", b.x(), b.y(), b.w(), b.h(), n, n));
        }
        Roles roles = new Roles(List.of(Region.rectangle("signal", r.x(), r.y(), r.w(), r.h(), n, n)), bg,
                List.of(Region.rectangle("contrast", c.x(), c.y(), c.w(), c.h(), n, n)));
        var b = BackgroundMeasure.run(imp, TissueSample.FILE, roles, new BackgroundMeasure.Options(TissueSample.CHANNELS,
                null, null), new int[] {1}, null, Progress.NONE).rows().get(0);
        var rep = org.noisewise.measure.RepeatedMeasure.run(imp, TissueSample.FILE, roles, TissueSample.CHANNELS,
                new int[] {1}, false, Progress.NONE).rows().get(0);
        out.printf(Locale.ROOT, "%n%s  (8 channels; outer gel %s, insert %s, sigma %s)%n", TissueSample.FILE,
                fmt(TissueSample.OUTER), fmt(TissueSample.INSERT), fmt(TissueSample.SIGMA));
        out.printf(Locale.ROOT, ROW, "", "true", "measured", "95% interval");
        for (var row : List.of(b, rep)) {
            out.printf(Locale.ROOT, ROW, "CNR (corrected), " + row.get("method") + " method",
                    fmt(TissueSample.trueCnr()), fmt(((Number) row.get("cnr")).doubleValue()),
                    ci(((Number) row.get("cnr_ci95[0]")).doubleValue(), ((Number) row.get("cnr_ci95[1]")).doubleValue()));
        }
        out.printf(Locale.ROOT, ROW, "CNR plain (S - C) / sigma, background", fmt(TissueSample.trueCnr()),
                fmt(((Number) b.get("cnr_magnitude")).doubleValue()), "biased low");
    }

    /**
     * The head-like sample with all the air found automatically (corners drawn by hand take in its
     * ghost), and the accelerated pair with its noise-only scan (the corners see a third of the noise
     * in the middle).
     */
    private void airAndNoiseScan() throws InputException {
        ImagePlus head = ImageFiles.open(samples.resolve(org.noisewise.sample.HeadSample.FILE));
        Rect hs = org.noisewise.sample.HeadSample.SIGNAL;
        int n = org.noisewise.sample.HeadSample.SIZE;
        Region hsig = Region.rectangle("signal", hs.x(), hs.y(), hs.w(), hs.h(), n, n);
        var auto = BackgroundMeasure.run(head, org.noisewise.sample.HeadSample.FILE, Roles.of(hsig, List.of())
                .withAutoAir(), new BackgroundMeasure.Options(1, null, null), new int[] {1}, null, Progress.NONE)
                .rows().get(0);
        List<Region> corners = List.of(Region.rectangle("bg", 8, 2, 24, 24, n, n),
                Region.rectangle("bg", 96, 2, 24, 24, n, n), Region.rectangle("bg", 8, 102, 24, 24, n, n),
                Region.rectangle("bg", 96, 102, 24, 24, n, n));
        var drawn = BackgroundMeasure.run(head, org.noisewise.sample.HeadSample.FILE, Roles.of(hsig, corners),
                new BackgroundMeasure.Options(1, null, null), new int[] {1}, null, Progress.NONE).rows().get(0);
        out.printf(Locale.ROOT, "%n%s  (single channel, 8%% ghost, zero-filled side bands)%n",
                org.noisewise.sample.HeadSample.FILE);
        out.printf(Locale.ROOT, ROW, "", "true", "measured", "95% interval");
        out.printf(Locale.ROOT, ROW, "sigma, automatic air (" + auto.get("pixels.background") + " px)",
                fmt(org.noisewise.sample.HeadSample.SIGMA), fmt(num(auto, "sigma")), ci(num(auto, "sigma_ci95[0]"),
                        num(auto, "sigma_ci95[1]")));
        out.printf(Locale.ROOT, ROW, "sigma, four corners drawn by hand", fmt(org.noisewise.sample.HeadSample.SIGMA),
                fmt(num(drawn, "sigma")), ci(num(drawn, "sigma_ci95[0]"), num(drawn, "sigma_ci95[1]")));
        out.printf(Locale.ROOT, ROW, "SNR (corrected), automatic air", fmt(org.noisewise.sample.HeadSample.trueSnr()),
                fmt(num(auto, "snr")), ci(num(auto, "snr_ci95[0]"), num(auto, "snr_ci95[1]")));

        ImagePlus img = ImageFiles.open(samples.resolve(org.noisewise.sample.NoiseScanSample.IMAGE));
        ImagePlus scan = ImageFiles.open(samples.resolve(org.noisewise.sample.NoiseScanSample.NOISE));
        Rect c = org.noisewise.sample.NoiseScanSample.CENTRE;
        Region csig = Region.rectangle("signal", c.x(), c.y(), c.w(), c.h(), img.getWidth(), img.getHeight());
        var withScan = org.noisewise.measure.NoiseScanMeasure.run(img, org.noisewise.sample.NoiseScanSample.IMAGE, scan,
                org.noisewise.sample.NoiseScanSample.NOISE, Roles.of(csig, List.of()),
                new org.noisewise.measure.NoiseScanMeasure.Options(null, 15, false), new int[] {1}, Progress.NONE)
                .rows().get(0);
        List<Region> air = List.of(Region.rectangle("bg", 2, 2, 20, 20, 128, 128),
                Region.rectangle("bg", 106, 2, 20, 20, 128, 128), Region.rectangle("bg", 2, 106, 20, 20, 128, 128),
                Region.rectangle("bg", 106, 106, 20, 20, 128, 128));
        var fromAir = BackgroundMeasure.run(img, org.noisewise.sample.NoiseScanSample.IMAGE, Roles.of(csig, air),
                new BackgroundMeasure.Options(org.noisewise.sample.NoiseScanSample.CHANNELS, null, null), new int[] {1},
                null, Progress.NONE).rows().get(0);
        double truth = org.noisewise.sample.NoiseScanSample.trueSnr(c);
        out.printf(Locale.ROOT, "%n%s with %s  (4 channels, g-factor 1.8 in the middle)%n",
                org.noisewise.sample.NoiseScanSample.IMAGE, org.noisewise.sample.NoiseScanSample.NOISE);
        out.printf(Locale.ROOT, ROW, "", "true", "measured", "95% interval");
        out.printf(Locale.ROOT, ROW, "SNR (corrected), noise-only scan", fmt(truth), fmt(num(withScan, "snr")),
                ci(num(withScan, "snr_ci95[0]"), num(withScan, "snr_ci95[1]")));
        out.printf(Locale.ROOT, ROW, "SNR (corrected), air in the corners", fmt(truth), fmt(num(fromAir, "snr")),
                "the corners' noise is not the middle's");
    }

    private static double num(org.noisewise.report.ResultRow row, String key) {
        return ((Number) row.get(key)).doubleValue();
    }

    /** The bundled protocol series: 2 against 8 averages (predicted ratio 2), and R = 2 with a g ramp. */
    private void protocols() throws InputException {
        ImagePlus a = ImageFiles.open(samples.resolve(ProtocolSamples.AVG2.file()));
        ImagePlus b = ImageFiles.open(samples.resolve(ProtocolSamples.AVG8.file()));
        Region sig = Region.rectangle("signal", 20, 20, 24, 24, ProtocolSamples.SIZE, ProtocolSamples.SIZE);
        var row = CompareMeasure.run(a, ProtocolSamples.AVG2.file(), b, ProtocolSamples.AVG8.file(), null, null, 1.0,
                Roles.of(sig, List.of()), 1, new int[] {1}, Progress.NONE).rows().get(0);
        out.printf(Locale.ROOT, "%n%s against %s (protocols from the file headers)%n", ProtocolSamples.AVG8.file(),
                ProtocolSamples.AVG2.file());
        out.printf(Locale.ROOT, ROW, "", "true", "measured", "95% interval");
        out.printf(Locale.ROOT, ROW, "SNR ratio B/A (repeated method)", fmt(ProtocolSamples.AVG2.sigma()
                / ProtocolSamples.AVG8.sigma()), fmt(((Number) row.get("ratio_measured")).doubleValue()),
                ci(((Number) row.get("ratio_measured_ci95[0]")).doubleValue(),
                        ((Number) row.get("ratio_measured_ci95[1]")).doubleValue()));
        out.printf(Locale.ROOT, "  predicted from the protocols: %s (4x the averages); consistent: %s%n",
                fmt(((Number) row.get("ratio_predicted")).doubleValue()),
                org.noisewise.report.Formats.text(row.get("consistent")));
        ImagePlus full = ImageFiles.open(samples.resolve(ProtocolSamples.FULL.file()));
        ImagePlus acc = ImageFiles.open(samples.resolve(ProtocolSamples.ACCEL2.file()));
        Region strip = Region.rectangle("strip x 48-53", 48, 20, 6, 24, ProtocolSamples.SIZE, ProtocolSamples.SIZE);
        var g = GFactorMeasure.run(full, ProtocolSamples.FULL.file(), acc, ProtocolSamples.ACCEL2.file(), 2.0,
                Roles.of(strip, List.of()), 1, new int[] {1}, null, false, Progress.NONE).rows().get(0);
        double ms = 0;
        for (int x = 48; x < 54; x++) {
            ms += ProtocolSamples.g(x) * ProtocolSamples.g(x) / 6;
        }
        out.printf(Locale.ROOT, "%n%s against %s, R = 2, columns 48-53%n", ProtocolSamples.ACCEL2.file(),
                ProtocolSamples.FULL.file());
        out.printf(Locale.ROOT, ROW, "g-factor (pooled over the region)", fmt(Math.sqrt(ms)),
                fmt(((Number) g.get("g_mean")).doubleValue()), ci(((Number) g.get("g_ci95[0]")).doubleValue(),
                        ((Number) g.get("g_ci95[1]")).doubleValue()));
    }

    /**
     * Six invented weekly sessions (generated in memory) build the log's baseline, then the bundled
     * pair is measured as week seven and reported.
     */
    private void phantomQa() throws InputException {
        Path log = outDir.resolve("qa-log.csv");
        Path report = outDir.resolve("qa-report.html");
        try {
            Files.createDirectories(outDir);
            Files.deleteIfExists(log);
        } catch (java.io.IOException e) {
            throw new InputException("cannot prepare the demo folder '" + outDir + "': " + e.getMessage());
        }
        QaMeasure.Options history = new QaMeasure.Options(0.75, null, 1, 1.5, true, "Aster", "head", "weekly uniformity",
                5, log, null, true, 1);
        java.util.SplittableRandom drift = new java.util.SplittableRandom(7);
        for (int week = 1; week <= 6; week++) {
            double a = 120.0 * (1 + 0.01 * drift.nextGaussian());
            ImagePlus[] pair = new ImagePlus[2];
            for (int k = 0; k < 2; k++) {
                float[] px = org.noisewise.sample.Phantoms.disk(SampleCatalog.SIZE, SampleCatalog.SIZE,
                        SampleCatalog.SIZE / 2.0, SampleCatalog.SIZE / 2.0, SampleCatalog.RADIUS, a, 5.0, 1,
                        9000L + 10L * week + k);
                pair[k] = new ImagePlus("week " + week, new ij.process.FloatProcessor(SampleCatalog.SIZE,
                        SampleCatalog.SIZE, px));
                pair[k].getCalibration().pixelWidth = SampleCatalog.PIXEL_MM;
                pair[k].getCalibration().pixelHeight = SampleCatalog.PIXEL_MM;
                pair[k].getCalibration().setUnit("mm");
                String date = java.time.LocalDate.of(2026, 10, 1).plusWeeks(week - 1L)
                        .format(java.time.format.DateTimeFormatter.BASIC_ISO_DATE);
                pair[k].setProperty("Info", "0008,0022  Acquisition Date: " + date
                        + "\n0008,0032  Acquisition Time: 083000\n");
            }
            QaMeasure.run(pair[0], pair[1], null, history, null);
        }
        Sample a = SampleCatalog.first(Use.PAIR_FIRST);
        Sample b = SampleCatalog.first(Use.PAIR_SECOND);
        QaMeasure.Options now = new QaMeasure.Options(0.75, null, 1, 1.5, true, "Aster", "head", "weekly uniformity",
                5, log, report, true, 1);
        QaMeasure.Outcome o = QaMeasure.run(open(a), open(b), null, now, samples.resolve(a.file()));
        var r = o.result();
        out.printf(Locale.ROOT, "%n%s + %s  (week 7; weeks 1-6 are an invented history in the log)%n", a.file(), b.file());
        out.printf(Locale.ROOT, "  SNR (%s method) %.2f [%.2f, %.2f], true %.2f; verdict %s%n", r.method(), r.snr(),
                r.snrCi95().low(), r.snrCi95().high(), a.trueSnr(), r.verdict().key());
        out.printf(Locale.ROOT, "  percent integral uniformity %.2f%% (limit >= %.1f%%), NEMA non-uniformity %.2f%%%n",
                r.piu(), r.limits().minimumPiu(), r.nemaNonUniformity());
        out.printf(Locale.ROOT, "  percent-signal ghosting %.3f%% (limit <= %.1f%%)%n", r.ghostingPercent(),
                r.limits().maximumGhostingPercent());
        out.println("  flags: " + (o.flags().isEmpty() ? "none" : String.join("; ", o.flags())));
        out.println("  QA log: " + log + " (" + (o.history().size() + 1) + " sessions)");
        out.println("  report: " + report + "  (open it in a browser)");
    }

    private void heading(String text) {
        out.println();
        out.println(text);
        out.println("-".repeat(text.length()));
    }

    private void title(Sample s) {
        out.printf(Locale.ROOT, "%n%s  (%s)%n", s.file(), s.description());
        out.printf(Locale.ROOT, ROW, "", "true", "measured", "95% interval");
    }

    private void line(String what, double truth, double measured, String ci) {
        out.printf(Locale.ROOT, ROW, what, fmt(truth), fmt(measured), ci);
    }

    private static String fmt(double v) {
        return Double.isNaN(v) ? "n/a" : String.format(Locale.ROOT, "%.3f", v);
    }

    private static String ci(double lo, double hi) {
        return String.format(Locale.ROOT, "[%.3f, %.3f]", lo, hi);
    }

    private void warnings(List<Warning> warnings) {
        if (warnings.isEmpty()) {
            out.println("  warnings: none");
        }
        for (Warning w : warnings) {
            out.println("  warning [" + w.code() + "]: " + w.message());
        }
    }

    private ImagePlus open(Sample s) throws InputException {
        return ImageFiles.open(samples.resolve(s.file()));
    }

    private static Region region(String name, Rect r) throws InputException {
        return Region.rectangle(name, r.x(), r.y(), r.w(), r.h(), SampleCatalog.SIZE, SampleCatalog.SIZE);
    }

    private static List<Region> backgroundRegions(Sample s) throws InputException {
        List<Region> bg = new ArrayList<>();
        for (int i = 0; i < s.background().size(); i++) {
            bg.add(region("background " + (i + 1), s.background().get(i)));
        }
        return bg;
    }

    private void background(Sample s) throws InputException {
        float[] px = ImagePlanes.calibratedPixels(open(s), 1);
        Region signal = region("signal", s.signal());
        List<Region> bg = backgroundRegions(s);
        BackgroundSnrResult r = BackgroundSnr.analyze(px, SampleCatalog.SIZE, SampleCatalog.SIZE, signal, bg,
                new BackgroundSnr.Options(s.channels(), SigmaEstimator.ML));
        SigmaEstimate sig = r.sigma();
        CorrectedSnr f = r.figures();
        title(s);
        line("noise sigma, L = " + s.channels() + " (a.u.)", s.sigma(), sig.sigma(), ci(sig.ci95().low(), sig.ci95().high()));
        line("SNR (corrected)", s.trueSnr(), f.snr(), ci(f.snrCi95().low(), f.snrCi95().high()));
        line("SNR plain (signal mean / sigma)", s.trueSnr(), f.magnitudeSnr(),
                String.format(Locale.ROOT, "(%+.1f%%: magnitude bias)", 100 * (f.magnitudeSnr() / s.trueSnr() - 1)));
        double hand = r.signal().stats().mean() / r.background().sd();
        line("hand method S / SD(air)", s.trueSnr(), hand,
                String.format(Locale.ROOT, "(%+.0f%% off)", 100 * (hand / s.trueSnr() - 1)));
        if (s.channels() > 1) {
            BackgroundSnrResult wrong = BackgroundSnr.analyze(px, SampleCatalog.SIZE, SampleCatalog.SIZE, signal, bg,
                    new BackgroundSnr.Options(1, SigmaEstimator.MEAN));
            line("sigma if L = 1 were assumed", s.sigma(), wrong.sigma().sigma(), String.format(Locale.ROOT,
                    "(%.2fx the truth: the channel count matters)", wrong.sigma().sigma() / s.sigma()));
            out.println("    with L = 1 assumed, the verdict is " + wrong.verdict().key() + ": "
                    + wrong.warnings().stream().filter(w -> w.code().startsWith("channels"))
                    .map(Warning::message).findFirst().orElse("(no channel warning)"));
            BackgroundSnrResult auto = BackgroundSnr.analyze(px, SampleCatalog.SIZE, SampleCatalog.SIZE, signal, bg,
                    new BackgroundSnr.Options(null, SigmaEstimator.ML, null, null));
            var ce = auto.diagnosis().channelEstimate();
            line("channels estimated (auto)", s.channels(), ce.channels(), ci(ce.low(), ce.high()));
        }
        warnings(r.warnings());
    }

    private void difference(Sample a, Sample b) throws InputException {
        DifferenceSnrResult r = DifferenceSnr.analyze(ImagePlanes.calibratedPixels(open(a), 1),
                ImagePlanes.calibratedPixels(open(b), 1), SampleCatalog.SIZE, region("signal", a.signal()), a.channels());
        CorrectedSnr f = r.figures();
        title(a);
        out.println("  with " + b.file() + "; magnitude SD = SD(difference) / sqrt(2) over the signal region");
        line("noise sigma (corrected, a.u.)", a.sigma(), f.sigma(), ci(f.sigmaCi95().low(), f.sigmaCi95().high()));
        line("SNR (corrected)", a.trueSnr(), f.snr(), ci(f.snrCi95().low(), f.snrCi95().high()));
        line("SNR plain (NEMA sqrt2 S / SD diff)", a.trueSnr(), r.magnitudeSnr(),
                ci(r.magnitudeSnrCi95().low(), r.magnitudeSnrCi95().high()));
        warnings(r.warnings());
    }

    private void repeated(Sample s) throws InputException {
        ImagePlus imp = open(s);
        RepeatedAcquisitions.Maps m = RepeatedMaps.compute(imp, 1);
        Region signal = region("signal", s.signal());
        RepeatedSnrResult r = RepeatedAcquisitions.summarize(m, RepeatedMaps.frames(imp, 1), signal, s.channels());
        CorrectedSnr f = r.figures();
        title(s);
        out.println("  " + m.repeats() + " repeats; magnitude SD = sqrt(region mean of per-pixel variances)");
        line("signal, magnitude mean (a.u.)", s.amplitude(), r.signalMean(),
                String.format(Locale.ROOT, "(%+.0f%%: Rician bias)", 100 * (r.signalMean() / s.amplitude() - 1)));
        line("signal amplitude (corrected)", s.amplitude(), f.amplitude(), ci(f.amplitudeCi95().low(),
                f.amplitudeCi95().high()));
        line("noise sigma, plain pooled SD", s.sigma(), r.sigmaMagnitude(), String.format(Locale.ROOT,
                "(%+.0f%%)", 100 * (r.sigmaMagnitude() / s.sigma() - 1)));
        line("noise sigma (corrected)", s.sigma(), f.sigma(), ci(f.sigmaCi95().low(), f.sigmaCi95().high()));
        line("SNR plain", s.trueSnr(), r.magnitudeSnr(), ci(r.magnitudeSnrCi95().low(), r.magnitudeSnrCi95().high()));
        line("SNR (corrected)", s.trueSnr(), f.snr(), ci(f.snrCi95().low(), f.snrCi95().high()));
        line("mean of the SNR map (biased)", s.trueSnr(), r.snrMapMean(),
                String.format(Locale.ROOT, "(expected %.2fx the plain SNR for K = %d)", r.snrMapBias(), m.repeats()));
        warnings(r.warnings());
    }

    private void check(Sample s) throws InputException {
        ImagePlus imp = open(s);
        BackgroundCheck.Result r = BackgroundCheck.check(org.noisewise.estimate.BackgroundNoise.measure(
                ImagePlanes.calibratedPixels(imp, 1), SampleCatalog.SIZE, backgroundRegions(s)), s.channels(),
                BackgroundValues.storage(imp));
        out.printf(Locale.ROOT, "%n%s  (%s)%n", s.file(), s.description());
        out.printf(Locale.ROOT, "  background check verdict: %s   (L = %d, fit p = %s, estimator agreement p = %s, zeros %.1f%%)%n",
                r.verdict().key(), s.channels(), fmt(r.fitP()), fmt(r.agreementP()), 100 * r.zeroFraction());
        for (Warning w : r.reasons()) {
            out.println("  reason [" + w.code() + "]: " + w.message());
        }
        if (s.use() == Use.MASKED) {
            BackgroundSnrResult r2 = BackgroundSnr.analyze(ImagePlanes.calibratedPixels(imp, 1), SampleCatalog.SIZE,
                    SampleCatalog.SIZE, region("signal", s.signal()), backgroundRegions(s),
                    new BackgroundSnr.Options(s.channels(), SigmaEstimator.ML));
            out.println("  background SNR: " + (Double.isNaN(r2.snr()) ? "not reported" : fmt(r2.snr()))
                    + " (verdict " + r2.verdict().key() + ")");
        }
    }
}
