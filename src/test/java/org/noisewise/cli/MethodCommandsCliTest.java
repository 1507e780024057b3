package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.testing.TestImages;

class MethodCommandsCliTest {

    @TempDir
    static Path dir;
    static Path a;
    static Path b;
    static Path stack;
    static Path low;

    @BeforeAll
    static void images() {
        a = TestImages.saveTiff(TestImages.phantom("a", 100, 4, 1, 1), dir, "a.tif");
        b = TestImages.saveTiff(TestImages.phantom("b", 100, 4, 1, 2), dir, "b.tif");
        low = TestImages.saveTiff(TestImages.phantom("low", 8, 4, 1, 3), dir, "low.tif");
        ImageStack st = new ImageStack(TestImages.SIZE, TestImages.SIZE);
        for (int f = 0; f < 12; f++) {
            st.addSlice(TestImages.phantom("f", 60, 4, 1, 10 + f).getProcessor());
        }
        stack = TestImages.saveTiff(new ImagePlus("stack", st), dir, "stack.tif");
    }

    private static void assertInputError(CliRunner.Result r, String fragment) {
        assertEquals(3, r.status(), r.err());
        String err = r.err().strip();
        assertFalse(err.contains("\n") || err.contains("Exception"), err);
        assertTrue(err.contains(fragment), err);
    }

    @Test
    void differenceOfTwoFiles() {
        CliRunner.Result r = CliRunner.run("difference", a.toString(), b.toString(), "--signal", "38,38,20,20", "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals("difference", o.get("method").getAsString());
        for (String k : List.of("signal_mean", "sigma", "sigma_ci95", "snr", "snr_ci95", "warnings")) {
            assertTrue(o.has(k), k);
        }
        assertEquals(4.0, o.get("sigma").getAsDouble(), 0.5);
    }

    @Test
    void differenceOfTwoFramesAndErrors() {
        CliRunner.Result r = CliRunner.run("difference", stack.toString(), "--frames", "1,2", "--signal", "38,38,20,20", "--json");
        assertEquals(0, r.status(), r.err());
        assertEquals(4.0, JsonParser.parseString(r.out()).getAsJsonObject().get("sigma").getAsDouble(), 0.5);
        assertInputError(CliRunner.run("difference", a.toString(), "--signal", "38,38,20,20"), "one image was given");
        assertInputError(CliRunner.run("difference", a.toString(), "--frames", "1,2", "--signal", "38,38,20,20"),
                "single frame");
        Path small = TestImages.saveTiff(new ImagePlus("s", new ij.process.FloatProcessor(40, 40)), dir, "small.tif");
        assertInputError(CliRunner.run("difference", a.toString(), small.toString(), "--signal", "1,1,5,5"), "differ in size");
        assertInputError(CliRunner.run("difference", stack.toString(), "--frames", "1,40", "--signal", "38,38,20,20"),
                "frame 40 does not exist");
    }

    @Test
    void repeatWithMapAndForce() {
        Path map = dir.resolve("maps.tif");
        CliRunner.Result r = CliRunner.run("repeat", stack.toString(), "--signal", "38,38,20,20", "--map", map.toString(),
                "--rician", "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals(12, o.get("repeats").getAsInt());
        assertEquals(4.0, o.get("sigma").getAsDouble(), 0.3);
        // the corrected figures are the headline; --rician is accepted and changes nothing
        assertTrue(o.has("signal_amplitude") && o.has("snr_magnitude") && o.has("sigma_magnitude"));
        CliRunner.Result plain = CliRunner.run("repeat", stack.toString(), "--signal", "38,38,20,20", "--json");
        assertEquals(o.get("snr").getAsDouble(), JsonParser.parseString(plain.out()).getAsJsonObject().get("snr")
                .getAsDouble(), 0.0);
        ImagePlus maps = IJ.openImage(map.toString());
        assertNotNull(maps);
        assertEquals(3, maps.getStackSize());
        assertEquals("SNR map (mean/SD)", maps.getStack().getSliceLabel(3));
        assertInputError(CliRunner.run("repeat", stack.toString(), "--signal", "38,38,20,20", "--map", map.toString()),
                "--force");
        assertEquals(0, CliRunner.run("repeat", stack.toString(), "--map", map.toString(), "--force").status());
        assertInputError(CliRunner.run("repeat", a.toString(), "--signal", "38,38,20,20"), "single frame");
    }

    @Test
    void checkWithPlot() throws Exception {
        Path png = dir.resolve("check.png");
        CliRunner.Result r = CliRunner.run("check", a.toString(), "--background", "1,1,14,14", "--background",
                "80,80,14,14", "--plot", png.toString(), "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals("valid", o.get("verdict").getAsString());
        assertTrue(o.has("fit_p") && o.has("agreement_p") && o.has("estimators"));
        ImagePlus plot = IJ.openImage(png.toString());
        assertNotNull(plot, "the PNG does not decode");
        assertTrue(Files.size(png) > 1000);
        assertInputError(CliRunner.run("check", a.toString(), "--signal", "38,38,20,20"), "no background region");
    }

    @Test
    void correctWritesANewImageAndNeverOverwrites() {
        Path out = dir.resolve("corrected.tif");
        CliRunner.Result r = CliRunner.run("correct", low.toString(), "--sigma", "4", "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        ImagePlus c = IJ.openImage(out.toString());
        assertEquals(32, c.getBitDepth());
        assertInputError(CliRunner.run("correct", low.toString(), "--sigma", "4", "--out", out.toString()), "--force");
        assertInputError(CliRunner.run("correct", low.toString(), "--sigma", "0", "--out", dir.resolve("x.tif").toString()),
                "give --sigma s, or --background regions");
        assertInputError(CliRunner.run("correct", low.toString(), "--sigma", "-1", "--out", dir.resolve("x.tif").toString()),
                "--sigma must be a positive");
        assertInputError(CliRunner.run("correct", low.toString(), "--sigma", "2", "--method", "magic", "--out",
                dir.resolve("y.tif").toString()), "unknown correction method");
        assertEquals(2, CliRunner.run("correct", low.toString(), "--sigma", "4").status(), "--out is required");
        // sigma measured from background regions, as the ImageJ dialog's sigma = 0 does
        CliRunner.Result measured = CliRunner.run("correct", low.toString(), "--background", "1,1,14,14", "--out",
                dir.resolve("z.tif").toString());
        assertEquals(0, measured.status(), measured.err());
        assertTrue(measured.err().contains("sigma measured from the background regions"), measured.err());
        try (var files = Files.list(dir)) {
            assertTrue(files.noneMatch(p -> p.getFileName().toString().endsWith(".part")), "temporary file left behind");
        } catch (java.io.IOException e) {
            throw new IllegalStateException(e);
        }
    }
}
