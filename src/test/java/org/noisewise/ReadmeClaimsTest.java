package org.noisewise;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.ImagePlus;
import ij.process.FloatProcessor;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.cli.NoisewiseCli;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageMetadata;
import org.noisewise.io.RepeatedMaps;
import org.noisewise.io.RoleNames;
import org.noisewise.measure.BackgroundMeasure;
import org.noisewise.measure.Progress;
import org.noisewise.measure.QaMeasure;
import org.noisewise.measure.Roles;
import org.noisewise.sample.Phantoms;
import org.noisewise.testing.DicomEdit;

/** Each claim the README makes, checked so that the README cannot drift from what the code does (issue 15.3). */
class ReadmeClaimsTest {

    @TempDir
    Path dir;

    private record Run(int status, String out, String err) {
    }

    private static Run cli(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int s = NoisewiseCli.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new Run(s, out.toString(), err.toString());
    }

    private static String readme() throws Exception {
        return Files.readString(Path.of("README.md"));
    }

    private static final String[] WORKED = {"background", "sample-images/aster_disk_1ch.tif", "--signal", "49,49,30,30",
        "--background", "2,2,24,24", "--background", "102,2,24,24", "--background", "2,102,24,24", "--background",
        "102,102,24,24"};

    /** The worked example: its output lines are in the README as printed, and so is the hand method's error. */
    @Test
    void workedExampleNumbers() throws Exception {
        Run r = cli(WORKED);
        assertEquals(0, r.status(), r.err());
        String readme = readme();
        for (String line : r.out().lines().limit(16).toList()) {
            assertTrue(readme.contains(line.stripTrailing()), "README lacks the output line: " + line);
        }
        List<String> json = List.of(WORKED);
        Run j = cli(java.util.stream.Stream.concat(json.stream(), java.util.stream.Stream.of("--json"))
                .toArray(String[]::new));
        JsonObject o = JsonParser.parseString(j.out()).getAsJsonObject();
        double hand = o.get("signal_mean").getAsDouble() / o.get("background_sd").getAsDouble();
        double truth = 24.0;
        assertTrue(readme.contains(String.format(Locale.ROOT, "gives %.1f on the same regions", hand)), "hand " + hand);
        assertTrue(readme.contains(String.format(Locale.ROOT, "%.0f%% too high", 100 * (hand / truth - 1))));
    }

    /**
     * The DICOM worked example: the README's command on the bundled folder prints the note and, per
     * slice, the SNR and its interval to the digits the README shows; each interval holds its true SNR.
     */
    @Test
    void dicomWorkedExample() throws Exception {
        Run r = cli("repeat", "sample-images/aster_multislice_dicom", "--signal", "24,24,16,16", "--json");
        assertEquals(0, r.status(), r.err());
        String readme = readme();
        String note = r.err().lines().filter(l -> l.contains("slices x")).findFirst().orElseThrow();
        assertTrue(readme.contains(note), "README lacks the note: " + note);
        com.google.gson.JsonArray rows = JsonParser.parseString(r.out()).getAsJsonArray();
        for (int z = 1; z <= 4; z++) {
            JsonObject o = rows.get(z - 1).getAsJsonObject();
            String line = String.format(Locale.ROOT, "%-6d %-16.1f %-12.1f %-13.1f %d", z, o.get("snr").getAsDouble(),
                    o.getAsJsonArray("snr_ci95").get(0).getAsDouble(), o.getAsJsonArray("snr_ci95").get(1).getAsDouble(),
                    o.get("repeats").getAsInt());
            assertTrue(readme.contains(line), "README lacks the row: " + line);
            double truth = org.noisewise.sample.DicomSample.trueSnr(z);
            assertTrue(o.getAsJsonArray("snr_ci95").get(0).getAsDouble() <= truth
                    && truth <= o.getAsJsonArray("snr_ci95").get(1).getAsDouble(), "slice " + z);
        }
    }

