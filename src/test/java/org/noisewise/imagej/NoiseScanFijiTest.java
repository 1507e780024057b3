package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonObject;
import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.noisewise.io.ImageFiles;
import org.noisewise.sample.NoiseScanSample;
import org.noisewise.testing.Display;
import org.noisewise.testing.FijiSession;
import org.noisewise.testing.TestImages;

/**
 * Issue 21's noise-only scans in Fiji, run as a macro runs them on the bundled accelerated sample and its
 * noise-only scan (generated; truth in {@link NoiseScanSample}): the same figures as the command line,
 * the sigma map shown, both images and the ROI Manager untouched.
 */
class NoiseScanFijiTest extends FijiSession {



    private ImagePlus[] openPair() throws Exception {
        ImagePlus scan = ImageFiles.open(Path.of("sample-images", NoiseScanSample.NOISE));
        scan.show();
        ImagePlus imp = ImageFiles.open(Path.of("sample-images", NoiseScanSample.IMAGE));
        imp.show();
        var c = NoiseScanSample.CENTRE;
        Roi sig = new Roi(c.x(), c.y(), c.w(), c.h());
        sig.setName("signal");
        rm.addRoi(sig);
        Roi bg = new Roi(2, 2, 20, 20);
        bg.setName("background");
        rm.addRoi(bg);
        return new ImagePlus[] {imp, scan};
    }

    @Test
    void snrWithTheNoiseOnlyScanAndItsSigmaMap() throws Exception {
        Display.require();
        ImagePlus[] pair = openPair();
        ImagePlus imp = pair[0];
        String before = TestImages.checksum(imp);
        String scanBefore = TestImages.checksum(pair[1]);
        IJ.run(imp, "SNR (Background Regions)...", "channels=auto estimator=[Maximum likelihood] "
                + "slices=[Current slice] roles=[Region names] background=[ROI Manager regions] second=None "
                + "noise-only=" + NoiseScanSample.NOISE + " sigma window=15");
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(imp));
        assertNotNull(rt);
        assertEquals("noise_scan", rt.getStringValue("Method", 0));
        JsonObject o = cli("background", "sample-images/" + NoiseScanSample.IMAGE, "--noise-scan",
                "sample-images/" + NoiseScanSample.NOISE, "--signal", NoiseScanSample.CENTRE.toString(), "--background",
                "2,2,20,20", "--json");
        assertEquals(o.get("snr").getAsDouble(), rt.getValue("SNR (corrected)", 0), 1e-9);
        assertEquals(o.get("sigma").getAsDouble(), rt.getValue("Sigma (noise-only scan) [a.u.]", 0), 1e-9);
        double truth = NoiseScanSample.trueSnr(NoiseScanSample.CENTRE);
        assertTrue(rt.getValue("SNR 95% low", 0) <= truth && truth <= rt.getValue("SNR 95% high", 0));
        ImagePlus map = WindowManager.getImage(NoiseScanSample.IMAGE + " sigma map");
        assertNotNull(map, "the sigma map is shown");
        assertEquals(32, map.getBitDepth());
        assertTrue(IJ.getLog().contains("noise-only scan '" + NoiseScanSample.NOISE + "'"), IJ.getLog());
        assertFalse(IJ.getLog().contains("--"), "Fiji's words only: " + IJ.getLog());
        assertEquals(before, TestImages.checksum(imp));
        assertEquals(scanBefore, TestImages.checksum(pair[1]));
        assertEquals(2, rm.getCount());
    }

    @Test
    void theCheckSaysNoiseVariesAndARefusalUsesFijisWords() throws Exception {
        Display.require();
        ImagePlus[] pair = openPair();
        ImagePlus imp = pair[0];
        IJ.run(imp, "Background Noise Check...", "channels=auto background=[ROI Manager regions] noise-only="
                + NoiseScanSample.NOISE);
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundCheckCommand.tableTitle(imp));
        assertNotNull(rt);
        assertEquals("invalid", rt.getStringValue("Verdict", 0));
        assertTrue(rt.getValue("Noise variation (signal/background)", 0) > 1.5);
        // the image itself chosen as its noise-only scan: one message, nothing changed
        IJ.log("\\Clear");
        IJ.redirectErrorMessages();
        try {
            IJ.run(imp, "SNR (Background Regions)...", "channels=auto estimator=[Maximum likelihood] "
                    + "slices=[Current slice] roles=[Region names] background=[ROI Manager regions] second=None "
                    + "noise-only=" + NoiseScanSample.IMAGE);
        } catch (RuntimeException expectedMacroCancel) {
            // ImageJ cancels the macro after reporting the error
        }
        String log = String.valueOf(IJ.getLog());
        assertFalse(log.contains("Exception"), log);
        assertTrue(log.contains("holds structure"), log);
        assertEquals(2, rm.getCount());
    }
}
