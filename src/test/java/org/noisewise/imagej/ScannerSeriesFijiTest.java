package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonParser;
import ij.IJ;
import ij.ImagePlus;
import ij.Prefs;
import ij.WindowManager;
import ij.gui.Roi;
import ij.io.Opener;
import ij.measure.ResultsTable;
import ij.plugin.FolderOpener;
import ij.plugin.frame.RoiManager;
import java.awt.Frame;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.cli.NoisewiseCli;
import org.noisewise.io.DicomSeriesWriter;
import org.noisewise.testing.ImageJHarness;
import org.noisewise.testing.ScannerSeries;
import org.noisewise.testing.TestImages;

/**
 * Issue 19 in Fiji: a DICOM folder opened with File > Import > Image Sequence (each file's header in
 * its slice label) and an enhanced multi-frame file opened by ImageJ are measured per z slice, with
 * the command line's figures for the same files, the arrangement written to the Log, and the user's
 * image left exactly as it was (still a plain stack, same pixels).
 */
class ScannerSeriesFijiTest {

    private static final int Z = 3;
    private static final int T = 12;
    private static final long SEED = 77;

    @TempDir
    Path dir;

    private RoiManager rm;

    @BeforeAll
    static void startImageJ() {
        ImageJHarness.start();
    }

    @BeforeEach
    void fresh() {
        rm = RoiManager.getRoiManager();
        rm.reset();
        IJ.log("\\Clear");
        IJ.redirectErrorMessages();
        Prefs.fixedDicomScaling = true;
    }

    @AfterEach
    void close() {
        for (Frame f : WindowManager.getNonImageWindows()) {
            if (f != rm && f != IJ.getInstance()) {
                f.dispose();
            }
        }
        WindowManager.closeAllWindows();
    }

    private static JsonArray cli(String... args) {
        StringWriter out = new StringWriter();
        int status = NoisewiseCli.execute(args, new PrintWriter(out), new PrintWriter(new StringWriter()));
        assertEquals(0, status);
        return JsonParser.parseString(out.toString()).getAsJsonArray();
    }

    /** Shows the image, adds a signal region and runs SNR Map, which is expected to refuse; returns the Log. */
    private String refusedSnrMap(ImagePlus imp) {
        imp.show();
        Roi signal = new Roi(24, 24, 16, 16);
        signal.setName("signal");
        rm.addRoi(signal);
        IJ.redirectErrorMessages();
        try {
            IJ.run(imp, "SNR Map (Repeated Acquisitions)...", "channels=1 slices=[All slices]");
        } catch (RuntimeException expectedMacroCancel) {
            // ImageJ cancels the macro after reporting the error
        }
        return IJ.getLog();
    }

    private void measureAsTheCommandLine(ImagePlus imp, Path source) {
        String before = TestImages.checksum(imp);
        int planes = imp.getStackSize();
        imp.show();
        Roi signal = new Roi(24, 24, 16, 16);
        signal.setName("signal");
        rm.addRoi(signal);
        IJ.run(imp, "SNR Map (Repeated Acquisitions)...", "channels=1 slices=[All slices]");
        ResultsTable rt = ResultsTable.getResultsTable(RepeatedSnrCommand.tableTitle(imp));
        assertNotNull(rt, "the table of the run");
        assertEquals(Z, rt.size(), "one row per z slice");
        JsonArray cli = cli("repeat", source.toString(), "--signal", ScannerSeries.SIGNAL, "--json");
        for (int z = 0; z < Z; z++) {
            assertEquals(T, (int) rt.getValue("Repeats", z));
            double want = cli.get(z).getAsJsonObject().get("snr").getAsDouble();
            assertEquals(want, rt.getValue("SNR (corrected)", z), 1e-6 * want, "z " + (z + 1) + " as the command line");
        }
        assertTrue(IJ.getLog().contains(Z + " slices x " + T + " repeats"), IJ.getLog());
        assertEquals(before, TestImages.checksum(imp), "pixels unchanged");
        assertEquals(planes, imp.getStackSize());
        assertEquals(1, imp.getNFrames(), "the user's stack is still a plain stack");
        assertEquals(1, rm.getCount(), "the ROI Manager keeps the user's region");
    }

