package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.ImagePlus;
import ij.ImageStack;
import ij.process.FloatProcessor;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.util.SplittableRandom;
import java.util.zip.GZIPOutputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.sample.Phantoms;
import org.noisewise.testing.TestImages;
import picocli.CommandLine;

/**
 * Issue 20, each finding run through the command line exactly as the "Why" ran it, asserting
 * on what the user sees (exit status, the one stderr line, the figures).
 */
class UserPathFindingsCliTest {

    @TempDir
    Path dir;

    private static final String[] BG = {"--background", "2,2,24,24", "--background", "102,2,24,24", "--background",
        "2,102,24,24", "--background", "102,102,24,24"};

    private Path stack(String name, int frames, java.util.function.IntFunction<float[]> frame, int w) {
        ImageStack st = new ImageStack(w, w);
        for (int f = 0; f < frames; f++) {
            st.addSlice(new FloatProcessor(w, w, frame.apply(f)));
        }
        return TestImages.saveTiff(new ImagePlus(name, st), dir, name);
    }

    private Path gaussian(String name, int frames, double mean, double sd, long seed) {
        SplittableRandom r = new SplittableRandom(seed);
        return stack(name, frames, f -> {
            float[] p = new float[64 * 64];
            for (int i = 0; i < p.length; i++) {
                p[i] = (float) (mean + sd * r.nextGaussian());
            }
            return p;
        }, 64);
    }

    private Path disk(String name, int frames, double a, double sigma, long seed) {
        return stack(name, frames, f -> Phantoms.disk(128, 128, 64, 64, 40, a, sigma, 1, seed * 1000 + f), 128);
    }

    private static void oneLineError(CliRunner.Result r, String... words) {
        assertEquals(3, r.status(), r.out() + r.err());
        String err = r.err().strip();
        assertEquals(1, err.lines().count(), "one line, no stack trace: " + err);
        for (String w : words) {
            assertTrue(err.contains(w), "'" + w + "' in: " + err);
        }
    }

    /** 20.2: signed data get the Gaussian model (never a magnitude correction), or a refusal. */
    @Test
    void signedDataAreNeverMagnitudeCorrected() {
        Path signed = gaussian("signed.tif", 10, -5, 3, 20);
        CliRunner.Result rep = CliRunner.run("repeat", signed.toString(), "--rician", "--signal", "10,10,40,40", "--json");
        assertEquals(0, rep.status(), rep.err());
        JsonObject o = JsonParser.parseString(rep.out()).getAsJsonObject();
        // the data's SD is 3 (not inflated to 4.4 by a Rician factor) and the SNR their ratio, -5/3
        assertEquals(3.0, o.get("sigma").getAsDouble(), 0.1);
        assertEquals(-5.0 / 3.0, o.get("snr").getAsDouble(), 0.1);
        assertTrue(o.get("snr_ci95").getAsJsonArray().get(0).getAsDouble()
                < o.get("snr_ci95").getAsJsonArray().get(1).getAsDouble());
        assertTrue(rep.out().contains("signed_data") && rep.out().contains("Gaussian model"), rep.out());
        CliRunner.Result diff = CliRunner.run("difference", signed.toString(), "--frames", "1,2", "--signal",
                "10,10,40,40", "--json");
        assertEquals(0, diff.status(), diff.err());
        assertTrue(diff.out().contains("signed_data"));
        oneLineError(CliRunner.run("background", signed.toString(), "--signal", "10,10,20,20", "--background",
                "40,40,20,20"), "not a magnitude image");
        oneLineError(CliRunner.run("check", signed.toString(), "--background", "40,40,20,20"), "not a magnitude image");
        oneLineError(CliRunner.run("correct", signed.toString(), "--sigma", "3", "--out",
                dir.resolve("c.tif").toString()), "not a magnitude image");
        assertFalse(Files.exists(dir.resolve("c.tif")));
        Path other = gaussian("signed2.tif", 10, -5, 3, 21);
        oneLineError(CliRunner.run("compare", signed.toString(), other.toString(), "--signal", "10,10,40,40"),
                "signed values");
    }

    /** 20.4: a killed run's temporary file is cleaned by the next write into that folder, under any name. */
    @Test
    void aStaleTemporaryFileIsCleanedByTheNextWriteInItsFolder() throws IOException {
        Path img = disk("img.tif", 1, 120, 5, 4);
        Path out = Files.createDirectories(dir.resolve("out"));
        Path stale = out.resolve(".c.tif.1234567890123.part");
        Files.writeString(stale, "half a file");
        Files.setLastModifiedTime(stale, FileTime.fromMillis(System.currentTimeMillis() - 3_600_000));
        Path mine = out.resolve("notes.part");
        Files.writeString(mine, "not ours");
        CliRunner.Result r = CliRunner.run("correct", img.toString(), "--sigma", "5", "--out",
                out.resolve("next.tif").toString());
        assertEquals(0, r.status(), r.err());
        assertFalse(Files.exists(stale), "the stale temporary file is gone");
        assertTrue(Files.exists(mine), "a file not named as ours is left alone");
    }

