package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.ImagePlus;
import ij.ImageStack;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.report.BackgroundSnrRows;
import org.noisewise.testing.TestImages;

class BatchCommandTest {

    @TempDir
    Path dir;
    Path data;

    private static final String[] REGIONS = {"--signal", "38,38,20,20", "--background", "1,1,14,14",
        "--background", "80,80,14,14"};

    @BeforeEach
    void folder() throws IOException {
        data = Files.createDirectory(dir.resolve("week 48"));
        TestImages.saveTiff(TestImages.phantom("b", 100, 4, 1, 2), data, "b_monday.tif");
        TestImages.saveTiff(TestImages.phantom("a", 90, 4, 1, 1), data, "a_friday.tif");
        Path sub = Files.createDirectory(data.resolve("scanner2"));
        TestImages.saveTiff(TestImages.phantom("c", 80, 4, 1, 3), sub, "c.tif");
        Files.writeString(data.resolve("notes.txt"), "phantom filled on Monday");
        Files.write(data.resolve("broken.tif"), new byte[] {1, 2, 3, 4, 5});
        ImagePlus small = new ImagePlus("small", new ij.process.FloatProcessor(20, 20));
        TestImages.saveTiff(small, sub, "too_small.tif");
    }

    private static String[] args(String... more) {
        String[] base = {"batch"};
        return Stream.of(base, more, REGIONS).flatMap(Arrays::stream).toArray(String[]::new);
    }

    @Test
    void mixedFolderGivesARowPerFileInSortedOrder() {
        CliRunner.Result r = CliRunner.run(args(data.toString(), "--method", "background", "--json"));
        assertEquals(BatchCommand.EXIT_SOME_FAILED, r.status(), r.err());
        JsonArray rows = JsonParser.parseString(r.out()).getAsJsonArray();
        List<String> images = rows.asList().stream().map(e -> e.getAsJsonObject().get("image").getAsString()).toList();
        // a text file is no image: left out with a note (issue 20.11), never a row calling it "the 3x0 image"
        assertEquals(List.of("a_friday.tif", "b_monday.tif", "broken.tif",
                Path.of("scanner2", "c.tif").toString(), Path.of("scanner2", "too_small.tif").toString()), images);
        assertTrue(r.err().contains("not images were left out: notes.txt"), r.err());
        JsonObject broken = rows.get(2).getAsJsonObject();
        assertEquals("error", broken.get("status").getAsString());
        assertTrue(broken.get("error").getAsString().contains("cannot read"));
        JsonObject small = rows.get(4).getAsJsonObject();
        assertTrue(small.get("error").getAsString().contains("outside the 20x20 image"), small.toString());
        JsonObject ok = rows.get(0).getAsJsonObject();
        assertEquals("ok", ok.get("status").getAsString());
        assertEquals("valid", ok.get("verdict").getAsString());
        assertEquals(22.5, ok.get("snr").getAsDouble(), 2.0);
        assertTrue(r.err().contains("5 item(s), 3 measured, 2 failed"), r.err());
        assertTrue(r.err().contains("batch: 5/5"), "progress lines: " + r.err());
    }

