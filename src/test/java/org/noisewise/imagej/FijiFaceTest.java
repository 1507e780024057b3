package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.Overlay;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.frame.Recorder;
import ij.plugin.frame.RoiManager;
import java.awt.Frame;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.testing.ImageJHarness;
import org.noisewise.testing.TestImages;

/**
 * The Fiji face as a user meets it: the ROI Manager keeps the user's regions, files are replaced only when
 * asked, a recorded macro line replays on regions in another order, regions are drawn as an overlay and
 * the pixels never change; and the protocol, g-factor and stability commands run as macros run them.
 */
class FijiFaceTest {

    private RoiManager rm;

    @TempDir
    Path dir;

    @BeforeAll
    static void start() {
        ImageJHarness.start();
    }

    @BeforeEach
    void fresh() {
        rm = RoiManager.getRoiManager();
        rm.reset();
        IJ.log("\\Clear");
        IJ.redirectErrorMessages();
    }

    @AfterEach
    void close() {
        Recorder.record = false;
        Recorder.recordInMacros = false;
        for (Frame f : WindowManager.getNonImageWindows()) {
            if (f != rm && f != IJ.getInstance()) {
                f.dispose();
                WindowManager.removeWindow(f);
            }
        }
        WindowManager.closeAllWindows();
    }

    private void add(Roi roi, String name) {
        roi.setName(name);
        rm.addRoi(roi);
    }

    @Test
    void phantomQaKeepsTheUsersRegionsAndReplacesAReportOnlyWhenAsked() throws Exception {
        ImagePlus a = IJ.openImage("sample-images/aster_disk_1ch.tif");
        String before = TestImages.checksum(a);
        a.show();
        add(new Roi(3, 3, 10, 10), "my marker");
        Path report = dir.resolve("qa.html");
        Files.writeString(report, "an earlier report");
        String options = "second=None regions=Automatic fraction=0.75 channels=1 phase=Unknown baseline=5 slice=1 "
                + "report=[" + report + "]";
        try {
            IJ.run(a, "Phantom QA...", options);
        } catch (RuntimeException expectedMacroCancel) {
            // ImageJ cancels the macro after reporting the error
        }
        assertEquals("an earlier report", Files.readString(report), "the report was replaced without the choice");
        assertTrue(String.valueOf(IJ.getLog()).contains("Replace existing files")
                || String.valueOf(IJ.getLog()).contains("exists"), String.valueOf(IJ.getLog()));
        assertTrue(names().contains("my marker"), "the user's region was removed: " + names());

        IJ.log("\\Clear");
        IJ.run(a, "Phantom QA...", options + " replace");
        assertTrue(Files.readString(report).contains("<html"), "the report was not written with the choice");
        List<String> after = names();
        assertTrue(after.contains("my marker"), "the user's region was removed: " + after);
        assertTrue(after.contains("signal"), after.toString());
        Roi mine = rm.getRoi(after.indexOf("my marker"));
        assertEquals(new java.awt.Rectangle(3, 3, 10, 10), mine.getBounds());
        assertEquals(before, TestImages.checksum(a), "the image was modified");
    }

    private List<String> names() {
        List<String> n = new ArrayList<>();
        for (Roi r : rm.getRoisAsArray()) {
            n.add(r.getName());
        }
        return n;
    }