    /** 20.5: every command's help renders without a picocli warning (the % signs escaped). */
    @Test
    void everyHelpRendersWithoutAWarning() {
        PrintStream old = System.err;
        ByteArrayOutputStream captured = new ByteArrayOutputStream();
        System.setErr(new PrintStream(captured, true, StandardCharsets.UTF_8));
        try {
            CliRunner.Result top = CliRunner.run("--help");
            assertEquals(0, top.status());
            for (Class<?> c : NoisewiseCli.COMMANDS) {
                String name = c.getAnnotation(CommandLine.Command.class).name();
                CliRunner.Result r = CliRunner.run(name, "--help");
                assertEquals(0, r.status(), name);
                assertFalse(r.out().isBlank(), name);
                assertFalse(r.out().contains("%n") || r.err().contains("WARN"), name + ": " + r.out() + r.err());
            }
            assertTrue(CliRunner.run("compare", "--help").out().replaceAll("\\s+", " ").contains("95% interval"));
        } finally {
            System.setErr(old);
        }
        assertFalse(captured.toString(StandardCharsets.UTF_8).contains("picocli WARN"), captured.toString(
                StandardCharsets.UTF_8));
    }

    /** 20.10: an output folder is created when its parent exists; a file there, or no parent, is refused clearly. */
    @Test
    void outputFoldersAreCreatedAsUsersExpect() throws IOException {
        Path series = disk("series.tif", 20, 800, 8, 7);
        Path plots = dir.resolve("new plots");
        CliRunner.Result r = CliRunner.run("stability", series.toString(), "--plots", plots.toString());
        assertEquals(0, r.status(), r.err());
        assertTrue(Files.exists(plots.resolve("stability_weisskoff.png")));
        oneLineError(CliRunner.run("stability", series.toString(), "--plots", dir.resolve("no/such/dir").toString()),
                "parent folder", "does not exist");
        Path file = Files.writeString(dir.resolve("a file"), "x");
        oneLineError(CliRunner.run("stability", series.toString(), "--plots", file.toString()), "is a file, not a folder");
        oneLineError(CliRunner.run("correct", series.toString(), "--sigma", "8", "--out",
                file.resolve("out.tif").toString()), "is a file, not a folder");
        Path img = disk("qa.tif", 1, 120, 5, 9);
        CliRunner.Result qa = CliRunner.run("qa", img.toString(), "--log", dir.resolve("qa.csv").toString(), "--trends",
                dir.resolve("trend plots").toString());
        assertEquals(0, qa.status(), qa.err());
        assertTrue(Files.isDirectory(dir.resolve("trend plots")));
    }

    /** 20.11: the bad-input cases that were silent or unclear. */
    @Test
    void badInputIsRefusedOrNamed() throws IOException {
        int w = 64;
        // stability: negative data, no temporal noise, a NaN voxel, a region in air, --baseline 1
        Path neg = gaussian("neg.tif", 30, -5, 3, 1);
        oneLineError(CliRunner.run("stability", neg.toString()), "not a magnitude series");
        oneLineError(CliRunner.run("stability", neg.toString(), "--signal", "10,10,20,20"), "not a magnitude series");
        Path still = stack("still.tif", 30, f -> Phantoms.disk(w, w, 32, 32, 20, 800, 8, 1, 5), w);
        CliRunner.Result flat = CliRunner.run("stability", still.toString(), "--signal", "26,26,12,12", "--json");
        assertEquals(0, flat.status(), flat.err());
        assertTrue(flat.out().contains("no_temporal_noise"), flat.out());
        Path nan = stack("nan.tif", 30, f -> {
            float[] p = Phantoms.disk(w, w, 32, 32, 20, 800, 8, 1, 100 + f);
            if (f == 11) {
                p[32 * w + 32] = Float.NaN;
            }
            return p;
        }, w);
        oneLineError(CliRunner.run("stability", nan.toString()), "frame 12", "NaN");
        Path series = stack("ok.tif", 30, f -> Phantoms.disk(w, w, 32, 32, 20, 800, 8, 1, 200 + f), w);
        CliRunner.Result air = CliRunner.run("stability", series.toString(), "--signal", "1,1,8,8", "--json");
        assertEquals(0, air.status(), air.err());
        assertTrue(air.out().contains("region_in_air"), air.out());
        oneLineError(CliRunner.run("stability", series.toString(), "--baseline", "1"), "at least 2");
        // compare the same file with itself; gfactor with a window wider than the image
        oneLineError(CliRunner.run("compare", series.toString(), series.toString(), "--signal", "26,26,12,12"),
                "same pixels");
        Path other = stack("ok2.tif", 30, f -> Phantoms.disk(w, w, 32, 32, 20, 800, 8, 1, 300 + f), w);
        oneLineError(CliRunner.run("gfactor", series.toString(), other.toString(), "--acceleration", "2", "--window",
                "1001", "--signal", "26,26,12,12"), "odd number of pixels from 1 to 63");
        // correct with a sigma above every pixel: written, and said so
        CliRunner.Result zero = CliRunner.run("correct", series.toString(), "--sigma", "1e30", "--out",
                dir.resolve("zero.tif").toString());
        assertEquals(0, zero.status(), zero.err());
        assertTrue(zero.err().contains("zero (or nearly) everywhere"), zero.err());
        // batch: options refused once; a folder without images is exit 3, not a row calling a text file an image
        oneLineError(CliRunner.run("batch", dir.toString(), "--method", "stability", "--skip", "-1"), "--skip");
        oneLineError(CliRunner.run("batch", dir.toString(), "--method", "stability", "--roi-size", "0"), "--roi-size");
        Path texts = Files.createDirectories(dir.resolve("texts"));
        Files.writeString(texts.resolve("readme.txt"), "not an image\nat all\n");
        CliRunner.Result none = CliRunner.run("batch", texts.toString(), "--method", "background", "--signal",
                "1,1,2,2", "--background", "3,3,2,2");
        assertEquals(3, none.status(), none.err());
        assertTrue(none.err().contains("no images to measure") && !none.err().contains("3x0"), none.err());
        oneLineError(CliRunner.run("background", texts.resolve("readme.txt").toString(), "--signal", "1,1,2,2",
                "--background", "3,3,2,2"), "not an image");
        // a refused QA log leaves nothing beside it
        Path notLog = Files.writeString(dir.resolve("results.csv"), "a,b\n1,2\n");
        oneLineError(CliRunner.run("qa", disk("q.tif", 1, 120, 5, 3).toString(), "--log", notLog.toString()),
                "not a Noisewise QA log");
        assertFalse(Files.exists(dir.resolve("results.csv.lock")), "no lock file left beside it");
    }

