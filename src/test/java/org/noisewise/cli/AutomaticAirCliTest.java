package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.noisewise.cli.CliRunner.holds;
import static org.noisewise.cli.CliRunner.json;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.IJ;
import ij.ImagePlus;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.sample.HeadSample;

/**
 * Issue 21 on the command line, as a user runs it: {@code --background auto} on the bundled head-like
 * sample (generated: sigma 4, true SNR 25 in the signal region, an 8% Nyquist ghost up and down,
 * zero-filled side bands, 16-bit) and on the 8-channel disk sample (sigma 5, true SNR 24).
 */
class AutomaticAirCliTest {

    @TempDir
    Path dir;

    private static final String HEAD = "sample-images/" + HeadSample.FILE;
    private static final String SIGNAL = HeadSample.SIGNAL.toString();

    @Test
    void headSampleWithGhostsAndZeroBands() {
        CliRunner.Result r = CliRunner.run("background", HEAD, "--signal", SIGNAL, "--background", "auto", "--json");
        JsonObject o = json(r);
        assertTrue(holds(o.getAsJsonArray("sigma_ci95"), HeadSample.SIGMA), o.get("sigma").toString());
        assertTrue(holds(o.getAsJsonArray("snr_ci95"), HeadSample.trueSnr()), o.get("snr").toString());
        assertEquals("valid", o.get("verdict").getAsString());
        int air = o.getAsJsonObject("pixels").get("background").getAsInt();
        assertTrue(air > 2000, "air pixels " + air);
        assertEquals(100.0 * air / (128 * 128), o.get("background_share").getAsDouble(), 1e-9);
        assertTrue(r.err().contains("automatic air: " + air + " pixels of pure noise"), r.err());
        // the corners drawn by hand take in the ghost: sigma too high, its interval misses the truth
        JsonObject corners = json(CliRunner.run("background", HEAD, "--signal", SIGNAL, "--background", "8,2,24,24",
                "--background", "96,2,24,24", "--background", "8,102,24,24", "--background", "96,102,24,24", "--json"));
        assertFalse(holds(corners.getAsJsonArray("sigma_ci95"), HeadSample.SIGMA));
        assertTrue(corners.get("sigma").getAsDouble() > 1.2 * HeadSample.SIGMA);
        // the ghost covers all four corners alike; the cross-check against the automatic air says so
        assertEquals("questionable", corners.get("verdict").getAsString());
        assertTrue(corners.get("warnings").toString().contains("regions_above_air"), corners.get("warnings").toString());
    }

    @Test
    void eightChannelDiskAndTheCheck() {
        JsonObject o = json(CliRunner.run("background", "sample-images/bramble_disk_8ch.tif", "--signal",
                "49,49,30,30", "--background", "auto", "--channels", "8", "--json"));
        assertTrue(holds(o.getAsJsonArray("sigma_ci95"), 5.0), o.get("sigma").toString());
        assertTrue(holds(o.getAsJsonArray("snr_ci95"), 24.0), o.get("snr").toString());
        // narrower than the four corners: all the air against 2,304 pixels
        JsonObject corners = json(CliRunner.run("background", "sample-images/bramble_disk_8ch.tif", "--signal",
                "49,49,30,30", "--background", "2,2,24,24", "--background", "102,2,24,24", "--background",
                "2,102,24,24", "--background", "102,102,24,24", "--channels", "8", "--json"));
        double wAuto = o.getAsJsonArray("sigma_ci95").get(1).getAsDouble() - o.getAsJsonArray("sigma_ci95").get(0)
                .getAsDouble();
        double wCorners = corners.getAsJsonArray("sigma_ci95").get(1).getAsDouble()
                - corners.getAsJsonArray("sigma_ci95").get(0).getAsDouble();
        assertTrue(wAuto < 0.7 * wCorners, wAuto + " against " + wCorners);
        JsonObject check = json(CliRunner.run("check", "sample-images/bramble_disk_8ch.tif", "--background", "auto",
                "--channels", "8", "--json"));
        assertEquals("valid", check.get("verdict").getAsString());
        assertTrue(check.has("background_share"));
    }

