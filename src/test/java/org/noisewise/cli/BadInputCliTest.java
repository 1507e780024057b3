package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.ImageStack;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.testing.TestImages;

/**
 * Issue 12: every argument is used or refused, every message says what is wrong and what to do, no
 * input is ever replaced and no temporary file is left behind (one line on stderr, exit 3, no stack trace).
 */
class BadInputCliTest {

    @TempDir
    static Path dir;
    static Path a;
    static Path b;
    static final String A = "sample-images/aster_disk_acq1.tif";
    static final String B = "sample-images/aster_disk_acq2.tif";

    @BeforeAll
    static void images() {
        a = TestImages.saveTiff(TestImages.phantom("a", 100, 4, 1, 1), dir, "a.tif");
        b = TestImages.saveTiff(TestImages.phantom("b", 100, 4, 1, 2), dir, "b.tif");
    }

    private static String inputError(String... args) {
        CliRunner.Result r = CliRunner.run(args);
        assertEquals(3, r.status(), String.join(" ", args) + ": " + r.err() + r.out());
        String err = r.err().strip();
        String last = err.substring(err.lastIndexOf('\n') + 1);
        assertTrue(last.startsWith("noisewise: error: "), err);
        assertFalse(err.contains("Exception") || err.contains("\tat "), err);
        return last;
    }

    @Test
    void anInputIsNeverReplacedEvenWithForce() throws Exception {
        byte[] before = Files.readAllBytes(a);
        String m = inputError("correct", a.toString(), "--sigma", "4", "--out", a.toString(), "--force");
        assertTrue(m.contains("is an input"), m);
        String viaOtherName = inputError("correct", a.toString(), "--sigma", "4", "--out",
                dir.resolve(".").resolve("a.tif").toString(), "--force");
        assertTrue(viaOtherName.contains("is an input"), viaOtherName);
        String map = inputError("check", a.toString(), "--background", "1,1,14,14", "--plot", a.toString(), "--force");
        assertTrue(map.contains("is an input"), map);
        assertTrue(java.util.Arrays.equals(before, Files.readAllBytes(a)), "the input was changed");
    }

    @Test
    void everyArgumentIsUsedOrRefused() throws Exception {
        assertTrue(inputError("qa", A, B, A).contains("3 images were given"));
        assertTrue(inputError("difference", a.toString(), b.toString(), "missing.tif", "--signal", "38,38,20,20")
                .contains("3 images were given"));
        assertTrue(inputError("qa", "sample-images/aster_disk_1ch.tif", "--repeats").contains("single frame"));
        Path empty = Files.createDirectory(dir.resolve("empty"));
        assertTrue(inputError("batch", empty.toString(), "--method", "background", "--signal", "1,1,5,5",
                "--background", "1,1,4,4").contains("no images to measure"));
    }

    @Test
    void messagesSayWhatIsWrong() throws Exception {
        assertTrue(inputError("qa", A, B, "--limits", "--field", "-3").contains("positive"));
        assertTrue(inputError("qa", A, B, "--trends", dir.toString()).contains("--log"));
        Path log = dir.resolve("m.csv");
        // a trends folder is created when its parent exists (issue 20.10); a missing parent is named
        assertTrue(inputError("qa", A, B, "--log", log.toString(), "--trends", dir.resolve("no/such").toString())
                .contains("does not exist"));
        Path notAFolder = dir.resolve("plain.txt");
        Files.writeString(notAFolder, "x");
        String out = inputError("batch", dir.toString(), "--method", "background", "--signal", "1,1,5,5", "--background",
                "1,1,4,4", "--out", notAFolder.resolve("r.csv").toString());
        assertTrue(out.contains("is a file, not a folder"), out);
        ImagePlus noise = new ImagePlus("noise", TestImages.phantom("n", 0, 5, 1, 9).getProcessor());
        Path n = TestImages.saveTiff(noise, dir, "noise.tif");
        assertTrue(inputError("qa", n.toString()).contains("no phantom found"));
        ImageStack two = new ImageStack(TestImages.SIZE, TestImages.SIZE);
        two.addSlice(TestImages.phantom("x", 60, 4, 1, 1).getProcessor());
        two.addSlice(TestImages.phantom("y", 60, 4, 1, 2).getProcessor());
        Path pair = TestImages.saveTiff(new ImagePlus("pair", two), dir, "pair.tif");
        CliRunner.Result r = CliRunner.run("repeat", pair.toString(), "--signal", "38,38,20,20");
        assertEquals(0, r.status(), r.err());
        assertFalse(r.out().contains("Infinity"), r.out());
        assertTrue(r.out().contains("no finite expectation"), r.out());
    }

