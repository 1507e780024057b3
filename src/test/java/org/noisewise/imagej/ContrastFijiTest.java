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
import ij.gui.TextRoi;
import ij.measure.ResultsTable;
import java.awt.Color;
import org.junit.jupiter.api.Test;
import org.noisewise.io.ImageFiles;
import org.noisewise.sample.SampleCatalog;
import org.noisewise.sample.TissueSample;
import org.noisewise.testing.FijiSession;
import org.noisewise.testing.TestImages;

/**
 * Issue 22 in Fiji: the contrast role in the ROI Manager (by name, or chosen in the dialog for an
 * unnamed region) gives the CNR columns in the background, difference and repeated commands, with the
 * same figures as the command line (one measurement per method), the contrast region drawn in its
 * own colour with a key, and the user's image and regions untouched. Bundled two-tissue sample (true
 * CNR 8, generated).
 */
class ContrastFijiTest extends FijiSession {


    private void add(SampleCatalog.Rect r, String name) {
        Roi roi = new Roi(r.x(), r.y(), r.w(), r.h());
        roi.setName(name);
        rm.addRoi(roi);
    }

    private ImagePlus open() throws Exception {
        ImagePlus imp = ImageFiles.open(java.nio.file.Path.of("sample-images", TissueSample.FILE));
        imp.show();
        add(TissueSample.SIGNAL, "signal");
        return imp;
    }

    private static void assertSame(ResultsTable rt, JsonObject o) {
        assertEquals(o.get("cnr").getAsDouble(), rt.getValue("CNR (corrected)", 0), 1e-9);
        assertEquals(o.getAsJsonArray("cnr_ci95").get(0).getAsDouble(), rt.getValue("CNR 95% low", 0), 1e-9);
        assertEquals(o.getAsJsonArray("cnr_ci95").get(1).getAsDouble(), rt.getValue("CNR 95% high", 0), 1e-9);
        assertEquals(o.get("cnr_magnitude").getAsDouble(), rt.getValue("CNR plain ((S-C)/sigma)", 0), 1e-9);
        assertEquals(o.get("contrast_amplitude").getAsDouble(), rt.getValue("Contrast amplitude (corrected) [a.u.]", 0),
                1e-9);
        double low = rt.getValue("CNR 95% low", 0);
        double high = rt.getValue("CNR 95% high", 0);
        assertTrue(low <= TissueSample.trueCnr() && TissueSample.trueCnr() <= high, low + " - " + high);
    }

    @Test
    void repeatedWithContrastByName() throws Exception {
        ImagePlus imp = open();
        add(TissueSample.CONTRAST, "contrast insert");
        String before = TestImages.checksum(imp);
        IJ.run(imp, "SNR Map (Repeated Acquisitions)...", "channels=8 slices=[Current slice]");
        ResultsTable rt = ResultsTable.getResultsTable(RepeatedSnrCommand.tableTitle(imp));
        assertNotNull(rt);
        assertSame(rt, cli("repeat", "sample-images/" + TissueSample.FILE, "--signal", TissueSample.SIGNAL.toString(),
                "--contrast", TissueSample.CONTRAST.toString(), "--channels", "8", "--json"));
        assertEquals("contrast insert", rt.getStringValue("Contrast region", 0));
        assertEquals(before, TestImages.checksum(imp), "the image's pixels are untouched");
        assertEquals(2, rm.getCount(), "the ROI Manager keeps its regions");
        Overlay ov = imp.getOverlay();
        assertNotNull(ov);
        boolean red = false;
        boolean key = false;
        for (Roi r : ov.toArray()) {
            red |= !(r instanceof TextRoi) && Color.red.equals(r.getStrokeColor());
            key |= r instanceof TextRoi t && t.getText().trim().equals("contrast");
        }
        assertTrue(red && key, "the contrast region drawn in red, with its key");
    }

    @Test
    void backgroundWithContrastChosenInTheDialog() throws Exception {
        ImagePlus imp = open();
        add(TissueSample.CONTRAST, "insert");
        for (SampleCatalog.Rect r : SampleCatalog.BACKGROUND) {
            add(r, "bg");
        }
        IJ.run(imp, "SNR (Background Regions)...", "channels=8 estimator=[Maximum likelihood] slices=[Current slice] "
                + "role_insert=contrast");
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(imp));
        assertNotNull(rt);
        java.util.List<String> args = new java.util.ArrayList<>(java.util.List.of("background", "sample-images/"
                + TissueSample.FILE, "--signal", TissueSample.SIGNAL.toString(), "--contrast",
                TissueSample.CONTRAST.toString(), "--channels", "8", "--slice", "1", "--json"));
        for (SampleCatalog.Rect r : SampleCatalog.BACKGROUND) {
            args.add("--background");
            args.add(r.toString());
        }
        assertSame(rt, cli(args.toArray(new String[0])));
    }

    @Test
    void differenceFramesWithContrast() throws Exception {
        ImagePlus imp = open();
        add(TissueSample.CONTRAST, "contrast");
        IJ.run(imp, "SNR (Two Acquisitions)...", "source=[Two frames of one stack] first=" + imp.getTitle()
                + " frame_a=1 frame_b=2 channels=8 slices=[Current slice]");
        ResultsTable rt = ResultsTable.getResultsTable(DifferenceSnrCommand.tableTitle(imp));
        assertNotNull(rt);
        assertSame(rt, cli("difference", "sample-images/" + TissueSample.FILE, "--frames", "1,2", "--signal",
                TissueSample.SIGNAL.toString(), "--contrast", TissueSample.CONTRAST.toString(), "--channels", "8",
                "--json"));
    }

    /** Two contrast regions: one message in Fiji's words (no command-line flags), nothing measured. */
    @Test
    void twoContrastRegionsRefused() throws Exception {
        ImagePlus imp = open();
        add(TissueSample.CONTRAST, "contrast 1");
        add(new SampleCatalog.Rect(60, 90, 6, 6), "contrast 2");
        IJ.redirectErrorMessages();
        try {
            IJ.run(imp, "SNR Map (Repeated Acquisitions)...", "channels=8 slices=[Current slice]");
        } catch (RuntimeException expectedMacroCancel) {
            // ImageJ cancels the macro after reporting an error
        }
        String log = IJ.getLog();
        assertTrue(log.contains("More than one ROI Manager region has the contrast role"), log);
        assertFalse(log.contains("--"), log);
        assertEquals(3, rm.getCount());
    }
}
