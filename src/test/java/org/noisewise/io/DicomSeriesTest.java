package org.noisewise.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.Prefs;
import ij.io.Opener;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.estimate.InputException;
import org.noisewise.testing.ScannerSeries;

/**
 * Issue 19: a DICOM series is read as the Z slices x T repeats the scanner acquired, from its
 * headers, whatever the numbering, the temporal tags, the direction of the positions or the file
 * layout (single-frame files or one enhanced multi-frame file); incomplete, duplicated, multi-echo,
 * multi-orientation series are refused with a message naming what is wrong.
 */
class DicomSeriesTest {

    private static final int Z = 4;
    private static final int T = 6;
    private static final long SEED = 19;

    @TempDir
    Path dir;

    /** The calibrated values the reader must give at slice z (0-based, ascending), repeat t. */
    private static float[] expected(int z, int t) {
        short[] s = ScannerSeries.stored(z, t, SEED, 1);
        float[] v = new float[s.length];
        for (int i = 0; i < s.length; i++) {
            v[i] = (float) (ScannerSeries.SLOPE * (s[i] & 0xffff));
        }
        return v;
    }

    private static void assertArranged(ImagePlus imp, boolean reversed) throws InputException {
        assertEquals(Z, imp.getNSlices(), "z slices");
        assertEquals(T, imp.getNFrames(), "repeats");
        assertEquals(Z, StackPlanes.zCount(imp));
        assertEquals(T, StackPlanes.repeatCount(imp));
        for (int z = 1; z <= Z; z++) {
            for (int t = 1; t <= T; t++) {
                int written = reversed ? Z - z : z - 1;
                assertArrayEquals(expected(written, t - 1), ImagePlanes.calibratedPixels(imp,
                        StackPlanes.index(imp, z, t)), 1e-4f, "z " + z + " t " + t);
            }
        }
    }

    private Path folder(DicomSeriesWriter.Spec spec, String name) {
        return ScannerSeries.folder(spec, dir, name);
    }

    @Test
    void bothNumberingConventionsWithAndWithoutTemporalTags() throws Exception {
        for (DicomSeriesWriter.Numbering n : DicomSeriesWriter.Numbering.values()) {
            for (DicomSeriesWriter.TimeTags tags : DicomSeriesWriter.TimeTags.values()) {
                String name = n + "_" + tags;
                Path f = folder(ScannerSeries.spec(name, Z, T, SEED, false).numbering(n).timeTags(tags), name);
                ImagePlus imp = ImageFiles.open(f);
                assertArranged(imp, false);
                String note = Arrangement.note(imp);
                assertTrue(note.contains(Z + " slices x " + T + " repeats from DICOM positions"), note);
                String key = switch (tags) {
                    case TEMPORAL_POSITION -> "Temporal Position Identifier (0020,0100)";
                    case ACQUISITION_NUMBER -> "Acquisition Number (0020,0012)";
                    case NONE -> "the order of Instance Number";
                };
                assertTrue(note.contains(key), note);
                assertEquals(2.0, imp.getCalibration().pixelWidth, 1e-12);
                assertEquals(6.0, imp.getCalibration().pixelDepth, 1e-9, "slice spacing from the positions");
            }
        }
    }

    /** Positions written in descending order along the normal: slice 1 is still the lowest position. */
    @Test
    void subfoldersAndDanglingLinksBesideTheFilesAreLeftOut() throws Exception {
        // the folder is listed by name only (no per-entry file check): what is not a file is left out
        // where it is read, and a damaged file is still an error
        Path f = folder(ScannerSeries.spec("extras", Z, T, SEED, false), "extras");
        Files.createDirectories(f.resolve("0000_notes"));
        Files.writeString(f.resolve("0000_notes").resolve("readme.txt"), "not part of the series");
        Files.createSymbolicLink(f.resolve("zzzz_gone.dcm"), f.resolve("no-such-file.dcm"));
        assertArranged(ImageFiles.open(f), false);
        assertEquals(1, DicomSeries.find(f).size());
        assertEquals(Z * T, DicomSeries.find(f).get(0).files().size());
        Files.write(f.resolve("zzzz_damaged.dcm"), java.util.Arrays.copyOf(Files.readAllBytes(
                DicomSeries.find(f).get(0).files().get(0)), 400));
        InputException e = assertThrows(InputException.class, () -> ImageFiles.open(f));
        assertTrue(e.getMessage().contains("zzzz_damaged.dcm"), e.getMessage());
    }

