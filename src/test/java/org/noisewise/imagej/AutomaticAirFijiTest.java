package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonObject;
import ij.IJ;
import ij.ImagePlus;
import ij.gui.Overlay;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import java.awt.Color;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.noisewise.io.ImageFiles;
import org.noisewise.sample.HeadSample;
import org.noisewise.testing.FijiSession;
import org.noisewise.testing.TestImages;

/**
 * Issue 21 in Fiji: "Background: Automatic (all air)" in SNR (Background Regions) and the Background
 * Noise Check, run as a macro runs them on the bundled head-like sample (generated: sigma 4, true SNR
 * 25), with the same figures as the command line, the air drawn as an overlay, and the image and the
 * ROI Manager untouched.
 */
class AutomaticAirFijiTest extends FijiSession {



    @Test
    void backgroundMethodWithAutomaticAir() throws Exception {
        ImagePlus imp = ImageFiles.open(Path.of("sample-images", HeadSample.FILE));
        imp.show();
        var s = HeadSample.SIGNAL;
        Roi sig = new Roi(s.x(), s.y(), s.w(), s.h());
        sig.setName("signal");
        rm.addRoi(sig);
        String before = TestImages.checksum(imp);
        IJ.run(imp, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] slices=[Current slice] "
                + "background=[Automatic (all air)]");
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(imp));
        assertNotNull(rt);
        JsonObject o = cli("background", "sample-images/" + HeadSample.FILE, "--signal", s.toString(), "--background",
                "auto", "--json");
        assertEquals(o.get("snr").getAsDouble(), rt.getValue("SNR (corrected)", 0), 1e-9);
        assertEquals(o.get("sigma").getAsDouble(), rt.getValue("Sigma [a.u.]", 0), 1e-9);
        assertEquals(o.get("background_share").getAsDouble(), rt.getValue("Air share [%]", 0), 1e-9);
        double low = rt.getValue("SNR 95% low", 0);
        double high = rt.getValue("SNR 95% high", 0);
        assertTrue(low <= HeadSample.trueSnr() && HeadSample.trueSnr() <= high, low + " - " + high);
        assertTrue(IJ.getLog().contains("automatic air"), IJ.getLog());
        assertEquals(before, TestImages.checksum(imp));
        assertEquals(1, rm.getCount());
        Overlay ov = imp.getOverlay();
        assertNotNull(ov);
        boolean air = false;
        for (Roi r : ov.toArray()) {
            air |= "air (automatic)".equals(r.getName()) && Color.cyan.equals(r.getStrokeColor());
        }
        assertTrue(air, "the air found drawn in the background colour");
    }

    @Test
    void checkWithAnEmptyRoiManager() throws Exception {
        ImagePlus imp = ImageFiles.open(Path.of("sample-images", "bramble_disk_8ch.tif"));
        imp.show();
        IJ.run(imp, "Background Noise Check...", "channels=8 background=[Automatic (all air)]");
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundCheckCommand.tableTitle(imp));
        assertNotNull(rt);
        assertEquals("valid", rt.getStringValue("Verdict", 0));
        assertTrue(rt.getValue("Air share [%]", 0) > 40);
        assertEquals(0, rm.getCount());
    }

    /** Phantom QA with Background: Automatic (all air): the command line's figures, the air drawn, no bg regions added. */
    @Test
    void phantomQaWithAllTheAir() throws Exception {
        ImagePlus imp = ImageFiles.open(Path.of("sample-images", HeadSample.FILE));
        imp.show();
        String before = TestImages.checksum(imp);
        IJ.run(imp, "Phantom QA...", "second=None regions=Automatic background=[Automatic (all air)] fraction=0.75 "
                + "channels=1");
        ResultsTable rt = ResultsTable.getResultsTable("Phantom QA - " + imp.getTitle());
        assertNotNull(rt);
        JsonObject o = cli("qa", "sample-images/" + HeadSample.FILE, "--background", "auto", "--json");
        assertEquals("valid", rt.getStringValue("Verdict", 0));
        assertEquals(o.get("sigma").getAsDouble(), rt.getValue("Sigma (corrected) [a.u.]", 0), 1e-9);
        assertEquals(o.get("background_share").getAsDouble(), rt.getValue("Air share [%]", 0), 1e-9);
        boolean air = false;
        for (Roi r : imp.getOverlay().toArray()) {
            air |= "air (automatic)".equals(r.getName());
        }
        assertTrue(air, "the air drawn on the image");
        for (Roi r : rm.getRoisAsArray()) {
            assertFalse(r.getName().startsWith("bg"), "no placed background regions added: " + r.getName());
        }
        assertEquals(before, TestImages.checksum(imp));
    }
}
