package org.noisewise.diagnose;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.ImagePlus;
import ij.ImageStack;
import ij.process.FloatProcessor;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.cli.NoisewiseCli;
import org.noisewise.estimate.Region;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImageFiles;
import org.noisewise.testing.DicomEdit;
import org.noisewise.testing.NoiseFields;
import org.noisewise.testing.TestImages;

/** The defects and suspicions of the core review (issue 15), each settled by a test that failed before. */
class ReviewFindingsTest {

    @TempDir
    Path dir;

    private static String[] run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int s = NoisewiseCli.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new String[] {Integer.toString(s), out.toString(), err.toString()};
    }

    /** 15.4: check and background report the same sigma interval for the same regions of correlated noise. */
    @Test
    void checkAndBackgroundGiveTheSameInterval() {
        int w = 96;
        float[] px = NoiseFields.image(new SplittableRandom(3), NoiseFields.Kind.BOX, w, w, null, 0, 5, 1);
        for (int y = 38; y < 58; y++) {
            for (int x = 38; x < 58; x++) {
                px[y * w + x] += 100;
            }
        }
        Path f = TestImages.saveTiff(new ImagePlus("smooth", new FloatProcessor(w, w, px)), dir, "smooth.tif");
        String[] bgArgs = {"--background", "0,0,30,30", "--background", "66,66,30,30", "--json"};
        String[] check = run(concat(new String[] {"check", f.toString()}, bgArgs));
        String[] background = run(concat(new String[] {"background", f.toString(), "--signal", "40,40,16,16"}, bgArgs));
        assertEquals("0", check[0], check[2]);
        assertEquals("0", background[0], background[2]);
        JsonObject c = JsonParser.parseString(check[1]).getAsJsonObject();
        JsonObject b = JsonParser.parseString(background[1]).getAsJsonObject();
        assertEquals(b.getAsJsonArray("sigma_ci95"), c.getAsJsonArray("sigma_ci95"));
        assertEquals(b.get("effective_pixels").getAsDouble(), c.get("effective_pixels").getAsDouble(), 0.0);
        assertTrue(c.get("effective_pixels").getAsDouble() < 0.5 * 1800, "the correlation was not measured");
    }

    private static String[] concat(String[] a, String[] b) {
        String[] out = java.util.Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }

    /** 15.10: the channel-count flag and its message use the same (99%) interval. */
    @Test
    void channelFlagAndMessageAgree() throws Exception {
        int w = 96;
        float[] px = new float[w * w];
        SplittableRandom rng = new SplittableRandom(8);
        for (int i = 0; i < px.length; i++) {
            px[i] = (float) NoiseFields.magnitude(rng, i % w > 40 && i % w < 56 && i / w > 40 && i / w < 56 ? 100 : 0, 4, 8);
        }
        List<Region> bg = List.of(Region.rectangle("b1", 0, 0, 30, 30, w, w), Region.rectangle("b2", 66, 66, 30, 30, w, w));
        BackgroundSnrResult r = BackgroundSnr.analyze(px, w, w, Region.rectangle("s", 42, 42, 12, 12, w, w), bg,
                new BackgroundSnr.Options(4, org.noisewise.estimate.SigmaEstimator.ML));
        String msg = r.warnings().stream().filter(x -> x.code().equals("channels_mismatch")).findFirst().orElseThrow()
                .message();
        assertTrue(msg.contains("99% interval"), msg);
    }

    /** 15.10: a DICOM series of mixed scaling keeps each slice's quantisation step and range. */
    @Test
    void mixedScalingSeriesKeepsStoragePerSlice() throws Exception {
        byte[] d;
        try (InputStream in = getClass().getResourceAsStream("/opendata/MR_small.dcm")) {
            d = in.readAllBytes();
        }
        Path folder = Files.createDirectory(dir.resolve("mixed"));
        String[] slopes = {"1", "2.5"};
        for (int i = 0; i < 2; i++) {
            byte[] e = DicomEdit.set(d, 0x0020, 0x0013, "IS", String.valueOf(i + 1));
            // each image of a series has its own SOP Instance UID, as a scanner writes it
            e = DicomEdit.set(e, 0x0008, 0x0018, "UI", "1.2.826.0.1.3680043.9.7891." + (i + 1));
            e = DicomEdit.set(e, 0x0028, 0x1053, "DS", slopes[i]);
            e = DicomEdit.set(e, 0x0028, 0x1052, "DS", "-100");
            Files.write(folder.resolve("s" + i + ".dcm"), e);
        }
        ImagePlus imp = ImageFiles.open(folder);
        assertEquals(32, imp.getBitDepth());
        assertEquals(1.0, BackgroundValues.storage(imp, 1).step(), 1e-9);
        assertEquals(2.5, BackgroundValues.storage(imp, 2).step(), 1e-9);
        assertTrue(Double.isFinite(BackgroundValues.storage(imp, 2).maximum()), "clipping check kept");
    }

    /** 15.10: integer NIfTI keeps a clipping check: the largest storable value from its datatype and scaling. */
    @Test
    void integerNiftiHasAClippingCheck() throws Exception {
        ImagePlus imp = ImageFiles.open(Path.of(getClass().getResource("/opendata/functional.nii").toURI()));
        BackgroundCheck.Storage s = BackgroundValues.storage(imp);
        java.nio.ByteBuffer h = java.nio.ByteBuffer.wrap(Files.readAllBytes(Path.of(getClass()
                .getResource("/opendata/functional.nii").toURI()))).order(java.nio.ByteOrder.LITTLE_ENDIAN);
        double slope = h.getFloat(112);
        double inter = h.getFloat(116);
        assertEquals(32767 * slope + inter, s.maximum(), 1e-3 * Math.abs(s.maximum()));
        assertEquals(Math.abs(slope), s.step(), 1e-9);
    }

    /** 15.8: repeats whose mean is negative are a measurement (SNR 0 with a reason), never an internal error. */
    @Test
    void negativeMeanRepeatsAreNoInternalError() {
        ImageStack st = new ImageStack(32, 32);
        SplittableRandom rng = new SplittableRandom(2);
        for (int f = 0; f < 6; f++) {
            float[] p = new float[32 * 32];
            for (int i = 0; i < p.length; i++) {
                p[i] = (float) (-50 + 3 * rng.nextGaussian());
            }
            st.addSlice(new FloatProcessor(32, 32, p));
        }
        Path f = TestImages.saveTiff(new ImagePlus("neg", st), dir, "neg.tif");
        String[] r = run("repeat", f.toString(), "--signal", "4,4,20,20", "--rician", "--json");
        assertEquals("0", r[0], r[2]);
        JsonObject o = JsonParser.parseString(r[1]).getAsJsonObject();
        // signed data (issue 20.2): the Gaussian model, SNR = mean / SD = -50 / 3, never a magnitude correction
        assertEquals(-50.0 / 3.0, o.get("snr").getAsDouble(), 1.0);
        assertTrue(r[1].contains("signed_data"), r[1]);
    }
}
