package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.gui.Roi;
import ij.io.RoiEncoder;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.zip.ZipEntry;
import java.util.zip.ZipOutputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.math.ChiMoments;
import org.noisewise.sample.TissueSample;

/**
 * Issue 22 on the command line, as a user runs it on the bundled two-tissue sample (8 channels, outer
 * gel 10 sigma, insert 2 sigma; generated, so the true CNR is 8): the corrected CNR's interval holds
 * 8 in the background, difference and repeated methods, while the plain CNR sits near the closed
 * form {@code mean_8(10) - mean_8(2) = 6.32} (noncentral-chi mean, reference sheet section 13).
 */
class ContrastCliTest {

    @TempDir
    Path dir;

    private static final String IMAGE = "sample-images/" + TissueSample.FILE;
    private static final String SIGNAL = TissueSample.SIGNAL.toString();
    private static final String CONTRAST = TissueSample.CONTRAST.toString();
    private static final String[] BG = {"--background", "2,2,24,24", "--background", "102,2,24,24", "--background",
        "2,102,24,24", "--background", "102,102,24,24"};

    private static JsonObject json(CliRunner.Result r) {
        assertEquals(0, r.status(), r.err());
        JsonElement e = JsonParser.parseString(r.out());
        return e.isJsonArray() ? e.getAsJsonArray().get(0).getAsJsonObject() : e.getAsJsonObject();
    }

    private static String[] args(String... a) {
        return a;
    }

    /** The figures a user reads: corrected CNR, its interval holding the truth, the plain CNR biased low. */
    private static void assertCnr(JsonObject o, double plainTolerance) {
        double cnr = o.get("cnr").getAsDouble();
        JsonArray ci = o.getAsJsonArray("cnr_ci95");
        assertTrue(ci.get(0).getAsDouble() <= TissueSample.trueCnr() && TissueSample.trueCnr() <= ci.get(1).getAsDouble(),
                "CNR " + cnr + " " + ci);
        assertEquals(TissueSample.trueCnr(), cnr, 0.3);
        double closedForm = ChiMoments.mean(8, 10) - ChiMoments.mean(8, 2);
        assertEquals(closedForm, o.get("cnr_magnitude").getAsDouble(), plainTolerance, "the plain CNR, biased low");
        assertTrue(o.get("cnr_magnitude").getAsDouble() < ci.get(0).getAsDouble(), "the plain CNR is outside the interval");
        JsonArray ai = o.getAsJsonArray("contrast_amplitude_ci95");
        assertTrue(ai.get(0).getAsDouble() <= TissueSample.INSERT && TissueSample.INSERT <= ai.get(1).getAsDouble(),
                "contrast amplitude " + ai);
        assertTrue(o.get("contrast_mean").getAsDouble() > 2 * TissueSample.INSERT, "the raw mean, pushed up by noise");
        assertEquals("contrast", o.get("contrast_region").getAsString());
    }

    @Test
    void backgroundMethod() {
        JsonObject o = json(CliRunner.run(CliRunner.concat(args("background", IMAGE, "--signal", SIGNAL, "--contrast", CONTRAST,
                "--channels", "8", "--slice", "1", "--json"), BG)));
        assertCnr(o, 0.25);
        // the table a user reads shows the same figures under their headings
        CliRunner.Result t = CliRunner.run(CliRunner.concat(args("background", IMAGE, "--signal", SIGNAL, "--contrast", CONTRAST,
                "--channels", "8", "--slice", "1"), BG));
        assertTrue(t.out().contains("CNR (corrected)") && t.out().contains("CNR plain ((S-C)/sigma)")
                && t.out().contains("Contrast amplitude (corrected) [a.u.]"), t.out());
    }

    @Test
    void differenceMethod() {
        assertCnr(json(CliRunner.run("difference", IMAGE, "--frames", "1,2", "--signal", SIGNAL, "--contrast", CONTRAST,
                "--channels", "8", "--json")), 0.4);
    }

    @Test
    void repeatedMethod() {
        assertCnr(json(CliRunner.run("repeat", IMAGE, "--signal", SIGNAL, "--contrast", CONTRAST, "--channels", "8",
                "--json")), 0.4);
    }

