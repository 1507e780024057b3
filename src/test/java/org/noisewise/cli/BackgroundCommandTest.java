package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.OvalRoi;
import ij.gui.Roi;
import ij.io.RoiEncoder;
import ij.process.ColorProcessor;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.zip.ZipEntry;
import java.util.zip.ZipOutputStream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.BackgroundSnrResult;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.testing.TestImages;

class BackgroundCommandTest {

    @TempDir
    static Path dir;
    static Path image;
    static ImagePlus imp;

    @BeforeAll
    static void writeImage() {
        imp = TestImages.phantom("cli.tif", 100, 4, 1, 21);
        image = TestImages.saveTiff(imp, dir, "cli.tif");
    }

    private static void assertOneLineError(CliRunner.Result r, int status, String fragment) {
        assertEquals(status, r.status(), r.err());
        assertEquals("", r.out());
        String err = r.err().strip();
        assertFalse(err.contains("\n"), "more than one line: " + err);
        assertFalse(err.contains("Exception") || err.contains("\tat "), "stack trace: " + err);
        assertTrue(err.contains(fragment), err);
    }

    @Test
    void jsonHasTheDocumentedFields() throws Exception {
        CliRunner.Result r = CliRunner.run("background", image.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,14,14", "--background", "80,80,14,14", "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        for (String key : List.of("method", "signal_mean", "sigma", "sigma_ci95", "snr", "snr_ci95", "channels",
                "estimators", "pixels", "warnings")) {
            assertTrue(o.has(key), "missing " + key);
        }
        assertEquals("background", o.get("method").getAsString());
        assertEquals(1, o.get("channels").getAsInt());
        assertEquals(2, o.getAsJsonArray("sigma_ci95").size());
        assertEquals(400, o.getAsJsonObject("pixels").get("signal").getAsInt());
        assertEquals(392, o.getAsJsonObject("pixels").get("background").getAsInt());
        assertEquals(4, o.getAsJsonObject("estimators").size());
        assertTrue(o.getAsJsonArray("warnings").isEmpty());

        // the same numbers as the core on the same pixels and regions
        float[] px = (float[]) imp.getProcessor().getPixels();
        int w = TestImages.SIZE;
        BackgroundSnrResult core = BackgroundSnr.analyze(px, w, w, Region.rectangle("s", 38, 38, 20, 20, w, w),
                List.of(Region.rectangle("b", 1, 1, 14, 14, w, w), Region.rectangle("b2", 80, 80, 14, 14, w, w)),
                BackgroundSnr.Options.defaults());
        assertEquals(core.snr(), o.get("snr").getAsDouble(), 0.0);
        assertEquals(core.sigma().sigma(), o.get("sigma").getAsDouble(), 0.0);
        assertEquals(core.signal().stats().mean(), o.get("signal_mean").getAsDouble(), 0.0);
        assertEquals(core.figures().amplitude(), o.get("signal_amplitude").getAsDouble(), 0.0);
        assertEquals(core.figures().magnitudeSnr(), o.get("snr_magnitude").getAsDouble(), 0.0);
        assertEquals(core.estimates().get(SigmaEstimator.MEDIAN).sigma(),
                o.getAsJsonObject("estimators").get("median").getAsDouble(), 0.0);
        assertEquals(core.sigma().ci95().low(), o.getAsJsonArray("sigma_ci95").get(0).getAsDouble(), 0.0);
    }

    @Test
    void autoChannelsAndVerdictInJson() {
        Path eight = TestImages.saveTiff(TestImages.phantom("eight.tif", 100, 4, 8, 8), dir, "eight.tif");
        CliRunner.Result r = CliRunner.run("background", eight.toString(), "--signal", "38,38,20,20",
                "--background", "0,0,20,20", "--background", "76,76,20,20", "--background", "0,76,20,20",
                "--channels", "auto", "--phase", "COL", "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals(8.0, o.get("channels").getAsDouble(), 1.2);
        // 1,200 background pixels pin L to about +-0.6 (95%), so the rounded count may be a neighbour
        assertEquals(8, o.get("channels_used").getAsInt(), 1);
        assertEquals(2, o.getAsJsonObject("channels_estimate").getAsJsonArray("ci95").size());
        assertTrue(o.getAsJsonObject("noise_correlation").has("x"));
        assertEquals(4.0, o.get("sigma").getAsDouble(), 0.4);
        assertTrue(o.has("verdict"));
        assertOneLineError(CliRunner.run("background", eight.toString(), "--signal", "38,38,20,20",
                "--background", "0,0,20,20", "--channels", "many"), 3, "--channels");
        assertOneLineError(CliRunner.run("background", eight.toString(), "--signal", "38,38,20,20",
                "--background", "0,0,20,20", "--phase", "diagonal"), 3, "phase-encoding direction");
    }

    @Test
    void invalidBackgroundGivesNullSnr() {
        ImagePlus masked = TestImages.phantom("masked.tif", 100, 4, 1, 9);
        float[] px = (float[]) masked.getProcessor().getPixels();
        for (int i = 0; i < px.length; i++) {
            if (px[i] < 4f) {
                px[i] = 0f;
            }
        }
        Path file = TestImages.saveTiff(masked, dir, "masked.tif");
        CliRunner.Result r = CliRunner.run("background", file.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,14,14", "--background", "80,80,14,14", "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals("invalid", o.get("verdict").getAsString());
        assertTrue(o.get("snr").isJsonNull());
        assertTrue(o.getAsJsonArray("snr_ci95").get(0).isJsonNull());
        CliRunner.Result text = CliRunner.run("background", file.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,14,14");
        assertTrue(text.out().contains("difference method"), text.out());
    }

    /** Noise 1.5x higher inside the object than in air (as with a central g-factor): background and difference disagree. */
    @Test
    void secondAcquisitionExposesABackgroundThatMisrepresentsTheSignalNoise() {
        java.util.SplittableRandom rng = new java.util.SplittableRandom(77);
        Path[] files = new Path[2];
        for (int k = 0; k < 2; k++) {
            float[] px = new float[96 * 96];
            for (int i = 0; i < px.length; i++) {
                double dx = i % 96 + 0.5 - 48;
                double dy = i / 96 + 0.5 - 48;
                boolean in = dx * dx + dy * dy <= 28 * 28;
                px[i] = (float) org.noisewise.sample.Phantoms.magnitude(rng, in ? 100 : 0, in ? 6 : 4, 1);
            }
            files[k] = TestImages.saveTiff(new ImagePlus("g", new ij.process.FloatProcessor(96, 96, px)), dir, "g" + k + ".tif");
        }
        CliRunner.Result r = CliRunner.run("background", files[0].toString(), "--second", files[1].toString(),
                "--signal", "38,38,20,20", "--background", "1,1,14,14", "--background", "80,80,14,14", "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals("questionable", o.get("verdict").getAsString());
        assertTrue(r.out().contains("background_vs_difference"), r.out());
        Path b = TestImages.saveTiff(TestImages.phantom("b", 100, 4, 1, 22), dir, "clean2.tif");
        CliRunner.Result clean = CliRunner.run("background", image.toString(), "--second", b.toString(),
                "--signal", "38,38,20,20", "--background", "1,1,14,14", "--background", "80,80,14,14", "--json");
        assertFalse(clean.out().contains("background_vs_difference"), clean.out());
    }

    @Test
    void lowSnrWarningAppearsInJson() {
        Path low = TestImages.saveTiff(TestImages.phantom("low.tif", 8, 4, 1, 5), dir, "low.tif");
        CliRunner.Result r = CliRunner.run("background", low.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,14,14", "--background", "80,80,14,14", "--json");
        assertEquals(0, r.status());
        JsonArray w = JsonParser.parseString(r.out()).getAsJsonObject().getAsJsonArray("warnings");
        assertEquals("low_snr", w.get(0).getAsJsonObject().get("code").getAsString());
        assertTrue(w.get(0).getAsJsonObject().get("message").getAsString().contains("biased"));
    }

    @Test
    void defaultOutputIsAReadableTableWithUnits() {
        CliRunner.Result r = CliRunner.run("background", image.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,14,14", "--channels", "1", "--estimator", "median");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("Sigma [a.u.]"), r.out());
        assertTrue(r.out().contains("Estimator") && r.out().contains("median"), r.out());
    }

    @Test
    void stackGivesOneRowPerSliceOrTheChosenSlice() {
        ImageStack st = new ImageStack(TestImages.SIZE, TestImages.SIZE);
        st.addSlice(TestImages.phantom("a", 100, 4, 1, 1).getProcessor());
        st.addSlice(TestImages.phantom("b", 50, 4, 1, 2).getProcessor());
        Path stack = TestImages.saveTiff(new ImagePlus("stack", st), dir, "stack.tif");
        CliRunner.Result all = CliRunner.run("background", stack.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,14,14", "--json");
        JsonElement e = JsonParser.parseString(all.out());
        assertEquals(2, e.getAsJsonArray().size());
        CliRunner.Result one = CliRunner.run("background", stack.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,14,14", "--slice", "2", "--json");
        JsonObject o = JsonParser.parseString(one.out()).getAsJsonObject();
        assertEquals(2, o.get("slice").getAsInt());
        assertEquals(e.getAsJsonArray().get(1).getAsJsonObject().get("snr"), o.get("snr"));
        assertOneLineError(CliRunner.run("background", stack.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,14,14", "--slice", "3"), 3, "slice");
    }

    @Test
    void roiFileGivesRolesByName() throws IOException {
        Path zip = dir.resolve("rois.zip");
        Roi sig = new OvalRoi(38, 38, 20, 20);
        sig.setName("signal");
        Roi bg1 = new Roi(1, 1, 14, 14);
        bg1.setName("bg-top-left");
        Roi bg2 = new Roi(80, 80, 14, 14);
        bg2.setName("air bottom right");
        Roi other = new Roi(40, 5, 5, 5);
        other.setName("marker");
        try (ZipOutputStream z = new ZipOutputStream(Files.newOutputStream(zip))) {
            for (Roi roi : List.of(sig, bg1, bg2, other)) {
                z.putNextEntry(new ZipEntry(roi.getName() + ".roi"));
                z.write(RoiEncoder.saveAsByteArray(roi));
                z.closeEntry();
            }
        }
        CliRunner.Result r = CliRunner.run("background", image.toString(), "--rois", zip.toString(), "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals(sig.getContainedPoints().length, o.getAsJsonObject("pixels").get("signal").getAsInt());
        assertEquals(392, o.getAsJsonObject("pixels").get("background").getAsInt());
    }

    @Test
    void inputErrorsExitThreeWithOneLine() throws IOException {
        assertOneLineError(CliRunner.run("background", dir.resolve("missing.tif").toString(), "--signal", "1,1,5,5",
                "--background", "1,1,5,5"), 3, "file not found");
        assertOneLineError(CliRunner.run("background", image.toString(), "--signal", "38,38,20,20",
                "--background", "90,90,10,10"), 3, "outside the 96x96 image");
        assertOneLineError(CliRunner.run("background", image.toString(), "--signal", "38,38,0,20",
                "--background", "1,1,10,10"), 3, "empty");
        Path rgb = TestImages.saveTiff(new ImagePlus("rgb", new ColorProcessor(32, 32)), dir, "rgb.tif");
        assertOneLineError(CliRunner.run("background", rgb.toString(), "--signal", "1,1,5,5",
                "--background", "10,10,5,5"), 3, "colour image");
        Path junk = dir.resolve("junk.tif");
        try (OutputStream os = Files.newOutputStream(junk)) {
            os.write("not an image at all".getBytes());
        }
        assertOneLineError(CliRunner.run("background", junk.toString(), "--signal", "1,1,5,5",
                "--background", "10,10,5,5"), 3, "cannot read");
        assertOneLineError(CliRunner.run("background", image.toString(), "--signal", "38,38,20,20"), 3,
                "no background region");
        assertOneLineError(CliRunner.run("background", image.toString(), "--signal", "38,38,20,20",
                "--background", "1,1,10,10", "--channels", "0"), 3, "--channels");
    }

    @Test
    void usageErrorsExitTwo() {
        assertOneLineError(CliRunner.run("background", image.toString(), "--signal", "38,38,20"), 2, "x,y,w,h");
        assertOneLineError(CliRunner.run("background"), 2, "IMAGE");
        assertOneLineError(CliRunner.run("nonsense"), 2, "nonsense");
    }

    @Test
    void helpListsTheCommands() {
        CliRunner.Result r = CliRunner.run("--help");
        assertEquals(0, r.status());
        assertTrue(r.out().contains("background") && r.out().contains("demo"), r.out());
        assertTrue(r.out().contains("not a diagnostic device"), r.out());
    }
}