    /** The contrast-to-noise section's worked example: the command as printed, its lines in the README. */
    @Test
    void contrastWorkedExample() throws Exception {
        Run r = cli("repeat", "sample-images/bramble_two_gels_repeats.tif", "--signal", "54,30,20,20", "--contrast",
                "56,72,16,16", "--channels", "8");
        assertEquals(0, r.status(), r.err());
        String readme = readme();
        assertTrue(readme.contains("java -jar target/noisewise.jar repeat sample-images/bramble_two_gels_repeats.tif \\\n"
                + "     --signal 54,30,20,20 --contrast 56,72,16,16 --channels 8"), "the README's command");
        int lines = 0;
        for (String line : r.out().lines().toList()) {
            if (line.startsWith("CNR") || line.startsWith("Contrast")) {
                assertTrue(readme.contains(line + "\n"), "README lacks the line: " + line);
                lines++;
            }
        }
        assertEquals(9, lines);
    }

    /**
     * The CNR bias table: each plain CNR cell recomputed from the exact noncentral-chi means
     * (signal at 10 sigma), e.g. 6.32 (-21.0%) for L = 8 and a contrast at 2 sigma.
     */
    @Test
    void contrastBiasTable() throws Exception {
        String readme = readme();
        double[] contrast = {5, 2, 1, 0};
        for (double c : contrast) {
            StringBuilder row = new StringBuilder();
            row.append(String.format(Locale.ROOT, "| %s | %.0f |", c == 0 ? "0 (noise only)" : String.format(Locale.ROOT,
                    "%.0f sigma", c), 10 - c));
            for (int l : new int[] {1, 4, 8}) {
                double p = org.noisewise.math.ChiMoments.mean(l, 10) - org.noisewise.math.ChiMoments.mean(l, c);
                row.append(String.format(Locale.ROOT, " %.2f (%.1f%%) |", p, 100 * (p / (10 - c) - 1))
                        .replace("(-", "(\u2212"));
            }
            assertTrue(readme.contains(row.toString()), "README lacks the row: " + row);
        }
    }

    /** The automatic-air worked example: the README's command and its figures, and the corners' figures. */
    @Test
    void automaticAirWorkedExample() throws Exception {
        String readme = readme();
        assertTrue(readme.contains("java -jar target/noisewise.jar background sample-images/aster_head_ghost.tif "
                + "--signal 24,56,16,16 --background auto"));
        Run r = cli("background", "sample-images/aster_head_ghost.tif", "--signal", "24,56,16,16", "--background", "auto",
                "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        String auto = String.format(Locale.ROOT, "finds %,d pixels of air (%.1f%% of the slice) and gives sigma %.3f "
                        + "[%.3f, %.3f] and SNR %.2f\n[%.2f, %.2f]", o.getAsJsonObject("pixels").get("background").getAsInt(),
                o.get("background_share").getAsDouble(), o.get("sigma").getAsDouble(),
                o.getAsJsonArray("sigma_ci95").get(0).getAsDouble(), o.getAsJsonArray("sigma_ci95").get(1).getAsDouble(),
                o.get("snr").getAsDouble(), o.getAsJsonArray("snr_ci95").get(0).getAsDouble(),
                o.getAsJsonArray("snr_ci95").get(1).getAsDouble());
        assertTrue(readme.contains(auto), "README lacks: " + auto);
        Run c = cli("background", "sample-images/aster_head_ghost.tif", "--signal", "24,56,16,16", "--background",
                "8,2,24,24", "--background", "96,2,24,24", "--background", "8,102,24,24", "--background", "96,102,24,24",
                "--json");
        JsonObject k = JsonParser.parseString(c.out()).getAsJsonObject();
        String corners = String.format(Locale.ROOT, "sigma %.2f [%.2f, %.2f], SNR\n%.1f [%.1f, %.1f]",
                k.get("sigma").getAsDouble(), k.getAsJsonArray("sigma_ci95").get(0).getAsDouble(),
                k.getAsJsonArray("sigma_ci95").get(1).getAsDouble(), k.get("snr").getAsDouble(),
                k.getAsJsonArray("snr_ci95").get(0).getAsDouble(), k.getAsJsonArray("snr_ci95").get(1).getAsDouble());
        assertTrue(readme.contains(corners), "README lacks: " + corners);
    }

