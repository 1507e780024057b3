package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.ImagePlus;
import ij.ImageStack;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.testing.TestImages;

/** predict, compare and gfactor on the command line. */
class ProtocolCommandsCliTest {

    @TempDir
    Path dir;

    static ImagePlus series(String title, int k, double a, java.util.function.IntToDoubleFunction sigma, long seed) {
        return TestImages.squareSeries(title, k, a, sigma, seed);
    }

    @Test
    void predictPrintsTheRatioAndFactors() {
        CliRunner.Result r = CliRunner.run("predict", "--from", "voxel=1x1x5,phase=256,averages=1,bandwidth=130,field=3",
                "--to", "voxel=1x1x3,phase=256,averages=2,bandwidth=260,field=3", "--snr", "50", "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals(0.6, o.get("ratio").getAsDouble(), 1e-12); // reference sheet section 6 check value [math]
        assertEquals(30.0, o.get("snr_predicted").getAsDouble(), 1e-9);
        assertEquals(0.6, o.getAsJsonObject("factors").get("voxel_volume").getAsDouble(), 1e-12);
        assertEquals(1.0, o.get("field_exponent").getAsDouble());
        CliRunner.Result missing = CliRunner.run("predict", "--from", "voxel=1x1x5,phase=256,bandwidth=130",
                "--to", "voxel=1x1x3,phase=256,averages=2,bandwidth=260");
        assertEquals(3, missing.status());
        assertTrue(missing.err().contains("averages") && missing.err().lines().count() == 1, missing.err());
        CliRunner.Result bad = CliRunner.run("predict", "--from", "nonexistent-file", "--to", "phase=2");
        assertEquals(3, bad.status());
        assertTrue(bad.err().contains("KEY=VALUE"), bad.err());
    }

    /**
     * Two series of a uniform object whose noise differs by a known factor: 8 averages against 2 predicts a
     * ratio of 2, and the simulation's true SNR ratio is 2 (sigma halved), so the prediction is consistent.
     */
    @Test
    void compareSeriesAgainstPrediction() {
        Path a = TestImages.saveTiff(series("a", 8, 100, x -> 8, 1), dir, "a.tif");
        Path b = TestImages.saveTiff(series("b", 8, 100, x -> 4, 2), dir, "b.tif");
        CliRunner.Result r = CliRunner.run("compare", a.toString(), b.toString(), "--signal", "16,16,32,32",
                "--from", "voxel=1x1x5,phase=256,averages=2,bandwidth=130", "--to",
                "voxel=1x1x5,phase=256,averages=8,bandwidth=130", "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals("repeated", o.get("method").getAsString());
        assertEquals(2.0, o.get("ratio_predicted").getAsDouble(), 1e-12);
        assertEquals(2.0, o.get("ratio_measured").getAsDouble(), 0.1);
        JsonArray ci = o.getAsJsonArray("ratio_measured_ci95");
        assertTrue(ci.get(0).getAsDouble() < 2 && ci.get(1).getAsDouble() > 2, ci.toString());
        assertTrue(o.get("consistent").getAsBoolean());
        // predicted 4 (16 averages) is outside: not consistent
        CliRunner.Result off = CliRunner.run("compare", a.toString(), b.toString(), "--signal", "16,16,32,32",
                "--from", "voxel=1x1x5,phase=256,averages=1,bandwidth=130", "--to",
                "voxel=1x1x5,phase=256,averages=16,bandwidth=130", "--json");
        assertFalse(JsonParser.parseString(off.out()).getAsJsonObject().get("consistent").getAsBoolean());
        // a series against a single image: refused, naming both
        Path single = TestImages.saveTiff(series("s", 1, 100, x -> 4, 3), dir, "single.tif");
        CliRunner.Result mixed = CliRunner.run("compare", a.toString(), single.toString(), "--signal", "16,16,32,32",
                "--from", "averages=1", "--to", "averages=2");
        assertEquals(3, mixed.status());
        assertTrue(mixed.err().contains("series of 8") && mixed.err().contains("single image"), mixed.err());
        // without protocols: the parameters are missing, named
        CliRunner.Result none = CliRunner.run("compare", a.toString(), b.toString(), "--signal", "16,16,32,32",
                "--json");
        assertEquals(0, none.status(), none.err());
        assertTrue(none.err().contains("taken as equal"), none.err());
    }

    /** A g ramp from 1 to 1.5 across the image at R = 2, recovered within 3% over a strip; the map is written. */
    @Test
    void gfactorRegionAndMap() throws Exception {
        java.util.function.IntToDoubleFunction g = x -> 1 + 0.5 * x / 63.0;
        Path full = TestImages.saveTiff(series("full", 12, 200, x -> 4, 11), dir, "full.tif");
        Path acc = TestImages.saveTiff(series("acc", 12, 200, x -> 4 * g.applyAsDouble(x) * Math.sqrt(2), 12), dir,
                "acc.tif");
        Path map = dir.resolve("g.tif");
        CliRunner.Result r = CliRunner.run("gfactor", full.toString(), acc.toString(), "--acceleration", "2",
                "--signal", "40,14,6,36", "--map", map.toString(), "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        double truth = Math.sqrt((sq(g, 40) + sq(g, 41) + sq(g, 42) + sq(g, 43) + sq(g, 44) + sq(g, 45)) / 6);
        assertEquals(truth, o.get("g_mean").getAsDouble(), 0.03 * truth);
        assertEquals(2.0, o.get("acceleration").getAsDouble());
        assertTrue(o.get("warnings").toString().contains("few_repeats"));
        assertTrue(Files.size(map) > 64 * 64 * 4);
        ImagePlus m = ij.IJ.openImage(map.toString());
        assertEquals(32, m.getBitDepth());
        // replacing the map needs --force; the inputs are never replaced
        CliRunner.Result again = CliRunner.run("gfactor", full.toString(), acc.toString(), "--acceleration", "2",
                "--map", map.toString());
        assertEquals(3, again.status());
        CliRunner.Result input = CliRunner.run("gfactor", full.toString(), acc.toString(), "--acceleration", "2",
                "--map", acc.toString(), "--force");
        assertEquals(3, input.status());
        assertFalse(input.err().isEmpty());
        CliRunner.Result lowR = CliRunner.run("gfactor", full.toString(), acc.toString(), "--acceleration", "0.5",
                "--signal", "40,14,6,36");
        assertEquals(3, lowR.status());
        assertTrue(lowR.err().contains("at least 1"), lowR.err());
    }

    /** Acquisitions of different matrices are refused with one line naming both sizes. */
    @Test
    void mismatchedMatricesAreNamed() {
        Path a = TestImages.saveTiff(series("a", 4, 100, x -> 4, 1), dir, "a64.tif");
        ImagePlus big = TestImages.phantom("b", 100, 4, 1, 2);
        ImageStack st = new ImageStack(big.getWidth(), big.getHeight());
        for (int k = 0; k < 4; k++) {
            st.addSlice(TestImages.phantom("b", 100, 4, 1, 10 + k).getProcessor());
        }
        Path b = TestImages.saveTiff(new ImagePlus("b", st), dir, "b96.tif");
        CliRunner.Result c = CliRunner.run("compare", a.toString(), b.toString(), "--signal", "16,16,32,32",
                "--from", "averages=1", "--to", "averages=2");
        assertEquals(3, c.status());
        assertTrue(c.err().contains("64x64") && c.err().contains("96x96"), c.err());
        CliRunner.Result g = CliRunner.run("gfactor", a.toString(), b.toString(), "--acceleration", "2", "--signal",
                "16,16,32,32");
        assertEquals(3, g.status());
        assertTrue(g.err().contains("matrix"), g.err());
        assertEquals(1, g.err().lines().count(), g.err());
    }

    /** --from and --to also take a DICOM file whose header states the protocol (pydicom's MR_small.dcm, edited). */
    @Test
    void predictFromADicomHeader() throws Exception {
        byte[] d = org.noisewise.testing.OpenData.bytes("MR_small.dcm");
        d = org.noisewise.testing.DicomEdit.set(d, 0x0018, 0x0050, "DS", "5");
        d = org.noisewise.testing.DicomEdit.set(d, 0x0018, 0x0083, "DS", "1");
        d = org.noisewise.testing.DicomEdit.set(d, 0x0018, 0x0087, "DS", "1.5");
        d = org.noisewise.testing.DicomEdit.set(d, 0x0018, 0x0089, "IS", "64");
        d = org.noisewise.testing.DicomEdit.set(d, 0x0018, 0x0095, "DS", "130");
        d = org.noisewise.testing.DicomEdit.set(d, 0x0028, 0x0030, "DS", "1\\1");
        Path dcm = dir.resolve("protocol.dcm");
        Files.write(dcm, d);
        // MR_small's header states a 3-D acquisition (0018,0023): one slice does not give its partitions (issue 23.4)
        CliRunner.Result unknown = CliRunner.run("predict", "--from", dcm.toString(), "--to",
                "voxel=1x1x5,phase=64,averages=4,bandwidth=130,field=1.5");
        assertEquals(3, unknown.status());
        assertTrue(unknown.err().contains("partitions"), unknown.err());
        CliRunner.Result r = CliRunner.run("predict", "--from", dcm + ",partitions=16", "--to",
                "voxel=1x1x5,phase=64,partitions=16,averages=4,bandwidth=130,field=1.5", "--json");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.err().contains("from: phase-encoding steps 64 from the header (0018,0089)"), r.err());
        // 4 averages against 1, all else equal: sqrt(4) = 2 [closed form]
        assertEquals(2.0, JsonParser.parseString(r.out()).getAsJsonObject().get("ratio").getAsDouble(), 1e-12);
        CliRunner.Result none = CliRunner.run("predict", "--from", TestImages.saveTiff(
                TestImages.phantom("plain", 10, 1, 1, 1), dir, "plain.tif").toString(), "--to", "averages=2");
        assertEquals(3, none.status());
        assertTrue(none.err().contains("states no acquisition parameters"), none.err());
    }

    private static double sq(java.util.function.IntToDoubleFunction g, int x) {
        return g.applyAsDouble(x) * g.applyAsDouble(x);
    }
}
