package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.io.DicomSeriesWriter;
import org.noisewise.testing.ScannerSeries;
import org.noisewise.testing.TestImages;

/**
 * Issue 19 through the command line, as a physicist runs it on files written as scanners write them:
 * every command that works over repeats measures each z slice of a DICOM folder or enhanced file,
 * with the figures the same data give as a TIFF hyperstack, and says how the series was arranged.
 */
class ScannerSeriesCliTest {

    private static final int Z = 4;
    private static final int T = 20;
    private static final long SEED = 1904;

    @TempDir
    static Path dir;

    static Path folder;
    static Path tiff;

    @BeforeAll
    static void write() {
        folder = ScannerSeries.folder(ScannerSeries.spec("cli", Z, T, SEED, false), dir, "cli_series");
        tiff = ScannerSeries.tiff(Z, T, SEED, dir, "cli_series.tif");
    }

    private static JsonArray rows(CliRunner.Result r) {
        assertEquals(0, r.status(), r.err());
        JsonElement e = JsonParser.parseString(r.out());
        if (e.isJsonArray()) {
            return e.getAsJsonArray();
        }
        JsonArray a = new JsonArray();
        a.add(e);
        return a;
    }

    private static double[] interval(JsonObject row, String key) {
        JsonArray a = row.getAsJsonArray(key);
        return new double[] {a.get(0).getAsDouble(), a.get(1).getAsDouble()};
    }

    /** The case: 4 slices x 20 repeats of true SNR 100, 120, 140 and 160. */
    @Test
    void repeatMeasuresEachSliceOfAFolderAsTheHyperstackDoes() {
        CliRunner.Result r = CliRunner.run("repeat", folder.toString(), "--signal", ScannerSeries.SIGNAL, "--json");
        JsonArray dicom = rows(r);
        JsonArray hyper = rows(CliRunner.run("repeat", tiff.toString(), "--signal", ScannerSeries.SIGNAL, "--json"));
        assertTrue(r.err().contains("4 slices x 20 repeats from DICOM positions (along the slice normal, increasing) "
                + "and Temporal Position Identifier (0020,0100)"), r.err());
        assertSlicesAsTheHyperstack(dicom, hyper, Z);
    }

    /**
     * Each z slice's row of a DICOM series: its number, T repeats, the TIFF hyperstack's SNR for the same
     * stored values, and an interval that contains the true SNR.
     */
    private static void assertSlicesAsTheHyperstack(JsonArray dicom, JsonArray hyper, int slices) {
        assertEquals(slices, dicom.size());
        for (int z = 0; z < slices; z++) {
            JsonObject d = dicom.get(z).getAsJsonObject();
            JsonObject h = hyper.get(z).getAsJsonObject();
            assertEquals(z + 1, d.get("slice").getAsInt());
            assertEquals(T, d.get("repeats").getAsInt());
            assertEquals(h.get("snr").getAsDouble(), d.get("snr").getAsDouble(), 1e-9 * h.get("snr").getAsDouble(),
                    "slice " + (z + 1) + ": the same figure as the TIFF hyperstack");
            double truth = ScannerSeries.amplitude(z) / ScannerSeries.SIGMA;
            double[] ci = interval(d, "snr_ci95");
            assertTrue(ci[0] <= truth && truth <= ci[1], "slice " + (z + 1) + ": " + truth + " in " + ci[0] + "-" + ci[1]);
        }
    }