    /** The noise-only-scan worked example: every figure the README quotes is what the command prints. */
    @Test
    void noiseScanWorkedExample() throws Exception {
        String readme = readme().replace("\n", " ");
        String img = "sample-images/bramble_accel_image.tif";
        String noise = "sample-images/bramble_accel_noise.tif";
        assertTrue(readme.contains("java -jar target/noisewise.jar background " + img + " --noise-scan " + noise
                + " --signal 56,56,16,16 --sigma-map sigma.tif"));
        JsonObject c = json(cli("background", img, "--noise-scan", noise, "--signal", "56,56,16,16", "--json"));
        JsonObject e = json(cli("background", img, "--noise-scan", noise, "--signal", "18,56,12,16", "--json"));
        JsonObject k = json(cli("background", img, "--signal", "56,56,16,16", "--channels", "4", "--background",
                "2,2,20,20", "--background", "106,2,20,20", "--background", "2,106,20,20", "--background",
                "106,106,20,20", "--json"));
        String middle = String.format(Locale.ROOT, "estimates 4 channels from the scan (%.2f) and gives sigma %.2f "
                        + "[%.2f, %.2f] and SNR %.2f [%.2f, %.2f] in the middle region",
                c.getAsJsonObject("channels_estimate").get("value").getAsDouble(), c.get("sigma").getAsDouble(),
                ci(c, "sigma_ci95", 0), ci(c, "sigma_ci95", 1), c.get("snr").getAsDouble(), ci(c, "snr_ci95", 0),
                ci(c, "snr_ci95", 1));
        String edge = String.format(Locale.ROOT, "at the edge region, sigma %.2f [%.2f, %.2f] and SNR %.2f [%.2f, %.2f]",
                e.get("sigma").getAsDouble(), ci(e, "sigma_ci95", 0), ci(e, "sigma_ci95", 1), e.get("snr").getAsDouble(),
                ci(e, "snr_ci95", 0), ci(e, "snr_ci95", 1));
        String corners = String.format(Locale.ROOT, "give sigma %.2f and, in the middle, SNR %.2f [%.2f, %.2f]: %.0f%% too "
                        + "high", k.get("sigma").getAsDouble(), k.get("snr").getAsDouble(), ci(k, "snr_ci95", 0),
                ci(k, "snr_ci95", 1), 100 * (k.get("snr").getAsDouble()
                        / org.noisewise.sample.NoiseScanSample.trueSnr(org.noisewise.sample.NoiseScanSample.CENTRE) - 1));
        for (String claim : new String[] {middle, edge, corners}) {
            assertTrue(readme.contains(claim), "README lacks: " + claim);
        }
        assertTrue(readme.contains(String.format(Locale.ROOT, "true SNR %.2f in the middle region",
                org.noisewise.sample.NoiseScanSample.trueSnr(org.noisewise.sample.NoiseScanSample.CENTRE))));
    }

    private static JsonObject json(Run r) {
        assertEquals(0, r.status(), r.err());
        return JsonParser.parseString(r.out()).getAsJsonObject();
    }

    private static double ci(JsonObject o, String key, int i) {
        return o.getAsJsonArray(key).get(i).getAsDouble();
    }

    /** "On the bundled 24-repeat sample at a true SNR of 2, the raw mean is 14% high and the corrected one within 0.5%." */
    @Test
    void repeatsSampleStatement() throws Exception {
        ImagePlus imp = ImageFiles.open(Path.of("sample-images/aster_disk_repeats.tif"));
        var m = RepeatedMaps.compute(imp, 1);
        var r = org.noisewise.estimate.RepeatedAcquisitions.summarize(m, RepeatedMaps.frames(imp, 1),
                Region.rectangle("signal", 49, 49, 30, 30, 128, 128), 1);
        assertEquals(14, Math.round(100 * (r.signalMean() / 20 - 1)));
        assertTrue(Math.abs(r.figures().amplitude() / 20 - 1) < 0.005, "corrected " + r.figures().amplitude());
        assertTrue(readme().contains("the raw mean is 14% high and the corrected one within 0.5%"));
    }

