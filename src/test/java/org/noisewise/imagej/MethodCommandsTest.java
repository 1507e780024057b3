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
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.frame.RoiManager;
import java.awt.Frame;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RicianCorrection;
import org.noisewise.io.ImagePlanes;
import org.noisewise.testing.ImageJHarness;
import org.noisewise.testing.TestImages;

/** The two-acquisition, repeated-acquisition, background-check and correction commands, driven as a macro drives them. */
class MethodCommandsTest {

    private RoiManager rm;

    @TempDir
    Path dir;

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

    private void add(Roi roi, String name) {
        roi.setName(name);
        rm.addRoi(roi);
    }

    private static ImagePlus stack(String title, int frames, double a, double sigma, long seed) {
        ImageStack st = new ImageStack(TestImages.SIZE, TestImages.SIZE);
        for (int f = 0; f < frames; f++) {
            st.addSlice(TestImages.phantom("f", a, sigma, 1, seed + f).getProcessor());
        }
        return new ImagePlus(title, st);
    }

    @Test
    void twoImagesMatchCoreAndStayUntouched() throws InputException {
        ImagePlus a = TestImages.phantom("acq1", 100, 4, 1, 1);
        ImagePlus b = TestImages.phantom("acq2", 100, 4, 1, 2);
        a.show();
        b.show();
        String ca = TestImages.checksum(a);
        String cb = TestImages.checksum(b);
        add(new Roi(38, 38, 20, 20), "signal");
        IJ.run(a, "SNR (Two Acquisitions)...", "source=[Two images] first=acq1 second=acq2 frame_a=1 frame_b=2 "
                + "channels=1 slices=[Current slice]");
        ResultsTable rt = ResultsTable.getResultsTable(DifferenceSnrCommand.tableTitle(a));
        assertNotNull(rt);
        DifferenceSnrResult core = DifferenceSnr.analyze(ImagePlanes.calibratedPixels(a, 1),
                ImagePlanes.calibratedPixels(b, 1), 96, Region.rectangle("s", 38, 38, 20, 20, 96, 96), 1);
        assertEquals(core.sigma(), rt.getValue("Sigma (corrected) [a.u.]", 0), 1e-9);
        assertEquals(core.snr(), rt.getValue("SNR (corrected)", 0), 1e-9);
        assertEquals(core.magnitudeSnr(), rt.getValue("SNR plain (NEMA, sqrt2 S/SD diff)", 0), 1e-9);
        assertEquals("acq2", rt.getStringValue("Image 2", 0));
        assertEquals(ca, TestImages.checksum(a));
        assertEquals(cb, TestImages.checksum(b));
    }

    @Test
    void twoFramesOfAStack() {
        ImagePlus st = stack("pair stack", 3, 100, 4, 10);
        st.show();
        add(new Roi(38, 38, 20, 20), "signal");
        IJ.run(st, "SNR (Two Acquisitions)...", "source=[Two frames of one stack] first=[pair stack] second=[pair stack] "
                + "frame_a=1 frame_b=3 channels=1 slices=[Current slice]");
        ResultsTable rt = ResultsTable.getResultsTable(DifferenceSnrCommand.tableTitle(st));
        assertEquals(4.0, rt.getValue("Sigma (corrected) [a.u.]", 0), 0.5);
        assertEquals("pair stack frame 3", rt.getStringValue("Image 2", 0));
    }

    @Test
    void differenceBadInputs() {
        ImagePlus a = TestImages.phantom("a", 100, 4, 1, 1);
        ImagePlus small = new ImagePlus("small", new ij.process.FloatProcessor(50, 50));
        List<Roi> sig = List.of(new Roi(10, 10, 20, 20));
        InputException size = assertThrows(InputException.class,
                () -> DifferenceSnrCommand.processImages(a, small, sig, 1, false));
        assertTrue(size.getMessage().contains("differ in size"), size.getMessage());
        InputException same = assertThrows(InputException.class,
                () -> DifferenceSnrCommand.processImages(a, a, sig, 1, false));
        assertTrue(same.getMessage().contains("same image"), same.getMessage());
        InputException single = assertThrows(InputException.class,
                () -> DifferenceSnrCommand.processFrames(a, 1, 2, sig, 1, false));
        assertTrue(single.getMessage().contains("single frame"), single.getMessage());
    }

