package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.OvalRoi;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.frame.RoiManager;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.testing.ImageJHarness;
import org.noisewise.testing.TestImages;

class PhantomQaCommandTest {

    @TempDir
    Path dir;

    @BeforeAll
    static void start() {
        ImageJHarness.start();
    }

    @AfterEach
    void close() {
        WindowManager.closeAllWindows();
    }

    @Test
    void automaticRegionsThenAdjustedRegions() throws Exception {
        ImagePlus a = IJ.openImage("sample-images/aster_disk_acq1.tif");
        ImagePlus b = IJ.openImage("sample-images/aster_disk_acq2.tif");
        String before = TestImages.checksum(a);
        a.show();
        b.show();
        Path report = dir.resolve("qa.html");
        Path log = dir.resolve("qa.csv");
        IJ.run(a, "Phantom QA...", "second=aster_disk_acq2.tif regions=Automatic fraction=0.75 channels=1 "
                + "phase=Unknown limits field=1.5 scanner=Aster coil=head protocol=weekly baseline=5 log=[" + log
                + "] report=[" + report + "] slice=1");
        ResultsTable rt = ResultsTable.getResultsTable(PhantomQaCommand.tableTitle(a));
        assertNotNull(rt);
        assertEquals("difference", rt.getStringValue("SNR method", 0));
        assertEquals(24.0, rt.getValue("SNR (corrected)", 0), 1.5);
        assertEquals("yes", rt.getStringValue("PIU within limit", 0));
        assertTrue(Files.size(report) > 10000);
        assertEquals(2, Files.readAllLines(log).size());
        RoiManager rm = RoiManager.getInstance();
        List<String> names = Arrays.stream(rm.getRoisAsArray()).map(Roi::getName).toList();
        assertTrue(names.containsAll(List.of("signal", "ghost top", "ghost bottom", "ghost left", "ghost right",
                "bg top", "uniformity high", "uniformity low")), names.toString());
        int automaticPixels = (int) rt.getValue("Signal pixels", 0);

        // the user shrinks the signal region and runs again with the ROI Manager's regions
        int index = names.indexOf("signal");
        OvalRoi smaller = new OvalRoi(44, 44, 40, 40);
        smaller.setName("signal");
        rm.setRoi(smaller, index);
        closeTable(PhantomQaCommand.tableTitle(a));
        IJ.run(a, "Phantom QA...", "second=aster_disk_acq2.tif regions=[ROI Manager] fraction=0.75 channels=1 "
                + "phase=Unknown baseline=5 slice=1");
        ResultsTable again = ResultsTable.getResultsTable(PhantomQaCommand.tableTitle(a));
        int adjusted = (int) again.getValue("Signal pixels", 0);
        assertEquals(smaller.getContainedPoints().length, adjusted);
        assertTrue(adjusted < automaticPixels);
        assertEquals(before, TestImages.checksum(a), "the image was modified");
    }

    private static void closeTable(String title) {
        for (java.awt.Frame f : WindowManager.getNonImageWindows()) {
            if (f.getTitle().equals(title)) {
                f.dispose();
                WindowManager.removeWindow(f);
            }
        }
    }

    @Test
    void noPhantomIsAClearError() {
        ImagePlus noise = new ImagePlus("flat", new ij.process.FloatProcessor(64, 64));
        noise.show();
        IJ.redirectErrorMessages();
        IJ.log("\\Clear");
        try {
            IJ.run(noise, "Phantom QA...", "second=None regions=Automatic fraction=0.75 channels=1 phase=Unknown "
                    + "baseline=5 slice=1");
        } catch (RuntimeException expectedMacroCancel) {
            // ImageJ cancels the macro after reporting the error
        }
        assertTrue(IJ.getLog() != null && IJ.getLog().contains("phantom"), String.valueOf(IJ.getLog()));
        assertEquals(null, ResultsTable.getResultsTable(PhantomQaCommand.tableTitle(noise)));
    }
}