    /**
     * A folder of Siemens mosaics (a file per repeat, 5 slices tiled 3 x 3): repeat and stability measure
     * each slice as the TIFF hyperstack of the same stored values gives it, and say how the files were cut.
     */
    @Test
    void siemensMosaicsAreMeasuredSliceBySlice() {
        int z5 = 5;
        Path mosaics = ScannerSeries.mosaicFolder(ScannerSeries.spec("climosaic", z5, T, SEED, false), dir,
                "cli_mosaics");
        Path mosaicTiff = ScannerSeries.tiff(z5, T, SEED, dir, "cli_mosaics.tif");
        CliRunner.Result r = CliRunner.run("repeat", mosaics.toString(), "--signal", ScannerSeries.SIGNAL, "--json");
        JsonArray dicom = rows(r);
        JsonArray hyper = rows(CliRunner.run("repeat", mosaicTiff.toString(), "--signal", ScannerSeries.SIGNAL,
                "--json"));
        assertTrue(r.err().contains("5 slices x 20 repeats from the tiles of each Siemens mosaic (5 slices in 3 x 3 tiles "
                + "of 64 x 64"), r.err());
        assertSlicesAsTheHyperstack(dicom, hyper, z5);
        JsonArray stab = rows(CliRunner.run("stability", mosaics.toString(), "--json"));
        JsonArray stabTiff = rows(CliRunner.run("stability", mosaicTiff.toString(), "--json"));
        assertEquals(z5, stab.size());
        for (int z = 0; z < z5; z++) {
            assertEquals(stabTiff.get(z).getAsJsonObject().get("sfnr").getAsDouble(),
                    stab.get(z).getAsJsonObject().get("sfnr").getAsDouble(), 1e-9 * stabTiff.get(z).getAsJsonObject()
                            .get("sfnr").getAsDouble(), "slice " + (z + 1));
        }
    }

    @Test
    void anEnhancedFileWithPerFrameRescaleGivesTheSameSlices() {
        Path enh = ScannerSeries.enhanced(ScannerSeries.spec("clienh", Z, T, SEED, true)
                .numbering(DicomSeriesWriter.Numbering.SLICE_MAJOR), dir, "cli_enhanced.dcm");
        CliRunner.Result r = CliRunner.run("repeat", enh.toString(), "--signal", ScannerSeries.SIGNAL, "--json");
        JsonArray rows = rows(r);
        assertEquals(Z, rows.size());
        assertTrue(r.err().contains("Temporal Position Index (0020,9128)"), r.err());
        for (int z = 0; z < Z; z++) {
            JsonObject d = rows.get(z).getAsJsonObject();
            double truth = ScannerSeries.amplitude(z) / ScannerSeries.SIGMA;
            double[] ci = interval(d, "snr_ci95");
            assertTrue(ci[0] <= truth && truth <= ci[1], "slice " + (z + 1) + ": " + truth + " in " + ci[0] + "-" + ci[1]);
        }
    }

    @Test
    void stabilityOfAFunctionalQaExport() {
        Path series = ScannerSeries.folder(ScannerSeries.spec("stab", 3, 60, SEED, false), dir, "stab");
        CliRunner.Result r = CliRunner.run("stability", series.toString(), "--json");
        JsonArray rows = rows(r);
        assertEquals(3, rows.size());
        assertTrue(r.err().contains("3 slices x 60 repeats"), r.err());
        for (int z = 0; z < 3; z++) {
            JsonObject d = rows.get(z).getAsJsonObject();
            double truth = ScannerSeries.amplitude(z) / ScannerSeries.SIGMA;
            double[] ci = interval(d, "sfnr_ci95");
            assertTrue(ci[0] <= truth && truth <= ci[1], "slice " + (z + 1) + " SFNR " + d.get("sfnr") + ": " + truth
                    + " in " + ci[0] + "-" + ci[1]);
        }
    }

    @Test
    void differenceComparesTwoFramesOfEverySlice() {
        JsonArray rows = rows(CliRunner.run("difference", folder.toString(), "--frames", "1,2", "--signal",
                ScannerSeries.SIGNAL, "--json"));
        JsonArray hyper = rows(CliRunner.run("difference", tiff.toString(), "--frames", "1,2", "--signal",
                ScannerSeries.SIGNAL, "--json"));
        assertEquals(Z, rows.size());
        for (int z = 0; z < Z; z++) {
            assertEquals(hyper.get(z).getAsJsonObject().get("snr").getAsDouble(),
                    rows.get(z).getAsJsonObject().get("snr").getAsDouble(), 1e-6);
        }
    }