    @Test
    void repeatedMapsAndSummary() {
        ImagePlus st = stack("repeats", 16, 80, 4, 100);
        String before = TestImages.checksum(st);
        st.show();
        add(new Roi(38, 38, 20, 20), "signal");
        int imagesBefore = WindowManager.getImageCount();
        IJ.run(st, "SNR Map (Repeated Acquisitions)...", "channels=1 slices=[Current slice] maps rician");
        assertEquals(imagesBefore + 1, WindowManager.getImageCount());
        ImagePlus maps = WindowManager.getImage("repeats repeat maps");
        assertNotNull(maps);
        assertEquals(32, maps.getBitDepth());
        assertEquals(3, maps.getStackSize());
        assertEquals("SNR map (mean/SD)", maps.getStack().getSliceLabel(3));
        ResultsTable rt = ResultsTable.getResultsTable(RepeatedSnrCommand.tableTitle(st));
        assertEquals(16, (int) rt.getValue("Repeats", 0));
        assertEquals(4.0, rt.getValue("Sigma (corrected) [a.u.]", 0), 0.2);
        assertEquals(80.0, rt.getValue("Signal amplitude (corrected) [a.u.]", 0), 2.0);
        assertEquals(before, TestImages.checksum(st));
    }

    @Test
    void repeatedNeedsTwoFrames() {
        ImagePlus one = TestImages.phantom("one", 80, 4, 1, 3);
        InputException e = assertThrows(InputException.class,
                () -> RepeatedSnrCommand.process(one, List.of(), 1, false));
        assertTrue(e.getMessage().contains("single frame"), e.getMessage());
    }

    @Test
    void backgroundCheckTablePlotAndPng() throws Exception {
        ImagePlus imp = TestImages.phantom("check", 100, 4, 1, 5);
        String before = TestImages.checksum(imp);
        imp.show();
        add(new Roi(1, 1, 14, 14), "bg1");
        add(new Roi(80, 80, 14, 14), "bg2");
        Path png = dir.resolve("hist.png");
        IJ.run(imp, "Background Noise Check...", "channels=1 plot png=[" + png + "]");
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundCheckCommand.tableTitle(imp));
        assertEquals("valid", rt.getStringValue("Verdict", 0));
        assertEquals(392, (int) rt.getValue("Background pixels", 0));
        assertTrue(Files.size(png) > 1000);
        ImagePlus decoded = IJ.openImage(png.toString());
        assertNotNull(decoded, "PNG does not decode");
        assertTrue(decoded.getWidth() > 200);
        assertEquals(before, TestImages.checksum(imp));
    }

    @Test
    void backgroundCheckWithoutRegionsFails() {
        ImagePlus imp = TestImages.phantom("nothing", 100, 4, 1, 5);
        InputException e = assertThrows(InputException.class,
                () -> BackgroundCheckCommand.process(imp, 1, List.of(), 1));
        assertTrue(e.getMessage().contains("no background region"));
    }

    @Test
    void ricianCorrectionMakesANewImage() {
        ImagePlus imp = TestImages.phantom("low", 8, 4, 1, 6);
        String before = TestImages.checksum(imp);
        imp.show();
        int count = WindowManager.getImageCount();
        IJ.run(imp, "Rician Bias Correction...", "sigma=4 channels=1 method=[Koay-Basser (mean inversion)]");
        assertEquals(count + 1, WindowManager.getImageCount());
        ImagePlus out = WindowManager.getImage("low (bias-corrected)");
        assertNotNull(out);
        assertEquals(before, TestImages.checksum(imp));
        // air pixels (mean 1.25 sigma) map mostly to zero
        assertTrue(out.getProcessor().getf(2, 2) <= imp.getProcessor().getf(2, 2));
    }

    @Test
    void ricianCorrectionMeasuresSigmaFromBackgroundOrRefuses() throws InputException {
        ImagePlus imp = TestImages.phantom("low2", 8, 4, 1, 7);
        ImagePlus out = RicianCorrectionCommand.process(imp, 0, List.of(new Roi(1, 1, 14, 14), new Roi(80, 80, 14, 14)),
                1, RicianCorrection.Method.POWER);
        assertEquals(32, out.getBitDepth());
        InputException e = assertThrows(InputException.class,
                () -> RicianCorrectionCommand.process(imp, 0, List.of(), 1, RicianCorrection.Method.POWER));
        assertTrue(e.getMessage().contains("no background region"), e.getMessage());
        assertThrows(InputException.class,
                () -> RicianCorrectionCommand.process(imp, -2, List.of(), 1, RicianCorrection.Method.POWER));
        IJ.redirectErrorMessages();
        assertThrows(RuntimeException.class, () -> IJ.run(imp, "Rician Bias Correction...", "sigma=-1 channels=1"));
        assertTrue(IJ.getLog().contains("sigma"), IJ.getLog());
        assertNull(WindowManager.getImage("low2 (bias-corrected)"));
    }
}