    /**
     * A DICOM file that is not an image, given alone (pydicom's DICOMDIR, made by DCMTK's dcmmkdir; see
     * the opendata README), and an image file without its pixels: one line saying which it is and what to do.
     */
    @Test
    void aDicomFileThatIsNotAnImageIsNamedAsSuch() throws Exception {
        Path d = org.noisewise.testing.OpenData.copy("DICOMDIR", dir.resolve("DICOMDIR"));
        String m = inputError("background", d.toString(), "--signal", "1,1,5,5", "--background", "10,10,4,4");
        assertTrue(m.endsWith("holds no pixel data: it is not an image (a report, a directory or another non-image "
                + "DICOM object); give an image file or a folder of one series"), m);
        // nibabel's Siemens header whose pixel data were removed (it still states 384 x 384 and calls itself a
        // mosaic without saying of how many slices): the missing pixels are what is named
        Path stripped = org.noisewise.testing.OpenData.copy("siemens_no_pixels.dcm", dir.resolve("stripped.dcm"));
        String s = inputError("background", stripped.toString(), "--signal", "1,1,5,5", "--background", "10,10,4,4");
        assertTrue(s.endsWith("states an image size (384x384) but holds no pixel data: the file is damaged or was "
                + "exported without its pixels; export the image again"), s);
    }

    /**
     * Standard output holds the results alone, as a pipeline reads them: ImageJ's own message for a file
     * it cannot open ("Unsupported format ...", which it prints on standard output when there is no window)
     * goes to standard error, so a batch's JSON still parses. Run as a process of its own, as a user runs it.
     */
    @Test
    void standardOutputHoldsOnlyTheResults() throws Exception {
        Path folder = Files.createDirectories(dir.resolve("with-unknown"));
        Files.copy(a, folder.resolve("a.tif"));
        try (java.util.zip.GZIPOutputStream gz = new java.util.zip.GZIPOutputStream(Files.newOutputStream(
                folder.resolve("archive.gz")))) {
            gz.write("not an image".getBytes(java.nio.charset.StandardCharsets.US_ASCII));
        }
        String jvm = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Path out = dir.resolve("batch-out.json");
        Path err = dir.resolve("batch-err.txt");
        Process p = new ProcessBuilder(jvm, "-cp", System.getProperty("java.class.path"), NoisewiseCli.class.getName(),
                "batch", folder.toString(), "--method", "background", "--signal", "38,38,20,20", "--background",
                "1,1,14,14", "--json").redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        assertTrue(p.waitFor(120, java.util.concurrent.TimeUnit.SECONDS), "batch still running");
        assertEquals(4, p.exitValue(), Files.readString(err));
        com.google.gson.JsonArray rows = com.google.gson.JsonParser.parseString(Files.readString(out)).getAsJsonArray();
        assertEquals(2, rows.size(), Files.readString(out));
        assertTrue(Files.readString(err).contains("Unsupported format"), "ImageJ's message is kept, on stderr");
    }

    /** Trend plots obey --force like every other output (issue 15.9). */
    @Test
    void trendPlotsAreNotReplacedWithoutForce() throws Exception {
        Path log = dir.resolve("t.csv");
        Path trends = Files.createDirectory(dir.resolve("trends"));
        assertEquals(0, CliRunner.run("qa", A, B, "--log", log.toString(), "--trends", trends.toString()).status());
        byte[] before = Files.readAllBytes(trends.resolve("trend_snr.png"));
        assertTrue(inputError("qa", A, B, "--log", log.toString(), "--trends", trends.toString()).contains("--force"));
        assertTrue(java.util.Arrays.equals(before, Files.readAllBytes(trends.resolve("trend_snr.png"))));
        assertEquals(1, org.noisewise.phantom.QaLog.parse(Files.readString(log)).size(), "a refused run logged a row");
        assertEquals(0, CliRunner.run("qa", A, B, "--log", log.toString(), "--trends", trends.toString(), "--force")
                .status());
    }