    /**
     * A DICOM object that is not an image (pydicom's DICOMDIR, made by DCMTK's dcmmkdir) beside the series'
     * files is left out and named in the note, not taken for a second series.
     */
    @Test
    void aDicomdirBesideTheFilesIsLeftOutAndNamed() throws Exception {
        Path f = folder(ScannerSeries.spec("withdir", Z, T, SEED, false), "withdir");
        resource("DICOMDIR", f.resolve("DICOMDIR"));
        ImagePlus imp = ImageFiles.open(f);
        assertArranged(imp, false);
        assertTrue(Arrangement.note(imp).endsWith("; left out 1 DICOM file that is not an image (no pixel data: a "
                + "DICOMDIR, a report or a presentation state): DICOMDIR"), Arrangement.note(imp));
        DicomSeries.Contents c = DicomSeries.scan(f, p -> true);
        assertEquals(1, c.series().size());
        assertEquals(Z * T, c.series().get(0).files().size());
        assertEquals(java.util.List.of(f.resolve("DICOMDIR")), c.nonImages());
        assertTrue(c.others().isEmpty());
    }

    @Test
    void descendingPositionsAreOrderedAlongTheNormal() throws Exception {
        Path f = folder(ScannerSeries.spec("desc", Z, T, SEED, false).geometry(2, 5, -6).origin(-64, -64, 40), "desc");
        assertArranged(ImageFiles.open(f), true);
        // an oblique orientation: the normal is row x column, not the z axis
        double c = Math.cos(0.3);
        double s = Math.sin(0.3);
        Path o = folder(ScannerSeries.spec("oblique", Z, T, SEED, false).orientation(1, 0, 0, 0, c, s)
                .numbering(DicomSeriesWriter.Numbering.SLICE_MAJOR), "oblique");
        assertArranged(ImageFiles.open(o), false);
    }