    /**
     * compare and gfactor per z slice of two DICOM series: the same figures as the two TIFF hyperstacks
     * of the same data give, near the truth (ratio and g of 1: equal protocols and noise). Interval
     * coverage of the true ratio and g is counted over many trials in ProtocolScalingTest and GFactorTest.
     */
    @Test
    void compareAndGfactorOnTwoDicomSeries() {
        Path other = ScannerSeries.folder(ScannerSeries.spec("cli_b", Z, T, SEED + 1, false), dir, "cli_b");
        Path otherTiff = ScannerSeries.tiff(Z, T, SEED + 1, dir, "cli_b.tif");
        for (String[] cmd : new String[][] {{"compare", "ratio_measured"}, {"gfactor", "g_mean"}}) {
            String[] extra = cmd[0].equals("gfactor") ? new String[] {"--acceleration", "1"} : new String[0];
            JsonArray dicom = rows(CliRunner.run(CliRunner.concat(new String[] {cmd[0], folder.toString(), other.toString(),
                "--signal", ScannerSeries.SIGNAL, "--json"}, extra)));
            JsonArray hyper = rows(CliRunner.run(CliRunner.concat(new String[] {cmd[0], tiff.toString(), otherTiff.toString(),
                "--signal", ScannerSeries.SIGNAL, "--json"}, extra)));
            assertEquals(Z, dicom.size(), cmd[0]);
            for (int z = 0; z < Z; z++) {
                double d = dicom.get(z).getAsJsonObject().get(cmd[1]).getAsDouble();
                assertEquals(hyper.get(z).getAsJsonObject().get(cmd[1]).getAsDouble(), d, 1e-9, cmd[0] + " z " + z);
                // each ratio of two SNRs from 20 x 256 samples has an SD of about 1.4%: within 6 SDs of 1
                assertEquals(1.0, d, 0.085, cmd[0] + " z " + z);
            }
        }
    }

    @Test
    void qaTakesTheRepeatsOfTheChosenSlice() {
        CliRunner.Result r = CliRunner.run("qa", folder.toString(), "--slice", "3", "--json");
        JsonObject row = rows(r).get(0).getAsJsonObject();
        assertEquals("repeated", row.get("method").getAsString(), row.toString());
        assertEquals(3, row.get("slice").getAsInt());
    }

    /**
     * The single-plane methods measure every plane of the series; each row names the plane's z slice and
     * repeat, and a plane number beyond the series says how the planes are counted.
     */
    @Test
    void planeByPlaneRowsNameTheirSliceAndRepeat() throws Exception {
        JsonArray rows = rows(CliRunner.run("background", folder.toString(), "--signal", ScannerSeries.SIGNAL,
                "--background", "2,2,10,10", "--background", "52,52,10,10", "--json"));
        assertEquals(Z * T, rows.size());
        for (int n = 1; n <= Z * T; n++) {
            JsonObject row = rows.get(n - 1).getAsJsonObject();
            assertEquals(n, row.get("slice").getAsInt());
            assertEquals((n - 1) % Z + 1, row.get("z").getAsInt(), "plane " + n);
            assertEquals((n - 1) / Z + 1, row.get("repeat").getAsInt(), "plane " + n);
            // the amplitude rises with z (100 + 20 z): the z named is the one measured
            assertEquals(ScannerSeries.amplitude(row.get("z").getAsInt() - 1),
                    row.get("signal_amplitude").getAsDouble(), 1.0, "plane " + n);
        }
        CliRunner.Result text = CliRunner.run("check", folder.toString(), "--background", "2,2,10,10", "--slice", "6");
        assertEquals(0, text.status(), text.err());
        assertTrue(text.out().contains("Z slice") && text.out().contains("Repeat"), text.out());
        CliRunner.Result beyond = CliRunner.run("background", folder.toString(), "--signal", ScannerSeries.SIGNAL,
                "--background", "2,2,10,10", "--slice", String.valueOf(Z * T + 1));
        assertEquals(3, beyond.status());
        assertTrue(beyond.err().contains(Z * T + " planes (" + Z + " z slice(s) x " + T + " repeat(s)"), beyond.err());
        // a plain 2-D image's rows are as before
        Path flat = TestImages.saveTiff(TestImages.phantom("flat", 100, 4, 1, 7), dir, "flat.tif");
        JsonObject one = rows(CliRunner.run("background", flat.toString(), "--signal", "38,38,20,20", "--background",
                "2,2,16,16", "--json")).get(0).getAsJsonObject();
        assertFalse(one.has("z") || one.has("repeat"), one.toString());
        // one batch over both: every CSV line has the same columns, blank where an image has no repeat
        Path root = Files.createDirectories(dir.resolve("mixedroot"));
        ScannerSeries.folder(ScannerSeries.spec("mixed", 2, 3, SEED, false), root, "series");
        Files.copy(flat, root.resolve("flat.tif"));
        Path csv = dir.resolve("mixed.csv");
        CliRunner.Result batch = CliRunner.run("batch", root.toString(), "--method", "background", "--signal",
                "24,24,16,16", "--background", "2,2,10,10", "--csv", csv.toString());
        assertEquals(0, batch.status(), batch.err());
        List<String> lines = Files.readAllLines(csv);
        assertEquals(1 + 2 * 3 + 1, lines.size(), String.join("\n", lines));
        List<String> head = List.of(fields(lines.get(0)));
        int zCol = head.indexOf("Z slice");
        assertTrue(zCol > 0, lines.get(0));
        for (String line : lines) {
            assertEquals(head.size(), fields(line).length, line);
        }
        long blank = lines.stream().skip(1).filter(l -> fields(l)[zCol].isEmpty()).count();
        assertEquals(1, blank, "the 2-D image's row has no z slice");
    }