    /** Without a contrast region nothing changes: no CNR keys. */
    @Test
    void noContrastNoCnr() {
        JsonObject o = json(CliRunner.run("repeat", IMAGE, "--signal", SIGNAL, "--channels", "8", "--json"));
        assertFalse(o.has("cnr"));
        assertFalse(o.has("contrast_amplitude"));
    }

    /** A ROI file whose region name gives the contrast role measures what the rectangle does. */
    @Test
    void contrastRoleByName() throws IOException {
        Path zip = dir.resolve("rois.zip");
        var s = TissueSample.SIGNAL;
        var c = TissueSample.CONTRAST;
        Roi sig = new Roi(s.x(), s.y(), s.w(), s.h());
        sig.setName("signal");
        Roi con = new Roi(c.x(), c.y(), c.w(), c.h());
        con.setName("Contrast insert");
        try (ZipOutputStream z = new ZipOutputStream(Files.newOutputStream(zip))) {
            for (Roi roi : List.of(sig, con)) {
                z.putNextEntry(new ZipEntry(roi.getName() + ".roi"));
                z.write(RoiEncoder.saveAsByteArray(roi));
                z.closeEntry();
            }
        }
        JsonObject byName = json(CliRunner.run("repeat", IMAGE, "--rois", zip.toString(), "--channels", "8", "--json"));
        JsonObject byRect = json(CliRunner.run("repeat", IMAGE, "--signal", SIGNAL, "--contrast", CONTRAST,
                "--channels", "8", "--json"));
        assertEquals(byRect.get("cnr").getAsDouble(), byName.get("cnr").getAsDouble(), 1e-12);
        assertEquals("Contrast insert", byName.get("contrast_region").getAsString());
    }

    /** Batch: the CNR columns in every row of the CSV. */
    @Test
    void batchRows() throws IOException {
        Path folder = Files.createDirectories(dir.resolve("scans"));
        Files.copy(Path.of(IMAGE), folder.resolve("week1.tif"));
        Files.copy(Path.of(IMAGE), folder.resolve("week2.tif"));
        Path csv = dir.resolve("cnr.csv");
        CliRunner.Result r = CliRunner.run("batch", folder.toString(), "--method", "repeat", "--signal", SIGNAL,
                "--contrast", CONTRAST, "--channels", "8", "--out", csv.toString());
        assertEquals(0, r.status(), r.err());
        List<String> lines = Files.readAllLines(csv);
        assertEquals(3, lines.size(), String.join("\n", lines));
        List<String> head = List.of(lines.get(0).split(","));
        int col = head.indexOf("CNR (corrected)");
        assertTrue(col >= 0, lines.get(0));
        for (String line : lines.subList(1, 3)) {
            assertEquals(TissueSample.trueCnr(), Double.parseDouble(line.split(",")[col]), 0.3, line);
        }
    }

    /** Bad input: one clear line each, nothing measured. */
    @Test
    void refusals() {
        CliRunner.Result overlap = CliRunner.run("repeat", IMAGE, "--signal", SIGNAL, "--contrast", "60,40,16,16");
        assertNotEquals(0, overlap.status());
        assertTrue(overlap.err().contains("shares") && overlap.err().contains("apart from the signal region"),
                overlap.err());
        assertEquals(1, overlap.err().strip().lines().count(), overlap.err());
        CliRunner.Result two = CliRunner.run("repeat", IMAGE, "--signal", SIGNAL, "--contrast", CONTRAST, "--contrast",
                "56,92,8,8");
        assertNotEquals(0, two.status());
        assertTrue(two.err().contains("keep one contrast region"), two.err());
        CliRunner.Result check = CliRunner.run("check", IMAGE, "--background", "2,2,24,24", "--contrast", CONTRAST);
        assertNotEquals(0, check.status());
        assertTrue(check.err().contains("--contrast is not used by check"), check.err());
        CliRunner.Result outside = CliRunner.run("repeat", IMAGE, "--signal", SIGNAL, "--contrast", "120,120,16,16");
        assertNotEquals(0, outside.status());
        assertEquals(1, outside.err().strip().lines().count(), outside.err());
    }
}