    /** 20.11: damaged NIfTI files get a cause and an action, never a library's raw words. */
    @Test
    void damagedNiftiSaysWhatToDo() throws IOException {
        byte[] good = org.noisewise.testing.OpenData.bytes("functional.nii");
        Path notGzip = Files.write(dir.resolve("plain.nii.gz"), good);
        Path cut = dir.resolve("cut.nii.gz");
        ByteArrayOutputStream gz = new ByteArrayOutputStream();
        try (GZIPOutputStream z = new GZIPOutputStream(gz)) {
            z.write(good);
        }
        Files.write(cut, java.util.Arrays.copyOf(gz.toByteArray(), gz.size() / 2));
        Path truncated = Files.write(dir.resolve("short.nii"), java.util.Arrays.copyOf(good, good.length - 500));
        byte[] header = good.clone();
        header[0] = 12;
        Path wrongHeader = Files.write(dir.resolve("header.nii"), header);
        Path tiny = Files.write(dir.resolve("tiny.nii"), new byte[100]);
        for (Path p : new Path[] {notGzip, cut, truncated, wrongHeader, tiny}) {
            CliRunner.Result r = CliRunner.run("repeat", p.toString(), "--signal", "1,1,4,4");
            oneLineError(r, "NIfTI");
            assertTrue(r.err().matches("(?s).*(again|rename|check).*"), "an action: " + r.err());
            assertFalse(r.err().contains("Not in GZIP format"), r.err());
        }
    }

    /** 20.11: protocol arguments: empty refused, spaces around '=' read, a DICOM header completed by pairs. */
    @Test
    void protocolArgumentsAsUsersWriteThem() throws IOException {
        oneLineError(CliRunner.run("predict", "--from", "", "--to", "voxel=1x1x5"), "is empty");
        CliRunner.Result spaced = CliRunner.run("predict", "--from", "voxel = 1x1x5, phase = 256, averages = 1, "
                + "bandwidth = 130", "--to", "voxel=1x1x3,phase=256,averages=2,bandwidth=260", "--json");
        assertEquals(0, spaced.status(), spaced.err());
        assertEquals(0.6, JsonParser.parseString(spaced.out()).getAsJsonObject().get("ratio").getAsDouble(), 1e-9,
                "the reference sheet's check value, closed form");
        byte[] d = org.noisewise.testing.OpenData.bytes("MR_small.dcm");
        Path dcm = Files.write(dir.resolve("mr.dcm"), d);
        CliRunner.Result completed = CliRunner.run("predict", "--from", dcm + ",phase=64,averages=1,bandwidth=130",
                "--to", dcm + ",phase=64,averages=4,bandwidth=130", "--json");
        assertEquals(0, completed.status(), completed.err());
        assertEquals(2.0, JsonParser.parseString(completed.out()).getAsJsonObject().get("ratio").getAsDouble(), 1e-9,
                "four times the averages: twice the SNR (closed form)");
    }
}