    /** The fields of one CSV line (RFC 4180: commas inside quotes belong to the field). */
    private static String[] fields(String line) {
        return line.split(",(?=(?:[^\"]*\"[^\"]*\")*[^\"]*$)", -1);
    }

    @Test
    void batchMeasuresEverySliceOfTheSeries() throws Exception {
        Path root = Files.createDirectories(dir.resolve("batchroot"));
        ScannerSeries.folder(ScannerSeries.spec("batch", 2, 5, SEED, false), root, "week49");
        // an export as media hold it: a DICOMDIR at the top (pydicom's, made by DCMTK's dcmmkdir; see the
        // opendata README), which is DICOM but not an image
        org.noisewise.testing.OpenData.copy("DICOMDIR", root.resolve("DICOMDIR"));
        CliRunner.Result r = CliRunner.run("batch", root.toString(), "--method", "repeat", "--signal",
                ScannerSeries.SIGNAL, "--json");
        JsonArray rows = rows(r);
        assertEquals(2, rows.size(), "the series' two slices and no row for the DICOMDIR");
        assertEquals(5, rows.get(1).getAsJsonObject().get("repeats").getAsInt());
        assertEquals(2, rows.get(1).getAsJsonObject().get("slice").getAsInt());
        assertTrue(r.err().contains("1 file(s) that are not images were left out: DICOMDIR"), r.err());
        // the export's top folder given to a measuring command: what to do instead
        CliRunner.Result top = CliRunner.run("repeat", root.toString(), "--signal", ScannerSeries.SIGNAL);
        assertEquals(NoisewiseCli.EXIT_INPUT, top.status());
        assertTrue(top.err().contains("holds no DICOM images, only 1 DICOM file(s) that are not images (DICOMDIR): "
                + "give the folder of one series"), top.err());
    }

    @Test
    void incompleteAndMultiEchoSeriesAreRefusedWithExit3() throws Exception {
        Path miss = ScannerSeries.folder(ScannerSeries.spec("cli_miss", Z, T, SEED, false).drop(0, 4), dir, "miss");
        CliRunner.Result r = CliRunner.run("repeat", miss.toString(), "--signal", ScannerSeries.SIGNAL);
        assertEquals(3, r.status());
        assertTrue(r.err().contains("slice 1 of 4") && r.err().contains("repeat 5 of 20"), r.err());
        assertEquals(1, r.err().strip().lines().count(), "one line, no stack trace: " + r.err());
        Path echoes = Files.createDirectories(dir.resolve("echoes"));
        for (int echo = 1; echo <= 2; echo++) {
            DicomSeriesWriter.Spec spec = ScannerSeries.spec("cli_echo", 2, 3, SEED + echo, false).echo(echo, 12.0 * echo);
            for (DicomSeriesWriter.File f : DicomSeriesWriter.singleFrame(spec)) {
                Files.write(echoes.resolve(f.name()), f.bytes());
            }
        }
        CliRunner.Result mixed = CliRunner.run("repeat", echoes.toString(), "--signal", ScannerSeries.SIGNAL);
        assertEquals(3, mixed.status());
        assertTrue(mixed.err().contains("2 echoes") && mixed.err().contains("--echo N"), mixed.err());
        JsonArray two = rows(CliRunner.run("repeat", echoes.toString(), "--echo", "2", "--signal", ScannerSeries.SIGNAL,
                "--json"));
        assertEquals(2, two.size());
    }
}
