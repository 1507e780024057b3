package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.WindowManager;
import ij.gui.OvalRoi;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.frame.RoiManager;
import java.awt.Frame;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.BackgroundSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.RoiRegions;
import org.noisewise.measure.BackgroundMeasure;
import org.noisewise.testing.ImageJHarness;
import org.noisewise.testing.TestImages;

class BackgroundSnrCommandTest {

    private static final String CMD = "SNR (Background Regions)...";
    private RoiManager rm;

    @BeforeAll
    static void startImageJ() {
        ImageJHarness.start();
    }

    @BeforeEach
    void freshManager() {
        rm = RoiManager.getRoiManager();
        rm.reset();
        IJ.log("\\Clear");
        // error dialogs are modal: send the next error to the Log window instead
        IJ.redirectErrorMessages();
    }

    @AfterEach
    void closeTables() {
        for (Frame f : WindowManager.getNonImageWindows()) {
            if (f.getTitle().startsWith("SNR (Background Regions)")) {
                f.dispose();
            }
        }
        WindowManager.closeAllWindows();
    }

    private void add(Roi roi, String name) {
        roi.setName(name);
        rm.addRoi(roi);
    }

    private static ResultsTable table(ImagePlus imp) {
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(imp));
        assertNotNull(rt, "no table titled " + BackgroundSnrCommand.tableTitle(imp));
        return rt;
    }

    @Test
    void macroRunMatchesCoreAndLeavesImageUntouched() throws InputException {
        ImagePlus imp = TestImages.phantom("weekly.tif", 100, 4, 1, 77);
        String before = TestImages.checksum(imp);
        add(new OvalRoi(38, 38, 20, 20), "signal");
        add(new Roi(1, 1, 14, 14), "bg top left");
        add(new Roi(80, 80, 14, 14), "air bottom right");
        add(new Roi(40, 2, 4, 4), "marker");

        IJ.run(imp, CMD, "channels=1 estimator=[Maximum likelihood] slices=[Current slice] roles=[Region names]");

        ResultsTable rt = table(imp);
        assertEquals(1, rt.size());
        int w = TestImages.SIZE;
        Region sig = RoiRegions.toRegion(new OvalRoi(38, 38, 20, 20), "s", w, w);
        BackgroundSnrResult core = BackgroundSnr.analyze(ImagePlanes.calibratedPixels(imp, 1), w, w, sig,
                List.of(Region.rectangle("a", 1, 1, 14, 14, w, w), Region.rectangle("b", 80, 80, 14, 14, w, w)),
                BackgroundSnr.Options.defaults());
        assertEquals(core.snr(), rt.getValue("SNR (corrected)", 0), 1e-9);
        assertEquals(core.figures().magnitudeSnr(), rt.getValue("SNR plain (S/sigma)", 0), 1e-9);
        assertEquals(core.sigma().sigma(), rt.getValue("Sigma [a.u.]", 0), 1e-9);
        assertEquals(core.sigma().ci95().high(), rt.getValue("Sigma 95% high [a.u.]", 0), 1e-9);
        assertEquals(core.signal().stats().mean(), rt.getValue("Signal mean (magnitude) [a.u.]", 0), 1e-9);
        assertEquals(392, (int) rt.getValue("Background pixels", 0));
        assertEquals("ml", rt.getStringValue("Estimator", 0));
        assertEquals(before, TestImages.checksum(imp), "the input image was modified");
        assertNull(imp.getRoi(), "a selection was left on the image");
    }

    @Test
    void roleOverrideEstimatorChannelsAndAllSlices() {
        ImageStack st = new ImageStack(TestImages.SIZE, TestImages.SIZE);
        st.addSlice(TestImages.phantom("a", 120, 5, 8, 1).getProcessor());
        st.addSlice(TestImages.phantom("b", 120, 5, 8, 2).getProcessor());
        st.addSlice(TestImages.phantom("c", 120, 5, 8, 3).getProcessor());
        ImagePlus imp = new ImagePlus("eight channels", st);
        String before = TestImages.checksum(imp);
        add(new Roi(38, 38, 20, 20), "centre");     // no role from its name: set by role_centre
        add(new Roi(1, 1, 14, 14), "bg1");
        add(new Roi(80, 1, 14, 14), "corner");      // set to background by role_corner
        IJ.run(imp, CMD, "channels=auto estimator=Median-based slices=[All slices] roles=[Region names] "
                + "phase=Unknown role_centre=signal role_corner=background");
        ResultsTable rt = table(imp);
        assertEquals(3, rt.size());
        for (int row = 0; row < 3; row++) {
            assertEquals(row + 1, (int) rt.getValue("Slice", row));
            assertEquals(8, (int) rt.getValue("Channels used", row), 1);
            assertEquals(8.0, rt.getValue("Channels (estimated)", row), 1.5);
            assertEquals("median", rt.getStringValue("Estimator", row));
            assertEquals(392, (int) rt.getValue("Background pixels", row));
            assertEquals(5.0, rt.getValue("Sigma [a.u.]", row), 0.5);
        }
        assertEquals(before, TestImages.checksum(imp));
    }

    @Test
    void selectionIsSignalMode() {
        ImagePlus imp = TestImages.phantom("selection.tif", 100, 4, 1, 9);
        imp.setRoi(new Roi(38, 38, 20, 20));
        add(new Roi(1, 1, 14, 14), "whatever");
        IJ.run(imp, CMD, "channels=1 estimator=SD-based slices=[Current slice] roles=[Selection is signal]");
        ResultsTable rt = table(imp);
        assertEquals(400, (int) rt.getValue("Signal pixels", 0));
        assertEquals(196, (int) rt.getValue("Background pixels", 0));
        assertEquals("sd", rt.getStringValue("Estimator", 0));
    }

    @Test
    void missingBackgroundGivesNoTable() {
        ImagePlus imp = TestImages.phantom("nobg.tif", 100, 4, 1, 9);
        add(new Roi(38, 38, 20, 20), "signal");
        // in a macro, ImageJ reports the error and then cancels the macro, as for its own commands
        RuntimeException cancel = assertThrows(RuntimeException.class, () -> IJ.run(imp, CMD,
                "channels=1 estimator=[Maximum likelihood] slices=[Current slice] roles=[Region names]"));
        assertTrue(cancel.getMessage().contains("Macro canceled"), cancel.getMessage());
        assertNull(ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(imp)));
        String log = IJ.getLog();
        assertNotNull(log, "the error message went nowhere");
        assertTrue(log.contains("no background region"), log);
    }

    @Test
    void processRejectsRoiOutsideImage() {
        ImagePlus imp = TestImages.phantom("edge.tif", 100, 4, 1, 9);
        InputException e = assertThrows(InputException.class, () -> BackgroundSnrCommand.process(imp,
                new Roi(38, 38, 20, 20), List.of(new Roi(90, 90, 20, 20)),
                new BackgroundMeasure.Options(1, SigmaEstimator.ML, null), false, null));
        assertTrue(e.getMessage().contains("outside"), e.getMessage());
    }

    @Test
    void everyPluginsConfigEntryIsAPlugIn() throws ClassNotFoundException {
        for (var e : ImageJHarness.pluginsConfig().entrySet()) {
            Class<?> c = Class.forName(e.getValue());
            assertTrue(ij.plugin.PlugIn.class.isAssignableFrom(c), e.getKey() + " -> " + c);
        }
        assertTrue(ImageJHarness.pluginsConfig().containsKey(CMD));
    }
}