    @Test
    void anImageSequenceImportIsArrangedFromItsSliceLabels() {
        Path folder = ScannerSeries.folder(ScannerSeries.spec("fiji", Z, T, SEED, false)
                .numbering(DicomSeriesWriter.Numbering.SLICE_MAJOR), dir, "fiji");
        ImagePlus imp = FolderOpener.open(folder.toString());
        assertNotNull(imp);
        assertEquals(Z * T, imp.getStackSize());
        measureAsTheCommandLine(imp, folder);
    }

    /**
     * The single-plane commands measure the planes of the stack as imported (the user's plane numbers); each
     * row names the z slice and repeat the headers give, with the command line's figures for that z and
     * repeat of the same folder.
     */
    @Test
    void planeByPlaneRowsNameTheirSliceAndRepeatAsTheCommandLine() {
        // slice-major Instance Numbers: the import's order (by file name) is not ImageJ's z-fastest order
        Path folder = ScannerSeries.folder(ScannerSeries.spec("fijiplanes", Z, T, SEED, false)
                .numbering(DicomSeriesWriter.Numbering.SLICE_MAJOR), dir, "fijiplanes");
        ImagePlus imp = FolderOpener.open(folder.toString());
        String before = TestImages.checksum(imp);
        imp.show();
        Roi signal = new Roi(24, 24, 16, 16);
        signal.setName("signal");
        rm.addRoi(signal);
        Roi air = new Roi(2, 2, 10, 10);
        air.setName("background");
        rm.addRoi(air);
        IJ.run(imp, "SNR (Background Regions)...", "channels=1 slices=[All slices]");
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(imp));
        assertNotNull(rt, String.valueOf(IJ.getLog()));
        assertEquals(Z * T, rt.size());
        JsonArray cli = cli("background", folder.toString(), "--signal", ScannerSeries.SIGNAL, "--background",
                "2,2,10,10", "--json");
        java.util.Map<String, Double> byPosition = new java.util.HashMap<>();
        for (int i = 0; i < cli.size(); i++) {
            com.google.gson.JsonObject row = cli.get(i).getAsJsonObject();
            byPosition.put(row.get("z").getAsInt() + "," + row.get("repeat").getAsInt(), row.get("snr").getAsDouble());
        }
        java.util.Set<String> seen = new java.util.HashSet<>();
        boolean reordered = false;
        for (int i = 0; i < rt.size(); i++) {
            int plane = (int) rt.getValue("Slice", i);
            int z = (int) rt.getValue("Z slice", i);
            int t = (int) rt.getValue("Repeat", i);
            assertTrue(seen.add(z + "," + t), "each z and repeat once");
            reordered |= plane != (t - 1) * Z + z;
            Double want = byPosition.get(z + "," + t);
            assertNotNull(want, z + "," + t);
            assertEquals(want, rt.getValue("SNR (corrected)", i), 1e-6 * want, "plane " + plane);
        }
        assertTrue(reordered, "the import's planes are in file order, not ImageJ's z-fastest order");
        assertEquals(before, TestImages.checksum(imp), "pixels unchanged");
        assertEquals(1, imp.getNFrames(), "the user's stack is still a plain stack");
        assertEquals(2, rm.getCount(), "the ROI Manager keeps the user's regions");
    }

    @Test
    void anImageSequenceWithPerImageRescaleUsesEachImagesRescale() {
        Path folder = ScannerSeries.folder(ScannerSeries.spec("fijiscale", Z, T, SEED, true), dir, "fijiscale");
        measureAsTheCommandLine(FolderOpener.open(folder.toString()), folder);
        assertTrue(IJ.getLog().contains("each image's own rescale"), IJ.getLog());
    }

    @Test
    void anEnhancedFileOpenedByImageJIsArrangedFromItsFunctionalGroups() {
        Path f = ScannerSeries.enhanced(ScannerSeries.spec("fijienh", Z, T, SEED, true), dir, "fijienh.dcm");
        Opener o = new Opener();
        o.setSilentMode(true);
        ImagePlus imp = o.openImage(f.toString());
        assertNotNull(imp);
        measureAsTheCommandLine(imp, f);
        assertTrue(IJ.getLog().contains("per-frame functional groups"), IJ.getLog());
    }

    @Test
    void aMultiEchoImportIsRefusedInFijisWords() throws Exception {
        Path folder = dir.resolve("echoes");
        java.nio.file.Files.createDirectories(folder);
        for (int echo = 1; echo <= 2; echo++) {
            for (DicomSeriesWriter.File file : DicomSeriesWriter.singleFrame(ScannerSeries.spec("fijiecho", Z, T,
                    SEED + echo, false).echo(echo, 9.0 * echo))) {
                java.nio.file.Files.write(folder.resolve(file.name()), file.bytes());
            }
        }
        ImagePlus imp = FolderOpener.open(folder.toString());
        String log = refusedSnrMap(imp);
        assertTrue(log.contains("2 echoes") && log.contains("Arrange Series"), log);
        assertTrue(!log.contains("--"), "no command-line flags in Fiji: " + log);
        // Arrange Series with the echo chosen: a new hyperstack of that echo; the import is unchanged
        String before = TestImages.checksum(imp);
        int count = WindowManager.getImageCount();
        IJ.run(imp, "Arrange Series...", "echo=2");
        assertEquals(count + 1, WindowManager.getImageCount());
        ImagePlus arranged = WindowManager.getImage(imp.getTitle() + " (arranged)");
        assertNotNull(arranged, "the new image");
        assertEquals(Z, arranged.getNSlices());
        assertEquals(T, arranged.getNFrames());
        short[] want = ScannerSeries.stored(1, 4, SEED + 2, 1);
        assertEquals(ScannerSeries.SLOPE * (want[40] & 0xffff), org.noisewise.io.ImagePlanes.calibratedPixels(arranged,
                arranged.getStackIndex(1, 2, 5))[40], 1e-4);
        assertEquals(before, TestImages.checksum(imp));
        assertEquals(2 * Z * T, imp.getStackSize());
        // and the arranged echo measures as the command line measures that echo
        IJ.run(arranged, "SNR Map (Repeated Acquisitions)...", "channels=1 slices=[All slices]");
        ResultsTable rt = ResultsTable.getResultsTable(RepeatedSnrCommand.tableTitle(arranged));
        assertNotNull(rt);
        JsonArray cli = cli("repeat", folder.toString(), "--echo", "2", "--signal", ScannerSeries.SIGNAL, "--json");
        for (int z = 0; z < Z; z++) {
            double w = cli.get(z).getAsJsonObject().get("snr").getAsDouble();
            assertEquals(w, rt.getValue("SNR (corrected)", z), 1e-6 * w);
        }
    }

    /**
     * A folder of Siemens mosaics imported with File > Import > Image Sequence: a region drawn on a mosaic
     * cannot be placed on its slices, so the measuring commands refuse it and point to Arrange Series, which
     * cuts the mosaics into a new hyperstack of slices and repeats (the import unchanged); that hyperstack
     * measures as the command line measures the folder.
     */
    @Test
    void siemensMosaicsAreCutByArrangeSeriesAndMeasuredAsTheCommandLine() throws Exception {
        Path folder = ScannerSeries.mosaicFolder(ScannerSeries.spec("fijimosaic", Z, T, SEED, false), dir, "mosaics");
        ImagePlus imp = FolderOpener.open(folder.toString());
        assertNotNull(imp);
        assertEquals(T, imp.getStackSize(), "one mosaic per repeat");
        assertEquals(2 * ScannerSeries.SIZE, imp.getWidth(), "3 slices tiled 2 x 2");
        String log = refusedSnrMap(imp);
        assertTrue(log.contains("is a stack of Siemens mosaics (each image tiles 3 slices of 64 x 64") && log.contains(
                "Plugins > Noisewise > Arrange Series"), log);
        assertTrue(!log.contains("--"), "no command-line flags in Fiji: " + log);
        assertEquals(null, ResultsTable.getResultsTable(RepeatedSnrCommand.tableTitle(imp)), "nothing measured");
        String before = TestImages.checksum(imp);
        IJ.run(imp, "Arrange Series...", "echo=0");
        ImagePlus arranged = WindowManager.getImage(imp.getTitle() + " (arranged)");
        assertNotNull(arranged, "the new image");
        assertEquals(Z, arranged.getNSlices());
        assertEquals(T, arranged.getNFrames());
        assertEquals(ScannerSeries.SIZE, arranged.getWidth());
        for (int z = 1; z <= Z; z++) {
            short[] want = ScannerSeries.stored(z - 1, 4, SEED, 1);
            float[] got = org.noisewise.io.ImagePlanes.calibratedPixels(arranged, arranged.getStackIndex(1, z, 5));
            for (int i = 0; i < want.length; i += 97) {
                assertEquals(ScannerSeries.SLOPE * (want[i] & 0xffff), got[i], 1e-4, "z " + z + " pixel " + i);
            }
        }
        assertTrue(IJ.getLog().contains("from the tiles of each Siemens mosaic"), IJ.getLog());
        assertEquals(before, TestImages.checksum(imp), "the import is unchanged");
        assertEquals(T, imp.getStackSize());
        assertEquals(1, rm.getCount(), "the ROI Manager keeps the user's region");
        IJ.run(arranged, "SNR Map (Repeated Acquisitions)...", "channels=1 slices=[All slices]");
        ResultsTable rt = ResultsTable.getResultsTable(RepeatedSnrCommand.tableTitle(arranged));
        assertNotNull(rt, IJ.getLog());
        assertEquals(Z, rt.size());
        JsonArray cli = cli("repeat", folder.toString(), "--signal", ScannerSeries.SIGNAL, "--json");
        for (int z = 0; z < Z; z++) {
            double w = cli.get(z).getAsJsonObject().get("snr").getAsDouble();
            assertEquals(w, rt.getValue("SNR (corrected)", z), 1e-6 * w, "z " + (z + 1) + " as the command line");
        }
        // one mosaic file opened alone (its header in the image's Info) is one volume: a single-plane command
        // measures it as the image it is and says so; Arrange Series cuts it too
        ImagePlus single = new Opener().openImage(folder.resolve("MOSAIC0005.dcm").toString());
        assertNotNull(single);
        single.show();
        Roi air = new Roi(2, 2, 10, 10);
        air.setName("background");
        rm.addRoi(air);
        IJ.log("\\Clear");
        IJ.run(single, "SNR (Background Regions)...", "channels=1 slices=[All slices]");
        assertTrue(IJ.getLog().contains("is a Siemens mosaic, measured as one image: its regions and automatic air lie "
                + "on the whole mosaic of 3 slices (2 x 2 tiles of 64 x 64); to measure slice by slice, cut it into its "
                + "slices with Plugins > Noisewise > Arrange Series..."), IJ.getLog());
        IJ.run(single, "Arrange Series...", "echo=0");
        ImagePlus volume = WindowManager.getImage(single.getTitle() + " (arranged)");
        assertNotNull(volume, IJ.getLog());
        assertEquals(Z, volume.getNSlices());
        assertEquals(1, volume.getNFrames());
        short[] want = ScannerSeries.stored(2, 4, SEED, 1);
        assertEquals(ScannerSeries.SLOPE * (want[700] & 0xffff), org.noisewise.io.ImagePlanes.calibratedPixels(volume,
                3)[700], 1e-4);
    }
}