    @Test
    void airMaskFile() throws IOException {
        Path mask = dir.resolve("air.tif");
        CliRunner.Result r = CliRunner.run("background", HEAD, "--signal", SIGNAL, "--background", "auto", "--air-mask",
                mask.toString(), "--json");
        JsonObject o = json(r);
        ImagePlus m = IJ.openImage(mask.toString());
        assertEquals(8, m.getBitDepth());
        byte[] b = (byte[]) m.getProcessor().getPixels();
        int air = 0;
        for (byte v : b) {
            assertTrue(v == 0 || v == (byte) 255);
            air += v == (byte) 255 ? 1 : 0;
        }
        assertEquals(o.getAsJsonObject("pixels").get("background").getAsInt(), air);
        var s = HeadSample.SIGNAL;
        for (int y = s.y(); y < s.y() + s.h(); y++) {
            for (int x = s.x(); x < s.x() + s.w(); x++) {
                assertEquals(0, b[y * 128 + x], "the signal region is never air");
            }
        }
        // no overwrite without --force, the first file kept
        long size = Files.size(mask);
        CliRunner.Result again = CliRunner.run("background", HEAD, "--signal", SIGNAL, "--background", "auto",
                "--air-mask", mask.toString());
        assertNotEquals(0, again.status());
        assertTrue(again.err().contains("--force"), again.err());
        assertEquals(size, Files.size(mask));
        try (var files = Files.list(dir)) {
            assertEquals(List.of(mask), files.toList(), "no temporary files left");
        }
    }

    @Test
    void batchWithAutomaticAir() throws IOException {
        Path folder = Files.createDirectories(dir.resolve("exports"));
        Files.copy(Path.of(HEAD), folder.resolve("a.tif"));
        Files.copy(Path.of("sample-images/aster_disk_1ch.tif"), folder.resolve("b.tif"));
        CliRunner.Result r = CliRunner.run("batch", folder.toString(), "--method", "background", "--signal", SIGNAL,
                "--background", "auto", "--json");
        assertEquals(0, r.status(), r.err());
        JsonArray rows = JsonParser.parseString(r.out()).getAsJsonArray();
        assertEquals(2, rows.size());
        for (var row : rows) {
            assertTrue(row.getAsJsonObject().get("background_share").getAsDouble() > 10, row.toString());
        }
    }

    /** Bad input: one line on stderr each, nothing written. */
    @Test
    void refusals() throws IOException {
        CliRunner.Result mixed = CliRunner.run("background", HEAD, "--signal", SIGNAL, "--background", "auto",
                "--background", "2,2,10,10");
        assertNotEquals(0, mixed.status());
        assertTrue(mixed.err().contains("--background auto stands alone"), mixed.err());
        CliRunner.Result maskOnly = CliRunner.run("background", HEAD, "--signal", SIGNAL, "--background", "2,2,20,20",
                "--air-mask", dir.resolve("m.tif").toString());
        assertNotEquals(0, maskOnly.status());
        assertTrue(maskOnly.err().contains("add --background auto"), maskOnly.err());
        assertFalse(Files.exists(dir.resolve("m.tif")));
        CliRunner.Result compare = CliRunner.run("compare", HEAD, HEAD, "--signal", SIGNAL, "--background", "auto");
        assertNotEquals(0, compare.status());
        assertTrue(compare.err().contains("--background auto is not used by compare"), compare.err());
        // an object filling the field of view: too little air, said with how much and what to do
        Path full = dir.resolve("full.tif");
        float[] p = new float[64 * 64];
        java.util.SplittableRandom rng = new java.util.SplittableRandom(4);
        for (int i = 0; i < p.length; i++) {
            p[i] = (float) (100 + 5 * rng.nextGaussian());
        }
        IJ.saveAsTiff(new ImagePlus("full", new ij.process.FloatProcessor(64, 64, p)), full.toString());
        CliRunner.Result none = CliRunner.run("background", full.toString(), "--signal", "10,10,20,20", "--background",
                "auto");
        assertNotEquals(0, none.status());
        assertEquals(1, none.err().strip().lines().count(), none.err());
        assertTrue(none.err().contains("automatic air found only") && none.err().contains("difference method"),
                none.err());
    }