    @Test
    void csvHasTheImageJTableColumnsAndIsNeverOverwrittenWithoutForce() throws Exception {
        Path csv = dir.resolve("results.csv");
        CliRunner.Result r = CliRunner.run(args(data.toString(), "--method", "background", "--out", csv.toString()));
        assertEquals(BatchCommand.EXIT_SOME_FAILED, r.status());
        List<String> lines = Files.readAllLines(csv);
        assertEquals(6, lines.size(), "a header and a row per image (the text file is left out)");
        // the same headings, in the same order, as the ImageJ table of the background command
        ImagePlus imp = TestImages.phantom("x", 100, 4, 1, 2);
        float[] px = (float[]) imp.getProcessor().getPixels();
        var result = BackgroundSnr.analyze(px, 96, 96, org.noisewise.estimate.Region.rectangle("s", 38, 38, 20, 20, 96, 96),
                List.of(org.noisewise.estimate.Region.rectangle("b", 1, 1, 14, 14, 96, 96)), BackgroundSnr.Options.defaults());
        List<String> tableHeadings = org.noisewise.report.ProtocolRows.addEfficiency(
                BackgroundSnrRows.row("x", 1, "a.u.", result), null).headings();
        String expected = String.join(",", tableHeadings.stream()
                .map(h -> h.contains(",") ? '"' + h + '"' : h).toList()) + ",Status,Error";
        assertEquals(expected, lines.get(0));
        String before = Files.readString(csv);
        CliRunner.Result again = CliRunner.run(args(data.toString(), "--method", "background", "--out", csv.toString()));
        assertEquals(3, again.status());
        assertTrue(again.err().contains("--force"));
        assertEquals(before, Files.readString(csv), "an existing file was changed without --force");
        CliRunner.Result forced = CliRunner.run(args(data.toString(), "--method", "background", "--out", csv.toString(),
                "--force", "--estimator", "median"));
        assertEquals(BatchCommand.EXIT_SOME_FAILED, forced.status());
        assertTrue(Files.readString(csv).contains(",median,"));
        try (Stream<Path> files = Files.list(dir)) {
            assertFalse(files.anyMatch(p -> p.getFileName().toString().endsWith(".part")), "temporary file left behind");
        }
    }

    @Test
    void cleanFolderExitsZeroAndBadFolderExitsThree() throws IOException {
        Path clean = Files.createDirectory(dir.resolve("clean"));
        TestImages.saveTiff(TestImages.phantom("a", 90, 4, 1, 1), clean, "a.tif");
        CliRunner.Result ok = CliRunner.run(args(clean.toString(), "--method", "background"));
        assertEquals(0, ok.status(), ok.err());
        assertTrue(ok.out().contains("a.tif"));
        CliRunner.Result missing = CliRunner.run(args(dir.resolve("nope").toString(), "--method", "background"));
        assertEquals(3, missing.status());
        assertEquals(2, CliRunner.run(args(clean.toString(), "--method", "nonsense")).status());
    }

    @Test
    void repeatAndDifferenceOverStacksAndADicomSeries() throws IOException {
        Path stacks = Files.createDirectory(dir.resolve("stacks"));
        ImageStack st = new ImageStack(96, 96);
        for (int f = 0; f < 6; f++) {
            st.addSlice(TestImages.phantom("f", 100, 4, 1, 30 + f).getProcessor());
        }
        TestImages.saveTiff(new ImagePlus("s", st), stacks, "repeats.tif");
        CliRunner.Result rep = CliRunner.run(args(stacks.toString(), "--method", "repeat", "--json"));
        assertEquals(0, rep.status(), rep.err());
        JsonObject row = JsonParser.parseString(rep.out()).getAsJsonArray().get(0).getAsJsonObject();
        assertEquals(6, row.get("repeats").getAsInt());
        CliRunner.Result diff = CliRunner.run(args(stacks.toString(), "--method", "difference", "--frames", "2,5", "--json"));
        assertEquals(0, diff.status(), diff.err());
        assertEquals(4.0, JsonParser.parseString(diff.out()).getAsJsonArray().get(0).getAsJsonObject()
                .get("sigma").getAsDouble(), 0.6);
        Path dicom = Files.createDirectory(dir.resolve("dicom"));
        org.noisewise.testing.OpenData.copy("MR_small.dcm", dicom.resolve("IM0001"));
        CliRunner.Result d = CliRunner.run("batch", dicom.toString(), "--method", "background", "--signal", "20,20,20,20",
                "--background", "0,0,8,8", "--json");
        JsonObject dr = JsonParser.parseString(d.out()).getAsJsonArray().get(0).getAsJsonObject();
        assertTrue(dr.get("image").getAsString().contains("DICOM series"), dr.toString());
        assertEquals("ok", dr.get("status").getAsString());
    }
}
