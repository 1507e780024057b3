package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.noisewise.cli.CliRunner.holds;
import static org.noisewise.cli.CliRunner.json;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonParser;
import com.google.gson.JsonObject;
import ij.IJ;
import ij.ImagePlus;
import ij.process.FloatProcessor;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.sample.NoiseScanSample;
import org.noisewise.testing.TestImages;

/**
 * Issue 21's noise-only scans on the command line, as a user runs them, on the bundled accelerated
 * sample (generated: 4 channels, sigma 5 g(x) with the g-factor 1.8 in the middle columns, amplitude
 * 120; truth in {@link NoiseScanSample}) and its noise-only scan.
 */
class NoiseScanCliTest {

    @TempDir
    Path dir;

    private static final String IMAGE = "sample-images/" + NoiseScanSample.IMAGE;
    private static final String NOISE = "sample-images/" + NoiseScanSample.NOISE;
    private static final String CENTRE = NoiseScanSample.CENTRE.toString();
    private static final String[] CORNERS = {"--background", "2,2,20,20", "--background", "106,2,20,20",
            "--background", "2,106,20,20", "--background", "106,106,20,20"};

    private static String[] args(String... a) {
        return a;
    }

    @Test
    void sigmaAtTheSignalRegionGivesTheTrueSnrWhereTheCornersCannot() throws IOException {
        byte[] before = Files.readAllBytes(Path.of(NOISE));
        for (var r : List.of(NoiseScanSample.CENTRE, NoiseScanSample.EDGE)) {
            CliRunner.Result run = CliRunner.run("background", IMAGE, "--noise-scan", NOISE, "--signal", r.toString(),
                    "--json");
            JsonObject o = json(run);
            assertEquals("noise_scan", o.get("method").getAsString());
            assertEquals("valid", o.get("verdict").getAsString());
            assertEquals(4, o.get("channels").getAsInt(), "estimated from the scan");
            assertTrue(holds(o.getAsJsonArray("sigma_ci95"), NoiseScanSample.trueSigma(r)), o.get("sigma").toString());
            assertTrue(holds(o.getAsJsonArray("snr_ci95"), NoiseScanSample.trueSnr(r)), o.get("snr").toString());
            assertEquals(1.0, o.get("sigma").getAsDouble() / NoiseScanSample.trueSigma(r), 0.04, "within 4%");
            assertTrue(run.err().contains("channel count estimated from the scan"), run.err());
        }
        // the corners see sigma about 5: the background method's SNR in the middle is far too high
        JsonObject corners = json(CliRunner.run(CliRunner.concat(args("background", IMAGE, "--signal", CENTRE, "--channels",
                "4", "--json"), CORNERS)));
        assertFalse(holds(corners.getAsJsonArray("snr_ci95"), NoiseScanSample.trueSnr(NoiseScanSample.CENTRE)));
        assertTrue(corners.get("snr").getAsDouble() > 1.5 * NoiseScanSample.trueSnr(NoiseScanSample.CENTRE));
        // automatic air keeps the quietest air, and says that louder pure noise lies outside it
        JsonObject auto = json(CliRunner.run("background", IMAGE, "--signal", CENTRE, "--background", "auto",
                "--channels", "4", "--json"));
        assertEquals("questionable", auto.get("verdict").getAsString());
        assertTrue(auto.get("warnings").toString().contains("noise_varies"), auto.get("warnings").toString());
        assertArrayEquals(before, Files.readAllBytes(Path.of(NOISE)), "the scan is never changed");
    }

    @Test
    void theCheckSaysTheBackgroundMisstatesTheSignalRegionsNoise() {
        JsonObject o = json(CliRunner.run(CliRunner.concat(args("check", IMAGE, "--noise-scan", NOISE, "--signal", CENTRE,
                "--json"), CORNERS)));
        assertEquals("invalid", o.get("verdict").getAsString());
        String w = o.get("warnings").toString();
        assertTrue(w.contains("noise_varies"), w);
        assertFalse(w.contains("noise_scan_scale"), w);
        double g = NoiseScanSample.trueSigma(NoiseScanSample.CENTRE) / NoiseScanSample.SIGMA / 1.01;
        assertTrue(holds(o.getAsJsonArray("noise_variation_ci95"), g) || Math.abs(o.get("noise_variation").getAsDouble()
                / g - 1) < 0.04, o.get("noise_variation").toString());
        // without the scan the same check has no way to see it
        JsonObject plain = json(CliRunner.run(CliRunner.concat(args("check", IMAGE, "--signal", CENTRE, "--channels", "4",
                "--json"), CORNERS)));
        assertFalse(plain.get("warnings").toString().contains("noise_varies"));
    }