    @Test
    void enhancedMultiFrameFileWithPerFrameRescale() throws Exception {
        for (boolean undefined : new boolean[] {false, true}) {
            for (String syntax : new String[] {DicomWriter.EXPLICIT_LE, DicomWriter.IMPLICIT_LE}) {
                DicomSeriesWriter.Spec spec = ScannerSeries.spec("enh" + undefined + syntax, Z, T, SEED, true)
                        .transferSyntax(syntax, undefined).numbering(DicomSeriesWriter.Numbering.SLICE_MAJOR);
                Path f = ScannerSeries.enhanced(spec, dir, "enh" + undefined + syntax.length() + ".dcm");
                ImagePlus imp = ImageFiles.open(f);
                assertEquals(32, imp.getBitDepth(), "per-frame rescale differs: calibrated 32-bit planes");
                for (int z = 1; z <= Z; z++) {
                    for (int t = 1; t <= T; t++) {
                        float[] got = ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, t));
                        float[] want = expected(z - 1, t - 1);
                        for (int i = 0; i < want.length; i++) {
                            // stored at a coarser step for some repeats: equal within half that step
                            assertEquals(want[i], got[i], 0.5 * ScannerSeries.SLOPE * 2 + 1e-4, "z " + z + " t " + t);
                        }
                    }
                }
                String note = Arrangement.note(imp);
                assertTrue(note.contains("Temporal Position Index (0020,9128)"), note);
                assertTrue(note.contains("each image's own rescale"), note);
            }
        }
    }

    /**
     * ImageJ's own reader applies one rescale to every frame of an enhanced file; the reader here
     * applies each frame's Pixel Value Transformation.
     */
    @Test
    void perFrameRescaleIsWhatImageJAloneMisses() throws Exception {
        Path f = ScannerSeries.enhanced(ScannerSeries.spec("ij", 2, 3, SEED, true), dir, "ij.dcm");
        Prefs.fixedDicomScaling = true;
        Opener o = new Opener();
        o.setSilentMode(true);
        ImagePlus ij = o.openImage(f.toString());
        ImagePlus ours = ImageFiles.open(f);
        // frame 1 (z 1, t 1) has slope 0.1; ImageJ applies the last frame's slope to it
        float[] want = expected(0, 0);
        float[] imagej = ImagePlanes.calibratedPixels(ij, 1);
        float[] mine = ImagePlanes.calibratedPixels(ours, StackPlanes.index(ours, 1, 1));
        assertEquals(want[32 * 64 + 32], mine[32 * 64 + 32], 1e-4);
        assertTrue(Math.abs(imagej[32 * 64 + 32] - want[32 * 64 + 32]) > 10, "ImageJ alone reads a wrong value");
    }

    @Test
    void aMissingImageIsRefusedNamingItsSliceAndRepeat() throws Exception {
        Path tagged = folder(ScannerSeries.spec("miss", Z, T, SEED, false).drop(0, 4), "miss");
        InputException e = assertThrows(InputException.class, () -> ImageFiles.open(tagged));
        assertTrue(e.getMessage().contains("incomplete") && e.getMessage().contains("slice 1 of 4")
                && e.getMessage().contains("repeat 5 of 6"), e.getMessage());
        for (DicomSeriesWriter.Numbering n : DicomSeriesWriter.Numbering.values()) {
            Path untagged = folder(ScannerSeries.spec("miss" + n, Z, T, SEED, false).drop(0, 4)
                    .timeTags(DicomSeriesWriter.TimeTags.NONE).numbering(n), "miss" + n);
            InputException u = assertThrows(InputException.class, () -> ImageFiles.open(untagged));
            assertTrue(u.getMessage().contains("slice 1 of 4") && u.getMessage().contains("5 images where other "
                    + "slices have 6") && u.getMessage().contains("repeat 5 is missing"), u.getMessage());
        }
        Path enh = ScannerSeries.enhanced(ScannerSeries.spec("missenh", Z, T, SEED, false).drop(2, 0), dir, "m.dcm");
        InputException m = assertThrows(InputException.class, () -> ImageFiles.open(enh));
        assertTrue(m.getMessage().contains("slice 3 of 4") && m.getMessage().contains("repeat 1 of 6"),
                m.getMessage());
    }

    @Test
    void duplicatesAreRefused() throws Exception {
        Path f = folder(ScannerSeries.spec("dup", Z, T, SEED, false), "dup");
        // a copy of a file under another name: the same SOP Instance UID
        Files.copy(f.resolve("IM0001.dcm"), f.resolve("copy of IM0001.dcm"));
        InputException copy = assertThrows(InputException.class, () -> ImageFiles.open(f));
        assertTrue(copy.getMessage().contains("same image"), copy.getMessage());
        // two different images of the same slice and repeat
        DicomSeriesWriter.Spec spec = ScannerSeries.spec("dup2", Z, T, SEED, false);
        spec.image(1, 2, ScannerSeries.stored(1, 2, SEED + 1, 1), ScannerSeries.SLOPE, 0);
        Path g = Files.createDirectories(dir.resolve("dup2"));
        int k = 0;
        for (DicomSeriesWriter.File file : DicomSeriesWriter.singleFrame(spec)) {
            Files.write(g.resolve("f" + (k++) + "_" + file.name()), file.bytes());
        }
        InputException two = assertThrows(InputException.class, () -> ImageFiles.open(g));
        assertTrue(two.getMessage().contains("two images of slice 2 of 4") && two.getMessage().contains("repeat 3"),
                two.getMessage());
    }

    @Test
    void echoesAreNeverMixed() throws Exception {
        Path f = Files.createDirectories(dir.resolve("echoes"));
        for (int echo = 1; echo <= 2; echo++) {
            DicomSeriesWriter.Spec spec = new DicomSeriesWriter.Spec("echoes", ScannerSeries.SIZE, ScannerSeries.SIZE,
                    Z, T).echo(echo, 10.0 * echo);
            for (int z = 0; z < Z; z++) {
                for (int t = 0; t < T; t++) {
                    spec.image(z, t, ScannerSeries.stored(z, t, SEED + echo, 1), ScannerSeries.SLOPE, 0);
                }
            }
            for (DicomSeriesWriter.File file : DicomSeriesWriter.singleFrame(spec)) {
                Files.write(f.resolve(file.name()), file.bytes());
            }
        }
        InputException e = assertThrows(InputException.class, () -> ImageFiles.open(f));
        assertTrue(e.getMessage().contains("2 echoes") && e.getMessage().contains("Echo Numbers (0018,0086) 1 (24 images), "
                + "2 (24 images)") && e.getMessage().contains("--echo"), e.getMessage());
        ImagePlus second = ImageFiles.open(f, 2);
        assertEquals(Z, second.getNSlices());
        assertEquals(T, second.getNFrames());
        short[] want = ScannerSeries.stored(2, 3, SEED + 2, 1);
        assertEquals(ScannerSeries.SLOPE * (want[100] & 0xffff),
                ImagePlanes.calibratedPixels(second, StackPlanes.index(second, 3, 4))[100], 1e-4);
        assertTrue(Arrangement.note(second).contains("echo 2"), Arrangement.note(second));
        assertTrue(assertThrows(InputException.class, () -> ImageFiles.open(f, 3)).getMessage()
                .contains("numbered 1 to 2"));
    }

    @Test
    void orientationsAndSeriesAreNeverMixed() throws Exception {
        Path f = folder(ScannerSeries.spec("axial", 2, 2, SEED, false), "mixed");
        DicomSeriesWriter.Spec cor = ScannerSeries.spec("coronal", 2, 2, SEED + 1, false).series("axial")
                .orientation(1, 0, 0, 0, 0, -1);
        for (DicomSeriesWriter.File file : DicomSeriesWriter.singleFrame(cor)) {
            Files.write(f.resolve("cor_" + file.name()), file.bytes());
        }
        InputException e = assertThrows(InputException.class, () -> ImageFiles.open(f));
        assertTrue(e.getMessage().contains("more than one orientation"), e.getMessage());
        Path two = folder(ScannerSeries.spec("one", 2, 2, SEED, false), "two");
        for (DicomSeriesWriter.File file : DicomSeriesWriter.singleFrame(ScannerSeries.spec("other", 2, 2, SEED, false))) {
            Files.write(two.resolve("other_" + file.name()), file.bytes());
        }
        InputException s = assertThrows(InputException.class, () -> ImageFiles.open(two));
        assertTrue(s.getMessage().contains("2 DICOM series"), s.getMessage());
    }

    /**
     * What batch walks: one reading of each header sorts a folder into its series and its other files;
     * a subfolder and a link to nothing are neither, and a rejected entry is never read.
     */
    @Test
    void scanSortsAFolderIntoSeriesAndOtherFilesReadingEachHeaderOnce() throws Exception {
        Path f = folder(ScannerSeries.spec("one", 2, 3, SEED, false), "scan");
        for (DicomSeriesWriter.File file : DicomSeriesWriter.singleFrame(ScannerSeries.spec("other", 2, 2, SEED, false))) {
            Files.write(f.resolve("other_" + file.name()), file.bytes());
        }
        // a large TIFF (told not DICOM by its first bytes) and a large enhanced file (read whole)
        new ij.io.FileSaver(new ImagePlus("plain", new ij.process.FloatProcessor(200, 200))).saveAsTiff(
                f.resolve("b_plain.tif").toString());
        Path enhanced = ScannerSeries.enhanced(ScannerSeries.spec("enh", 4, 3, SEED, true), f, "enh.dcm");
        assertTrue(Files.size(f.resolve("b_plain.tif")) > 64 << 10 && Files.size(enhanced) > 64 << 10);
        Files.writeString(f.resolve("a_notes.txt"), "not an image");
        Files.createDirectories(f.resolve("c_sub"));
        Files.createSymbolicLink(f.resolve("d_gone.dcm"), f.resolve("no-such-file.dcm"));
        Path excluded = f.resolve("e_results.csv");
        Files.writeString(excluded, "Image,Status\n");
        java.util.List<Path> asked = java.util.Collections.synchronizedList(new java.util.ArrayList<>());
        DicomSeries.Contents c = DicomSeries.scan(f, p -> {
            asked.add(p);
            return !p.equals(excluded);
        });
        assertEquals(3, c.series().size(), "two folders' worth of single-frame files and one enhanced file");
        java.util.Set<Integer> sizes = new java.util.HashSet<>();
        for (DicomSeries.Series s : c.series()) {
            sizes.add(s.files().size());
            for (Path p : s.files()) {
                assertTrue(p.getFileName().toString().endsWith(".dcm"), p.toString());
            }
        }
        assertEquals(java.util.Set.of(6, 4, 1), sizes, "2 x 3 and 2 x 2 files, and the enhanced file");
        assertEquals(java.util.List.of(f.resolve("a_notes.txt"), f.resolve("b_plain.tif")), c.others(),
                "the other regular files, by name; not the subfolder, the dangling link or the excluded file");
        assertEquals(1, asked.stream().filter(excluded::equals).count(), "the filter is asked once per entry");
        // find keeps every entry (the excluded file is not DICOM): the same series
        assertEquals(c.series(), DicomSeries.find(f));
    }

    /** What a header-only read must give: the same header as reading the whole file. */
    private static void assertSameHeader(DicomFile whole, DicomFile header) {
        assertNotNull(header);
        assertTrue(whole.hasPixels() && !header.hasPixels());
        assertEquals(whole.seriesUid(), header.seriesUid());
        assertEquals(whole.sopInstance(), header.sopInstance());
        assertEquals(whole.instance(), header.instance());
        assertEquals(whole.temporal(), header.temporal());
        assertEquals(whole.rows(), header.rows());
        assertEquals(whole.columns(), header.columns());
        assertEquals(whole.frames().size(), header.frames().size());
        for (int i = 0; i < whole.frames().size(); i++) {
            DicomFile.Frame a = whole.frames().get(i);
            DicomFile.Frame b = header.frames().get(i);
            assertArrayEquals(a.position(), b.position(), "frame " + i);
            assertEquals(a.temporalIndex(), b.temporalIndex(), "frame " + i);
            assertEquals(a.slope(), b.slope(), "frame " + i);
        }
    }

    /**
     * A header-only read of a large file (what batch's scan does) reads only its first bytes when the
     * header ends within them, and the whole file when it does not (an enhanced file's per-frame groups);
     * either way the header is the one the whole file gives, and a file cut inside its header is still
     * refused as damaged.
     */
    @Test
    void headerOnlyReadsOfLargeFilesGiveTheWholeFilesHeader() throws Exception {
        // single-frame 256 x 256 files (128 KB each): the header ends in the first 64 KB
        DicomSeriesWriter.Spec big = new DicomSeriesWriter.Spec("large", 256, 256, 1, 2);
        for (int t = 0; t < 2; t++) {
            big.image(0, t, new short[256 * 256], 1, 0);
        }
        Path f = dir.resolve("large.dcm");
        Files.write(f, DicomSeriesWriter.singleFrame(big).get(1).bytes());
        assertTrue(Files.size(f) > 64 << 10);
        assertSameHeader(DicomFile.read(f, true), DicomFile.read(f, false));
        // the same file without the 128-byte preamble and "DICM" (it starts with the meta group, 0002)
        Path bare = dir.resolve("large-bare.dcm");
        byte[] whole = Files.readAllBytes(f);
        Files.write(bare, java.util.Arrays.copyOfRange(whole, 132, whole.length));
        assertSameHeader(DicomFile.read(bare, true), DicomFile.read(bare, false));
        // an enhanced file of 400 frames: its per-frame groups run past the first 64 KB, in a sequence of
        // defined length (cut off inside an element) and of undefined length (items that simply stop)
        Path undefined = ScannerSeries.enhanced(ScannerSeries.spec("items", 20, 20, SEED, true)
                .transferSyntax(DicomWriter.EXPLICIT_LE, true), dir, "items.dcm");
        assertSameHeader(DicomFile.read(undefined, true), DicomFile.read(undefined, false));
        DicomSeriesWriter.Spec many = ScannerSeries.spec("many", 20, 20, SEED, true);
        Path e = ScannerSeries.enhanced(many, dir, "many.dcm");
        byte[] bytes = Files.readAllBytes(e);
        int pixelTag = -1;
        for (int i = 0; i + 3 < bytes.length && pixelTag < 0; i++) {
            if ((bytes[i] & 0xff) == 0xe0 && (bytes[i + 1] & 0xff) == 0x7f && bytes[i + 2] == 0x10 && bytes[i + 3] == 0) {
                pixelTag = i;
            }
        }
        assertTrue(pixelTag > 64 << 10, "the header is longer than the first read: " + pixelTag);
        assertSameHeader(DicomFile.read(e, true), DicomFile.read(e, false));
        assertEquals(400, DicomFile.read(e, false).frames().size());
        // cut inside the header, past the first 64 KB: damaged, whichever read
        Path cut = dir.resolve("cut.dcm");
        Files.write(cut, java.util.Arrays.copyOf(bytes, pixelTag - 1001));
        assertTrue(Files.size(cut) > 64 << 10);
        for (boolean pixels : new boolean[] {true, false}) {
            InputException x = assertThrows(InputException.class, () -> DicomFile.read(cut, pixels));
            assertTrue(x.getMessage().contains("truncated or damaged"), x.getMessage());
        }
    }

    /** A plain TIFF stack without dimensions keeps today's rule: its slices are repeats of one slice. */
    @Test
    void aPlainTiffStackKeepsTheOldRule() throws Exception {
        ij.ImageStack st = new ij.ImageStack(8, 8);
        for (int i = 0; i < 5; i++) {
            st.addSlice(new ij.process.FloatProcessor(8, 8));
        }
        Path p = org.noisewise.testing.TestImages.saveTiff(new ImagePlus("plain", st), dir, "plain.tif");
        ImagePlus imp = ImageFiles.open(p);
        assertEquals(1, StackPlanes.zCount(imp));
        assertEquals(5, StackPlanes.repeatCount(imp));
        assertEquals(null, Arrangement.note(imp));
    }

    // ---- real files from Debian's packages (src/test/resources/opendata/README.md) -----------------------------

    private Path resource(String name, Path to) {
        return org.noisewise.testing.OpenData.copy(name, to);
    }

    /**
     * nibabel's two Siemens single-frame files (implicit VR, one series, Image Positions 3 mm apart
     * along the slice normal): two z slices of one repeat, spaced 3 mm, values as ImageJ reads them.
     */
    @Test
    void realSiemensPairIsTwoSlices() throws Exception {
        Path f = Files.createDirectories(dir.resolve("siemens"));
        resource("siemens_0.dcm", f.resolve("0.dcm"));
        resource("siemens_1.dcm", f.resolve("1.dcm"));
        ImagePlus imp = ImageFiles.open(f);
        assertEquals(2, imp.getNSlices());
        assertEquals(1, imp.getNFrames());
        assertEquals(3.0, imp.getCalibration().pixelDepth, 1e-3);
        // their headers still call them mosaics of 48 slices (the pixels were replaced by a 256 x 256 test pattern)
        assertTrue(Arrangement.note(imp).contains("Image Type (0008,0008) says MOSAIC, but 256 x 256 pixels cannot hold "
                + "48 slices in 7 x 7 tiles, so each image was read as one slice"), Arrangement.note(imp));
        Prefs.fixedDicomScaling = true;
        ImagePlus ij0 = new Opener().openImage(f.resolve("0.dcm").toString());
        ImagePlus ij1 = new Opener().openImage(f.resolve("1.dcm").toString());
        // 0.dcm lies at -75.1 mm along the normal, 1.dcm at -72.1 mm: ascending order
        assertArrayEquals(ImagePlanes.calibratedPixels(ij0, 1), ImagePlanes.calibratedPixels(imp, 1), 0f);
        assertArrayEquals(ImagePlanes.calibratedPixels(ij1, 1), ImagePlanes.calibratedPixels(imp, 2), 0f);
        // two slices of one acquisition are not repeats
        InputException single = assertThrows(InputException.class, () -> org.noisewise.measure.RepeatedMeasure.run(imp,
                "siemens", new org.noisewise.measure.Roles(java.util.List.of(), java.util.List.of()), 1, new int[] {1},
                true, org.noisewise.measure.Progress.NONE));
        assertTrue(single.getMessage().contains("repeated-acquisition method needs"), single.getMessage());
    }

    /**
     * nibabel's Philips Enhanced MR file (3-D MPRAGE, 176 frames of 256 x 256, per-frame functional
     * groups with Plane Position, Temporal Position Index 1 and Pixel Value Transformation slope
     * 2.1079365079365): 176 slices of one repeat, 1 mm apart, with the per-frame slope as calibration.
     */
    @Test
    void realPhilipsEnhancedFile() throws Exception {
        Path f = resource("philips_mprage.dcm.gz", dir.resolve("mprage.dcm"));
        ImagePlus imp = ImageFiles.open(f);
        assertEquals(176, imp.getNSlices());
        assertEquals(1, imp.getNFrames());
        assertEquals(256, imp.getWidth());
        assertEquals(1.0, imp.getCalibration().pixelDepth, 1e-4);
        double[] c = imp.getCalibration().getCoefficients();
        assertNotNull(c);
        assertEquals(2.1079365079365, c[1], 1e-12);
        assertTrue(Arrangement.note(imp).contains("176 slices x 1 repeat"), Arrangement.note(imp));
    }

    /**
     * Siemens mosaics (a file per repeat, the repeat's slices tiled row by row): 5 slices in 3 x 3 tiles
     * (the last four empty), in explicit and implicit VR, become 5 z slices x 6 repeats whose planes are
     * the slices written, spaced by Spacing Between Slices; a single mosaic file is one volume.
     */
    @Test
    void siemensMosaicsAreCutIntoTheirSlices() throws Exception {
        int z5 = 5;
        for (String syntax : new String[] {DicomWriter.EXPLICIT_LE, DicomWriter.IMPLICIT_LE}) {
            String name = "mosaic_" + syntax.length();
            Path f = ScannerSeries.mosaicFolder(ScannerSeries.spec(name, z5, T, SEED, false)
                    .transferSyntax(syntax, false), dir, name);
            try (java.util.stream.Stream<Path> files = Files.list(f)) {
                assertEquals(T, files.count(), "a file per repeat");
            }
            ImagePlus imp = ImageFiles.open(f);
            assertEquals(z5, imp.getNSlices(), syntax);
            assertEquals(T, imp.getNFrames(), syntax);
            assertEquals(ScannerSeries.SIZE, imp.getWidth());
            assertEquals(ScannerSeries.SIZE, imp.getHeight());
            for (int z = 1; z <= z5; z++) {
                for (int t = 1; t <= T; t++) {
                    assertArrayEquals(expected(z - 1, t - 1), ImagePlanes.calibratedPixels(imp,
                            StackPlanes.index(imp, z, t)), 1e-4f, syntax + " z " + z + " t " + t);
                }
            }
            String note = Arrangement.note(imp);
            assertTrue(note.contains("5 slices x 6 repeats from the tiles of each Siemens mosaic (5 slices in 3 x 3 "
                    + "tiles of 64 x 64, Number of Images in Mosaic 0019,100A), in their stored order and Acquisition "
                    + "Number (0020,0012)"), note);
            assertEquals(6.0, imp.getCalibration().pixelDepth, 1e-9, "Spacing Between Slices");
            ImagePlus one = DicomSeries.openFile(f.resolve("MOSAIC0003.dcm"), null, ImageFiles.ECHO_HINT);
            assertEquals(z5, one.getNSlices());
            assertEquals(1, one.getNFrames());
            assertArrayEquals(expected(4, 2), ImagePlanes.calibratedPixels(one, 5), 1e-4f);
        }
    }

    /** A mosaic that does not say how many slices it tiles, or whose size does not divide, is refused. */
    @Test
    void mosaicsThatCannotBeCutAreRefused() throws Exception {
        Path f = ScannerSeries.mosaicFolder(ScannerSeries.spec("nocount", 5, 2, SEED, false), dir, "nocount");
        // the private block's creator changed (as when another vendor's block stands there): no slice count
        try (java.util.stream.Stream<Path> files = Files.list(f)) {
            for (Path p : files.toList()) {
                String text = new String(Files.readAllBytes(p), java.nio.charset.StandardCharsets.ISO_8859_1);
                Files.write(p, text.replace("SIEMENS MR HEADER", "OTHER MR HEADER  ")
                        .getBytes(java.nio.charset.StandardCharsets.ISO_8859_1));
            }
        }
        InputException e = assertThrows(InputException.class, () -> ImageFiles.open(f));
        assertTrue(e.getMessage().contains("is a Siemens mosaic (Image Type MOSAIC, 0008,0008) that does not say how "
                + "many slices it tiles"), e.getMessage());
        // pixels that cannot hold the slices in the square grid: not a mosaic as Siemens writes it
        org.junit.jupiter.api.Assertions.assertNull(Mosaic.of(48, 900, 896, "odd.dcm"));
        assertEquals(new Mosaic(48, 7, 128, 128), Mosaic.of(48, 896, 896, "dwi.dcm"));
        assertEquals(new Mosaic(49, 7, 128, 128), Mosaic.of(49, 896, 896, "dwi.dcm"));
        assertEquals(new Mosaic(50, 8, 112, 112), Mosaic.of(50, 896, 896, "dwi.dcm"));
    }

    /**
     * nibabel's Siemens diffusion mosaic (implicit VR, 896 x 896, Image Type ...\MOSAIC, Number of Images
     * in Mosaic 48 in the block "SIEMENS MR HEADER", Spacing Between Slices 3 mm; its pixel values are
     * blank): 48 slices of 128 x 128 in one repeat, 3 mm apart. ImageJ's own header text shows that
     * private element as the character "0" (the unsigned short 48 read as text), which is why the
     * count is read by Noisewise's parser.
     */
    @Test
    void realSiemensMosaicIsFortyEightSlices() throws Exception {
        Path f = resource("siemens_dwi_mosaic.dcm.gz", dir.resolve("dwi_mosaic.dcm"));
        ImagePlus imp = ImageFiles.open(f);
        assertEquals(48, imp.getNSlices());
        assertEquals(1, imp.getNFrames());
        assertEquals(128, imp.getWidth());
        assertEquals(128, imp.getHeight());
        assertEquals(3.0, imp.getCalibration().pixelDepth, 1e-12, "Spacing Between Slices");
        assertEquals(1.796875, imp.getCalibration().pixelWidth, 1e-12);
        assertTrue(Arrangement.note(imp).contains("48 slices x 1 repeat from the tiles of each Siemens mosaic (48 slices "
                + "in 7 x 7 tiles of 128 x 128"), Arrangement.note(imp));
    }

    /** pydicom's MR_small in explicit, implicit and big-endian transfer syntaxes reads as ImageJ reads it. */
    @Test
    void transferSyntaxesAgreeWithImageJ() throws Exception {
        for (String name : new String[] {"MR_small.dcm", "MR_small_implicit.dcm", "MR_small_bigendian.dcm",
            "MR_small_expb.dcm"}) {
            Path f = resource(name, dir.resolve(name));
            Prefs.fixedDicomScaling = true;
            ImagePlus ij = new Opener().openImage(f.toString());
            ImagePlus ours = ImageFiles.open(f);
            assertArrayEquals(ImagePlanes.calibratedPixels(ij, 1), ImagePlanes.calibratedPixels(ours, 1), 0f, name);
            assertEquals(ij.getCalibration().pixelWidth, ours.getCalibration().pixelWidth, 1e-12, name);
        }
    }
}