    /**
     * Real files (open data from Debian's python3-pydicom and python3-nibabel, see the opendata README):
     * neither holds usable air, and automatic air says so instead of measuring structure as noise —
     * pydicom's MR_small is a 64 x 64 crop of a head that fills the field of view; nibabel's functional.nii
     * has slices too small to hold 500 pixels of air.
     */
    @Test
    void realFilesWithoutAirAreRefusedWithTheReason() {
        CliRunner.Result head = CliRunner.run("check", "src/test/resources/opendata/MR_small.dcm", "--background",
                "auto");
        assertNotEquals(0, head.status());
        assertTrue(head.err().contains("field of view may be filled by the object"), head.err());
        CliRunner.Result small = CliRunner.run("check", "src/test/resources/opendata/functional.nii", "--background",
                "auto", "--slice", "1");
        assertNotEquals(0, small.status());
        assertTrue(small.err().contains("too few usable pixels"), small.err());
    }

    /**
     * A real image with air: the b0 volume {@code S0_10slices.nii.gz} (ten 128 x 128 slices of a head,
     * from Debian's {@code python3-dipy} 1.6.0-1, see {@code opendata/README.md}). The truth is not
     * known, so the checks are ones real noise must pass: one acquisition's slices share one noise level
     * (common practice: the same receiver chain, no slice-wise scaling), so the ten automatic-air sigmas
     * must agree within their intervals (chi-square test of homogeneity); the air is a sensible share of
     * each slice; and on slice 5, four hand-drawn corners in air give a sigma that agrees with the
     * automatic air's, whose interval is far narrower.
     */
    @Test
    void realHeadVolumeWithAir() {
        String f = "src/test/resources/opendata/S0_10slices.nii.gz";
        CliRunner.Result r = CliRunner.run("background", f, "--signal", "50,60,10,10", "--background", "auto", "--json");
        assertEquals(0, r.status(), r.err());
        JsonArray rows = JsonParser.parseString(r.out()).getAsJsonArray();
        assertEquals(10, rows.size());
        double[] logSigma = new double[10];
        double[] se = new double[10];
        double wsum = 0;
        double mean = 0;
        for (int k = 0; k < 10; k++) {
            JsonObject o = rows.get(k).getAsJsonObject();
            double share = o.get("background_share").getAsDouble();
            assertTrue(share > 30 && share < 60, "slice " + (k + 1) + " air share " + share);
            JsonArray ci = o.getAsJsonArray("sigma_ci95");
            logSigma[k] = Math.log(o.get("sigma").getAsDouble());
            se[k] = (Math.log(ci.get(1).getAsDouble()) - Math.log(ci.get(0).getAsDouble())) / (2 * 1.959964);
            double w = 1 / (se[k] * se[k]);
            wsum += w;
            mean += w * logSigma[k];
        }
        mean /= wsum;
        double q = 0;
        for (int k = 0; k < 10; k++) {
            q += Math.pow((logSigma[k] - mean) / se[k], 2);
        }
        double p = 1 - new org.apache.commons.math3.distribution.ChiSquaredDistribution(9).cumulativeProbability(q);
        assertTrue(p > 1e-3, "the slices' sigmas disagree: chi-square " + q + ", p = " + p);
        assertFalse(r.err().contains("still changing"), r.err());
        JsonObject auto = JsonParser.parseString(CliRunner.run("background", f, "--signal", "50,60,10,10",
                "--background", "auto", "--slice", "5", "--json").out()).getAsJsonObject();
        CliRunner.Result c = CliRunner.run("background", f, "--signal", "50,60,10,10", "--slice", "5", "--background",
                "2,2,20,20", "--background", "106,2,20,20", "--background", "2,106,20,20", "--background",
                "106,106,20,20", "--json");
        JsonObject corners = json(c);
        double a = Math.log(auto.get("sigma").getAsDouble());
        double b = Math.log(corners.get("sigma").getAsDouble());
        double sa = width(auto) / (2 * 1.959964);
        double sb = width(corners) / (2 * 1.959964);
        assertTrue(Math.abs(a - b) < 1.959964 * Math.hypot(sa, sb), "auto " + a + " corners " + b);
        assertTrue(sa < 0.6 * sb, "all the air is more precise than four corners");
    }