    /** An 8-bit image with a colour lookup table is measured on its stored values, with a note (issue 12.5). */
    @Test
    void colourLookupTableIsNoted() {
        ImagePlus imp = TestImages.phantom("lut", 100, 4, 1, 4);
        ImagePlus eight = new ImagePlus("lut8", imp.getProcessor().convertToByte(false));
        eight.getProcessor().setColorModel(ij.process.LUT.createLutFromColor(java.awt.Color.red));
        Path p = TestImages.saveTiff(eight, dir, "lut8.tif");
        CliRunner.Result r = CliRunner.run("background", p.toString(), "--signal", "38,38,20,20", "--background",
                "1,1,14,14");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.err().contains("colour lookup table"), r.err());
    }

    /** A temporary file left by a killed earlier run is removed by the next write of the same file (issue 12.3). */
    @Test
    void staleTemporaryFilesAreRemoved() throws Exception {
        Path out = dir.resolve("clean.tif");
        Path stale = dir.resolve(".clean.tif.123456.part");
        Files.writeString(stale, "left by a killed run");
        Files.setLastModifiedTime(stale, FileTime.fromMillis(System.currentTimeMillis() - 86_400_000L));
        CliRunner.Result r = CliRunner.run("correct", a.toString(), "--sigma", "4", "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        try (var files = Files.list(dir)) {
            List<String> parts = files.map(f -> f.getFileName().toString()).filter(f -> f.endsWith(".part")).toList();
            assertEquals(List.of(), parts);
        }
    }

    /** Issue 10: a full Java heap is one clear line saying what to do, exit 3, no stack trace (a real child JVM). */
    @Test
    void outOfMemoryIsOneClearLine() throws Exception {
        ij.process.FloatProcessor big = new ij.process.FloatProcessor(3000, 3000);
        Path file = dir.resolve("big.tif");
        new ij.io.FileSaver(new ImagePlus("big", big)).saveAsTiff(file.toString());
        String jvm = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        ProcessBuilder pb = new ProcessBuilder(jvm, "-Xmx24m", "-cp", System.getProperty("java.class.path"),
                NoisewiseCli.class.getName(), "qa", file.toString());
        pb.redirectErrorStream(true);
        Process p = pb.start();
        String all = new String(p.getInputStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8).strip();
        assertEquals(3, p.waitFor(), all);
        assertTrue(all.startsWith("noisewise: error: out of memory (the Java heap is at most "), all);
        assertTrue(all.contains("-Xmx") && all.contains("--slice"), all);
        assertFalse(all.contains("Exception") || all.contains("\tat "), all);
        assertEquals(1, all.lines().count(), all);
    }

    /**
     * A full heap while a DICOM series is read and measured on both cores is the same one line and exit 3,
     * never a wait for ever: a worker ended by the full heap once left the command waiting for its share
     * (a real child JVM per command, 52 MB of pixel data in a 24 MB heap).
     */
    @Test
    void outOfMemoryOnADicomSeriesIsOneClearLineNotAHang() throws Exception {
        Path series = Files.createDirectories(dir.resolve("large-series"));
        org.noisewise.io.DicomSeriesWriter.Spec spec = new org.noisewise.io.DicomSeriesWriter.Spec("large", 128, 128,
                4, 400);
        java.util.SplittableRandom rng = new java.util.SplittableRandom(10);
        for (int z = 0; z < 4; z++) {
            for (int t = 0; t < 400; t++) {
                short[] px = new short[128 * 128];
                for (int i = 0; i < px.length; i++) {
                    px[i] = (short) (500 + rng.nextInt(50));
                }
                spec.image(z, t, px, 1, 0);
            }
        }
        for (org.noisewise.io.DicomSeriesWriter.File f : org.noisewise.io.DicomSeriesWriter.singleFrame(spec)) {
            Files.write(series.resolve(f.name()), f.bytes());
        }
        String jvm = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        for (List<String> command : List.of(List.of("repeat", series.toString(), "--signal", "40,40,20,20"),
                List.of("stability", series.toString()))) {
            List<String> cmd = new java.util.ArrayList<>(List.of(jvm, "-Xmx24m", "-cp",
                    System.getProperty("java.class.path"), NoisewiseCli.class.getName()));
            cmd.addAll(command);
            Path log = dir.resolve("oom-" + command.get(0) + ".txt");
            Process p = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile()).start();
            boolean ended = p.waitFor(90, java.util.concurrent.TimeUnit.SECONDS);
            if (!ended) {
                p.destroyForcibly();
            }
            String all = Files.readString(log).strip();
            assertTrue(ended, command.get(0) + " still running after 90 s with a full heap: " + all);
            assertEquals(3, p.exitValue(), all);
            List<String> lines = all.lines().filter(l -> !l.startsWith(command.get(0) + ": note:")).toList();
            assertEquals(1, lines.size(), all);
            assertTrue(lines.get(0).startsWith("noisewise: error: out of memory (the Java heap is at most "), all);
            assertFalse(all.contains("Exception") || all.contains("\tat "), all);
        }
    }

    /** Issue 10: --progress reports on stderr from the reading of the file to the end, for every measuring command. */
    @Test
    void progressOnRequest() {
        CliRunner.Result r = CliRunner.run("qa", A, "--progress");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.err().contains("qa:   0% reading aster_disk_acq1.tif"), r.err());
        assertTrue(r.err().contains("qa: 100%"), r.err());
        CliRunner.Result q = CliRunner.run("qa", A);
        assertFalse(q.err().contains("%"), "no progress unless asked (stderr is not a terminal): " + q.err());
    }
}