    @Test
    void recordedLineReplaysOnRegionsInAnotherOrder() {
        ImagePlus first = TestImages.phantom("first.tif", 100, 4, 1, 5);
        first.show();
        add(new Roi(38, 38, 20, 20), "signal");
        add(new Roi(1, 1, 14, 14), "bg corner");
        add(new Roi(80, 80, 14, 14), "air corner");
        add(new Roi(60, 2, 10, 10), "fiducial");
        Recorder rec = new Recorder(false);
        Recorder.recordInMacros = true;
        IJ.run(first, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] "
                + "slices=[Current slice] role_fiducial=Background");
        String text = rec.getText();
        Recorder.recordInMacros = false;
        Matcher m = Pattern.compile("run\\(\"SNR \\(Background Regions\\)\\.\\.\\.\", \"([^\"]*)\"\\)").matcher(text);
        assertTrue(m.find(), "nothing recorded: " + text);
        String recorded = m.group(1);
        assertFalse(recorded.matches(".*region_\\d.*"), "the line depends on ROI order: " + recorded);
        assertTrue(recorded.contains("role_fiducial=Background"), "the role is keyed by name: " + recorded);
        ResultsTable t1 = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(first));
        assertEquals(2 * 196 + 100, (int) t1.getValue("Background pixels", 0));

        // the next image: the same names, added in another order
        rm.reset();
        ImagePlus second = TestImages.phantom("second.tif", 100, 4, 1, 5);
        second.show();
        add(new Roi(60, 2, 10, 10), "fiducial");
        add(new Roi(80, 80, 14, 14), "air corner");
        add(new Roi(38, 38, 20, 20), "signal");
        add(new Roi(1, 1, 14, 14), "bg corner");
        IJ.run(second, "SNR (Background Regions)...", recorded);
        ResultsTable t2 = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(second));
        assertNotNull(t2, "the recorded line did not replay: " + IJ.getLog());
        assertEquals(t1.getValue("SNR (corrected)", 0), t2.getValue("SNR (corrected)", 0), 1e-9);
        assertEquals(t1.getValue("Background pixels", 0), t2.getValue("Background pixels", 0));
    }

    @Test
    void regionsAreAnOverlayAndThePixelsStay() {
        ImagePlus imp = TestImages.phantom("overlay.tif", 100, 4, 1, 9);
        String before = TestImages.checksum(imp);
        imp.show();
        Overlay own = new Overlay(new Roi(90, 90, 2, 2));
        imp.setOverlay(own);
        add(new Roi(38, 38, 20, 20), "signal");
        add(new Roi(1, 1, 14, 14), "background");
        IJ.run(imp, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] slices=[Current slice]");
        Overlay ov = imp.getOverlay();
        assertNotNull(ov);
        int ours = 0;
        for (Roi r : ov.toArray()) {
            if (r.getProperty(Face.MARK) != null) {
                ours++;
            }
        }
        assertTrue(ours >= 2, "the regions used are not drawn: " + ov.size());
        assertTrue(ov.size() > ours, "the user's own overlay element was removed");
        assertEquals(before, TestImages.checksum(imp), "the regions were burnt into the pixels");
        assertEquals(imp, WindowManager.getCurrentImage(), "the source image is not the active window again");
        assertEquals(2, rm.getCount(), "the ROI Manager changed");
    }

    @Test
    void compareProtocolsAndGFactorMap() {
        ImagePlus a = TestImages.squareSeries("two averages", 8, 100, x -> 8, 1);
        ImagePlus b = TestImages.squareSeries("eight averages", 8, 100, x -> 4, 2);
        String beforeA = TestImages.checksum(a);
        a.show();
        b.show();
        add(new Roi(16, 16, 32, 32), "signal");
        IJ.run(a, "Compare Protocols...", "image_a=[two averages] image_b=[eight averages] "
                + "protocol_a=[voxel=1x1x5,phase=256,averages=2,bandwidth=130] "
                + "protocol_b=[voxel=1x1x5,phase=256,averages=8,bandwidth=130] field_exponent=1 channels=1 "
                + "slices=[Current slice]");
        ResultsTable rt = ResultsTable.getResultsTable(CompareProtocolsCommand.tableTitle(a));
        assertNotNull(rt, String.valueOf(IJ.getLog()));
        assertEquals(2.0, rt.getValue("Ratio predicted", 0), 1e-12);
        assertEquals(2.0, rt.getValue("Ratio measured (B/A)", 0), 0.1);
        assertEquals("yes", rt.getStringValue("Consistent", 0));
        assertEquals(beforeA, TestImages.checksum(a));

        ImagePlus full = TestImages.squareSeries("full", 10, 200, x -> 4, 3);
        ImagePlus acc = TestImages.squareSeries("accelerated", 10, 200, x -> 4 * 1.3 * Math.sqrt(2), 4);
        full.show();
        acc.show();
        int images = WindowManager.getImageCount();
        IJ.run(full, "g-Factor Map...", "full=full accelerated=accelerated acceleration=2 window=0 channels=1 "
                + "slices=[Current slice] map");
        ResultsTable g = ResultsTable.getResultsTable(GFactorMapCommand.tableTitle(full));
        assertNotNull(g, String.valueOf(IJ.getLog()));
        assertEquals(1.3, g.getValue("g (region, RMS over its pixels)", 0), 0.04);
        assertEquals(images + 1, WindowManager.getImageCount(), "the g map was not shown");
        ImagePlus map = WindowManager.getImage("accelerated g-factor");
        assertNotNull(map);
        assertEquals(32, map.getBitDepth());
    }

    @Test
    void stabilityFromTheMenu() {
        ImagePlus s = IJ.openImage("sample-images/aster_epi_stability.tif");
        String before = TestImages.checksum(s);
        s.show();
        IJ.run(s, "Stability (Time Series)...", "slices=[Current slice] skip=2 square=21 maps baseline=5");
        ResultsTable rt = ResultsTable.getResultsTable(StabilityCommand.tableTitle(s));
        assertNotNull(rt, String.valueOf(IJ.getLog()));
        // truth.json: SFNR 97.3 for the bundled series
        assertTrue(rt.getValue("SFNR (corrected)", 0) > 90 && rt.getValue("SFNR (corrected)", 0) < 105);
        assertNotNull(s.getOverlay(), "the square is not drawn");
        assertEquals(before, TestImages.checksum(s));
        assertNull(s.getRoi());
        // the plots are made and shown only when asked for
        assertEquals(0, plotWindows(), "plots shown without 'plots'");
        IJ.run(s, "Stability (Time Series)...", "slices=[Current slice] skip=2 square=21 plots baseline=5");
        assertEquals(3, plotWindows(), "series, spectrum and Weisskoff plots");
        assertEquals(before, TestImages.checksum(s));
    }

    private static int plotWindows() {
        int n = 0;
        for (int id : WindowManager.getIDList() == null ? new int[0] : WindowManager.getIDList()) {
            String t = WindowManager.getImage(id).getTitle();
            n += t.startsWith("Stability series - ") || t.startsWith("Stability spectrum - ")
                    || t.startsWith("Weisskoff curve - ") ? 1 : 0;
        }
        return n;
    }

    /** Each dialog's Help is the command's own README section, macro keys included. */
    @Test
    void helpIsTheCommandsOwnSection() {
        String[][] pages = {{"SNR (Background Regions)", "estimator"}, {"SNR (Two Acquisitions)", "frame_a"},
                {"SNR Map (Repeated Acquisitions)", "maps"}, {"Background Noise Check", "replace"},
                {"Rician Bias Correction", "sigma"}, {"Phantom QA", "replace"}, {"Stability (Time Series)", "skip"},
                {"Compare Protocols", "protocol_a"}, {"g-Factor Map", "acceleration"}, {"Arrange Series", "echo"}};
        for (String[] p : pages) {
            String html = Face.help(p[0]);
            assertFalse(html.contains("See the section"), "no README section for " + p[0]);
            assertTrue(html.contains(p[1]), p[0] + " help lacks '" + p[1] + "'");
            assertTrue(html.length() > 800, p[0] + " help is cut short");
        }
    }

    /**
     * The image type and the regions are checked before any dialog opens: run without options (as from the
     * menu), a dialog would block this test; instead the message lands in the Log at once, in Fiji's words.
     * (The background check needs no region: an empty ROI Manager means automatic air.)
     */
    @Test
    void wrongInputIsRefusedBeforeTheDialog() {
        ImagePlus rgb = new ImagePlus("screenshot", new ij.process.ColorProcessor(64, 64));
        rgb.show();
        for (String cmd : new String[] {"SNR (Background Regions)...", "SNR (Two Acquisitions)...",
                "SNR Map (Repeated Acquisitions)...", "Background Noise Check...", "Rician Bias Correction...",
                "Phantom QA...", "Stability (Time Series)...", "Compare Protocols...", "g-Factor Map...",
                "Arrange Series..."}) {
            IJ.log("\\Clear");
            IJ.redirectErrorMessages();
            try {
                IJ.run(rgb, cmd, "");
            } catch (RuntimeException expectedMacroCancel) {
                // ImageJ cancels the macro after reporting the error
            }
            String log = String.valueOf(IJ.getLog());
            assertTrue(log.contains("colour image"), cmd + ": " + log);
            assertFalse(log.contains("--"), cmd + " speaks of command-line flags: " + log);
        }
        rgb.close();
        ImagePlus plain = TestImages.phantom("no regions", 100, 4, 1, 3);
        plain.show();
        IJ.log("\\Clear");
        IJ.redirectErrorMessages();
        try {
            IJ.run(plain, "SNR (Background Regions)...", "");
        } catch (RuntimeException expectedMacroCancel) {
            // as above
        }
        String log = String.valueOf(IJ.getLog());
        assertTrue(log.contains("ROI Manager"), "SNR (Background Regions): " + log);
        // the check needs no region at all: with an empty ROI Manager it measures the automatic air
        IJ.run(plain, "Background Noise Check...", "channels=1");
        assertNotNull(ij.measure.ResultsTable.getResultsTable(BackgroundCheckCommand.tableTitle(plain)),
                "the check ran on the automatic air");
    }

    /** With {@code append}, a macro loop over images collects its rows in one table. */
    @Test
    void appendCollectsRowsAcrossImages() {
        add(new Roi(38, 38, 20, 20), "signal");
        add(new Roi(1, 1, 14, 14), "background");
        for (int k = 0; k < 3; k++) {
            ImagePlus imp = TestImages.phantom("week " + k, 100, 4, 1, 20 + k);
            imp.show();
            IJ.run(imp, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] "
                    + "slices=[Current slice] append");
        }
        ResultsTable rt = ResultsTable.getResultsTable("Noisewise SNR (Background Regions)");
        assertNotNull(rt);
        assertEquals(3, rt.size());
        assertEquals("week 2", rt.getStringValue("Image", 2));
    }

    /** Rerunning Phantom QA on the regions it placed (from the ROI Manager) gives the same SNR: nothing is rounded. */
    @Test
    void phantomQaRegionsRoundTripThroughTheRoiManager() {
        ImagePlus a = IJ.openImage("sample-images/aster_disk_1ch.tif");
        a.show();
        String base = "second=None fraction=0.75 channels=1 phase=Unknown baseline=5 slice=1";
        IJ.run(a, "Phantom QA...", base + " regions=Automatic append");
        IJ.run(a, "Phantom QA...", base + " regions=[ROI Manager] append");
        ResultsTable rt = ResultsTable.getResultsTable("Noisewise Phantom QA");
        assertNotNull(rt, String.valueOf(IJ.getLog()));
        assertEquals(2, rt.size());
        assertEquals(rt.getValue("SNR (corrected)", 0), rt.getValue("SNR (corrected)", 1), 1e-9);
        assertEquals(rt.getValue("Signal pixels", 0), rt.getValue("Signal pixels", 1));
    }

    /** Fiji offers what the command line offers: trend plots per metric next to the QA log (CLI --trends). */
    @Test
    void phantomQaWritesTrendPlotsFromFiji() throws Exception {
        ImagePlus a = IJ.openImage("sample-images/aster_disk_1ch.tif");
        a.show();
        Path log = dir.resolve("log.csv");
        Path trends = Files.createDirectory(dir.resolve("trends"));
        IJ.run(a, "Phantom QA...", "second=None regions=Automatic fraction=0.75 channels=1 phase=Unknown baseline=5 "
                + "slice=1 log=[" + log + "] trends=[" + trends + "]");
        assertTrue(Files.exists(trends.resolve("trend_snr.png")), String.valueOf(IJ.getLog()));
        assertTrue(Files.size(trends.resolve("trend_snr.png")) > 1000);
    }
}