    /**
     * A background region drawn by hand in the zero-filled band: the check says why it is invalid and
     * still draws the histogram (a bar at zero, no curve fitted to noise that is not there).
     */
    @Test
    void aRegionDrawnInTheZeroFilledBandIsJudgedNotAnError() throws IOException {
        Path plot = dir.resolve("zero_band.png");
        CliRunner.Result r = CliRunner.run("check", HEAD, "--background", "0,40,"
                + HeadSample.ZERO_BAND + ",40", "--plot", plot.toString(), "--json");
        JsonObject o = json(r);
        assertEquals("invalid", o.get("verdict").getAsString());
        assertTrue(o.get("warnings").toString().contains("masked_background"), o.get("warnings").toString());
        assertTrue(Files.size(plot) > 0, "the histogram was drawn");
    }

    private static double width(JsonObject o) {
        JsonArray ci = o.getAsJsonArray("sigma_ci95");
        return Math.log(ci.get(1).getAsDouble()) - Math.log(ci.get(0).getAsDouble());
    }

    /**
     * Phantom QA with all the air: on the head-like sample the placed regions beside the head reach into
     * the zero-filled bands and the background method is refused; {@code --background auto} finds the air
     * and its sigma interval holds the truth; the report outlines the air; a region given to
     * {@code --background} is refused (QA places its own).
     */
    @Test
    void phantomQaWithAllTheAir() throws IOException {
        JsonObject placed = json(CliRunner.run("qa", HEAD, "--json"));
        assertEquals("invalid", placed.get("verdict").getAsString());
        assertTrue(placed.get("warnings").toString().contains("masked_background"), placed.get("warnings").toString());
        Path report = dir.resolve("qa.html");
        Path mask = dir.resolve("air.tif");
        CliRunner.Result r = CliRunner.run("qa", HEAD, "--background", "auto", "--report", report.toString(),
                "--air-mask", mask.toString(), "--json");
        JsonObject o = json(r);
        assertEquals("valid", o.get("verdict").getAsString());
        assertTrue(holds(o.getAsJsonArray("sigma_ci95"), HeadSample.SIGMA), o.get("sigma").toString());
        int air = o.getAsJsonObject("pixels").get("background").getAsInt();
        assertEquals(100.0 * air / (128 * 128), o.get("background_share").getAsDouble(), 1e-9);
        assertTrue(r.err().contains("background: automatic air, " + air + " pixels"), r.err());
        assertTrue(Files.readString(report).contains("the automatic air outlined in cyan"));
        ImagePlus m = IJ.openImage(mask.toString());
        assertEquals(8, m.getBitDepth());
        assertEquals(air, m.getStatistics().histogram[255], "the mask holds the air counted");
        CliRunner.Result bad = CliRunner.run("qa", HEAD, "--background", "2,2,20,20");
        assertEquals(3, bad.status());
        assertTrue(bad.err().contains("--background takes only auto here"), bad.err());
        CliRunner.Result noAuto = CliRunner.run("qa", HEAD, "--air-mask", dir.resolve("m2.tif").toString());
        assertEquals(3, noAuto.status());
        assertTrue(noAuto.err().contains("add --background auto"), noAuto.err());
    }
}