    /** Phase direction, field strength, scanner, coil, protocol and acquisition time come from DICOM. */
    @Test
    void acquisitionFactsFromDicom() throws Exception {
        byte[] d = org.noisewise.testing.OpenData.bytes("MR_small.dcm");
        d = DicomEdit.set(d, 0x0018, 0x0087, "DS", "3");
        d = DicomEdit.set(d, 0x0018, 0x1312, "CS", "ROW");
        Path f = dir.resolve("edited.dcm");
        Files.write(f, d);
        ImagePlus imp = ImageFiles.open(f);
        assertEquals(PhaseDirection.ROW, ImageMetadata.phaseDirection(imp));
        assertEquals(3.0, ImageMetadata.number(imp, "0018,0087"));
        var m = BackgroundMeasure.run(imp, "edited", new Roles(List.of(Region.rectangle("s", 20, 20, 20, 20, 64, 64)),
                List.of(Region.rectangle("b", 0, 0, 10, 10, 64, 64))), new BackgroundMeasure.Options(1, null, null),
                new int[] {1}, null, Progress.NONE);
        assertTrue(m.notes().contains("phase-encoding direction from DICOM 0018,1312: ROW"), m.notes().toString());
        assertEquals("row", m.rows().get(0).get("phase"));

        // the QA reads the rest through ImageJ's header text, as for any DICOM file
        float[] px = Phantoms.disk(128, 128, 64, 64, 40, 120, 5, 1, 3);
        ImagePlus qa = new ImagePlus("phantom", new FloatProcessor(128, 128, px));
        qa.setProperty("Info", "0008,0022  Acquisition Date: 20261105\n0008,0032  Acquisition Time: 093015\n"
                + "0008,1090  Manufacturer's Model Name: Aster\n0018,1000  Device Serial Number: 42\n"
                + "0018,1250  Receive Coil Name: HEAD\n0018,1030  Protocol Name: weekly\n0018,0087  Magnetic Field Strength: 3\n");
        Path log = dir.resolve("qa.csv");
        QaMeasure.Outcome out = QaMeasure.run(qa, null, null, new QaMeasure.Options(0.75, null, 1, null, true, null,
                null, null, 5, log, null, false, 1), null);
        assertEquals(82.0, out.result().limits().minimumPiu(), "3 T limits from 0018,0087");
        var row = org.noisewise.phantom.QaLog.parse(Files.readString(log)).get(0);
        assertEquals("2026-11-05T09:30:15", row.get("acquired"));
        assertEquals("Aster 42", row.get("scanner"));
        assertEquals("HEAD", row.get("coil"));
        assertEquals("weekly", row.get("protocol"));
    }

    /** A folder's DICOM files are grouped by 0020,000E and its slices ordered by position along the normal (0020,0032). */
    @Test
    void seriesGroupingAndOrder() throws Exception {
        byte[] d = org.noisewise.testing.OpenData.bytes("MR_small.dcm");
        Path folder = Files.createDirectory(dir.resolve("series"));
        double[] z = {20, 0, 10};
        for (int i = 0; i < 3; i++) {
            byte[] e = DicomEdit.set(d, 0x0020, 0x0013, "IS", "1");
            e = DicomEdit.set(e, 0x0008, 0x0018, "UI", "1.2.826.0.1.3680043.9.7890." + (i + 1));
            e = DicomEdit.set(e, 0x0020, 0x0032, "DS", "0\\0\\" + (int) z[i]);
            e = DicomEdit.set(e, 0x0028, 0x1052, "DS", String.valueOf((int) z[i] * 100));
            e = DicomEdit.set(e, 0x0028, 0x1053, "DS", "1");
            Files.write(folder.resolve("f" + i + ".dcm"), e);
        }
        ImagePlus imp = ImageFiles.open(folder);
        float[] ref = org.noisewise.io.ImagePlanes.calibratedPixels(ImageFiles.open(folder.resolve("f1.dcm")), 1);
        for (int n = 1; n <= 3; n++) {
            assertEquals(ref[5] + 1000 * (n - 1), org.noisewise.io.ImagePlanes.calibratedPixels(imp, n)[5], 1e-3,
                    "slice " + n + " in order of position");
        }
        Files.write(folder.resolve("other.dcm"), DicomEdit.set(d, 0x0020, 0x000E, "UI", "1.2.3.4.5"));
        InputException e = org.junit.jupiter.api.Assertions.assertThrows(InputException.class,
                () -> ImageFiles.open(folder));
        assertTrue(e.getMessage().contains("2 DICOM series"), e.getMessage());
    }