    @Test
    void sigmaMapFollowsTheGFactor() throws IOException {
        Path map = dir.resolve("sigma.tif");
        json(CliRunner.run("background", IMAGE, "--noise-scan", NOISE, "--signal", CENTRE, "--sigma-map",
                map.toString(), "--json"));
        ImagePlus m = IJ.openImage(map.toString());
        assertEquals(32, m.getBitDepth());
        float[] px = (float[]) m.getProcessor().getPixels();
        for (int x : new int[]{10, 40, 64, 90, 118}) {
            double s = 0;
            for (int y = 0; y < 128; y++) {
                s += px[y * 128 + x];
            }
            double truth = NoiseScanSample.SIGMA * NoiseScanSample.g(x);
            assertEquals(1.0, s / 128 / truth, 0.03, "column " + x);
        }
        assertEquals(List.of(map), Files.list(dir).toList(), "only the map is written, no temporary files");
        CliRunner.Result again = CliRunner.run("background", IMAGE, "--noise-scan", NOISE, "--signal", CENTRE,
                "--sigma-map", map.toString());
        assertEquals(3, again.status());
        assertTrue(again.err().contains("--force"), again.err());
    }

    @Test
    void scansThatCannotServeAreRefusedWithTheReason() throws IOException {
        CliRunner.Result signal = CliRunner.run("background", IMAGE, "--noise-scan", IMAGE, "--signal", CENTRE);
        assertEquals(3, signal.status());
        assertTrue(signal.err().contains("holds structure"), signal.err());
        assertTrue(signal.err().contains("transmitter off"), signal.err());
        assertFalse(signal.err().contains("Exception"), signal.err());

        CliRunner.Result noMap = CliRunner.run("background", IMAGE, "--signal", CENTRE, "--sigma-map",
                dir.resolve("m.tif").toString(), "--background", "2,2,20,20");
        assertEquals(3, noMap.status());
        assertTrue(noMap.err().contains("add --noise-scan"), noMap.err());

        ImagePlus small = new ImagePlus("small", new FloatProcessor(64, 64));
        Path smallPath = TestImages.saveTiff(small, dir, "small.tif");
        CliRunner.Result size = CliRunner.run("background", IMAGE, "--noise-scan", smallPath.toString(), "--signal",
                CENTRE);
        assertEquals(3, size.status());
        assertTrue(size.err().contains("is 64x64 pixels but"), size.err());

        CliRunner.Result both = CliRunner.run("background", IMAGE, "--noise-scan", NOISE, "--second", IMAGE,
                "--signal", CENTRE);
        assertEquals(3, both.status());
        assertTrue(both.err().contains("give one of them"), both.err());

        CliRunner.Result wrongL = CliRunner.run("background", IMAGE, "--noise-scan", NOISE, "--signal", CENTRE,
                "--channels", "1");
        assertEquals(3, wrongL.status());
        assertTrue(wrongL.err().contains("not the 1 stated: state 4 channels"), wrongL.err());
    }

    /** A scan stored with another scale (receiver gain, scaling): the background pixels show it; no SNR. */
    @Test
    void aScanOfAnotherScaleIsCaughtInTheBackground() throws IOException {
        ImagePlus scan = IJ.openImage(NOISE);
        scan.getProcessor().multiply(1.25);
        Path scaled = TestImages.saveTiff(scan, dir, "scaled.tif");
        JsonObject o = json(CliRunner.run(CliRunner.concat(args("background", IMAGE, "--noise-scan", scaled.toString(),
                "--signal", CENTRE, "--json"), CORNERS)));
        assertEquals("invalid", o.get("verdict").getAsString());
        assertTrue(o.get("warnings").toString().contains("noise_scan_scale"), o.get("warnings").toString());
        JsonElement snr = o.get("snr");
        assertTrue(snr == null || snr.isJsonNull(), "no SNR: " + snr);
        assertEquals(0.8, o.get("noise_scale").getAsDouble(), 0.03);
        // the same scan at its own scale passes the check
        JsonObject own = json(CliRunner.run(CliRunner.concat(args("background", IMAGE, "--noise-scan", NOISE, "--signal", CENTRE,
                "--json"), CORNERS)));
        assertEquals("valid", own.get("verdict").getAsString());
        assertFalse(own.get("warnings").toString().contains("noise_scan_scale"), own.get("warnings").toString());
        assertEquals(1.0, own.get("noise_scale").getAsDouble(), 0.03);
    }

    /** A one-slice scan serves every slice of a stack: each slice's sigma comes from the same scan pixels. */
    @Test
    void oneScanServesEverySliceOfAStack() throws IOException {
        ImagePlus one = IJ.openImage(IMAGE);
        ij.ImageStack st = new ij.ImageStack(one.getWidth(), one.getHeight());
        for (int k = 0; k < 3; k++) {
            st.addSlice(one.getProcessor().duplicate());
        }
        Path stack = TestImages.saveTiff(new ImagePlus("three", st), dir, "three.tif");
        CliRunner.Result r = CliRunner.run("background", stack.toString(), "--noise-scan", NOISE, "--signal", CENTRE,
                "--json");
        assertEquals(0, r.status(), r.err());
        com.google.gson.JsonArray rows = JsonParser.parseString(r.out()).getAsJsonArray();
        assertEquals(3, rows.size());
        double sigma = rows.get(0).getAsJsonObject().get("sigma").getAsDouble();
        for (JsonElement e : rows) {
            assertEquals(sigma, e.getAsJsonObject().get("sigma").getAsDouble(), 0.0);
            assertEquals(1, e.getAsJsonObject().get("noise_scan_slice").getAsInt());
        }
        assertTrue(r.err().contains("slice 3: noise-only scan"), r.err());
    }
}