    /** batch: --csv is --out, progress and a summary line go to stderr. */
    @Test
    void batchCsvAliasProgressAndSummary() throws Exception {
        Path folder = Files.createDirectory(dir.resolve("b"));
        Files.copy(Path.of("sample-images/aster_disk_1ch.tif"), folder.resolve("a.tif"));
        Files.copy(Path.of("sample-images/aster_disk_8ch.tif".replace("aster", "bramble")), folder.resolve("b.tif"));
        Path csv = dir.resolve("r.csv");
        Run r = cli("batch", folder.toString(), "--method", "background", "--signal", "49,49,30,30", "--background",
                "2,2,24,24", "--csv", csv.toString());
        assertEquals(0, r.status(), r.err());
        assertEquals(3, Files.readAllLines(csv).size());
        assertTrue(r.err().contains("batch: 1/2 a.tif") && r.err().contains("batch: 2/2 b.tif"), r.err());
        assertTrue(r.err().contains("batch: 2 item(s), 2 measured, 0 failed, 2 row(s)"), r.err());
    }

    /** A phantom filling the field of view leaves no room for ghost regions: the no_room warning. */
    @Test
    void noRoomWarning() throws Exception {
        float[] px = Phantoms.disk(128, 128, 64, 56, 50, 120, 5, 1, 4);
        ImagePlus imp = new ImagePlus("big", new FloatProcessor(128, 128, px));
        QaMeasure.Outcome out = QaMeasure.run(imp, null, null, new QaMeasure.Options(0.75, null, 1, null, false, null,
                null, null, 5, null, null, false, 1), null);
        assertTrue(out.result().warnings().stream().anyMatch(w -> w.code().equals("no_room")));
    }

    /** Role names are not case-sensitive. */
    @Test
    void roleNamesIgnoreCase() {
        assertEquals(RoleNames.SIGNAL, RoleNames.fromName("SIGNAL region"));
        assertEquals(RoleNames.SIGNAL, RoleNames.fromName("Sig"));
        assertEquals(RoleNames.BACKGROUND, RoleNames.fromName("BG-left"));
        assertEquals(RoleNames.BACKGROUND, RoleNames.fromName("Air 2"));
        assertEquals(RoleNames.BACKGROUND, RoleNames.fromName("Noise top"));
        assertEquals(RoleNames.IGNORE, RoleNames.fromName("marker"));
    }

    /** The uniformity window is 10 mm square whatever the calibration unit: cm, micrometres, inches. */
    @Test
    void windowSizeFromPixelSizeInAnyUnit() throws Exception {
        Object[][] units = {{"cm", 0.2}, {"um", 2000.0}, {"\u00B5m", 2000.0}, {"inch", 2.0 / 25.4}, {"mm", 2.0}};
        for (Object[] u : units) {
            float[] px = Phantoms.disk(128, 128, 64, 64, 40, 120, 5, 1, 5);
            ImagePlus imp = new ImagePlus("cal", new FloatProcessor(128, 128, px));
            imp.getCalibration().setUnit((String) u[0]);
            imp.getCalibration().pixelWidth = (Double) u[1];
            imp.getCalibration().pixelHeight = (Double) u[1];
            QaMeasure.Outcome out = QaMeasure.run(imp, null, null, new QaMeasure.Options(0.75, null, 1, null, false,
                    null, null, null, 5, null, null, false, 1), null);
            assertEquals(5, out.result().windows().w(), "unit " + u[0]);
            assertNotNull(out.row());
        }
    }
}
