package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.Overlay;
import ij.gui.Roi;
import ij.gui.TextRoi;
import ij.measure.ResultsTable;
import ij.process.FloatProcessor;
import ij.process.ShortProcessor;
import java.awt.Color;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.Set;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.io.QaImages;
import org.noisewise.sample.Phantoms;
import org.noisewise.testing.FijiSession;
import picocli.CommandLine;

/** Issue 20 in Fiji: the findings run through the menu commands as a macro runs them, asserting on what the user sees. */
class UserPathFindingsFijiTest extends FijiSession {

    @TempDir
    Path dir;


    private void add(Roi r, String name) {
        r.setName(name);
        rm.addRoi(r);
    }

    private static void run(ImagePlus imp, String cmd, String options) {
        IJ.redirectErrorMessages();
        try {
            IJ.run(imp, cmd, options);
        } catch (RuntimeException expectedMacroCancel) {
            // ImageJ cancels the macro after reporting an error
        }
    }

    /** Every long option of every command-line command, e.g. --force, --echo. */
    private static Set<String> commandLineFlags() {
        Set<String> flags = new HashSet<>();
        for (Class<?> c : org.noisewise.cli.NoisewiseCliAccess.commands()) {
            for (CommandLine.Model.OptionSpec o : new CommandLine(c).getCommandSpec().options()) {
                for (String n : o.names()) {
                    if (n.startsWith("--")) {
                        flags.add(n);
                    }
                }
            }
        }
        return flags;
    }

    private static void noFlags(String text) {
        for (String f : commandLineFlags()) {
            assertFalse(text.contains(f + " ") || text.contains(f + ",") || text.contains(f + ")")
                    || text.endsWith(f), "a command-line flag " + f + " in Fiji's words: " + text);
        }
    }

    /** 20.1 in Fiji: clean integer noise through SNR (Background Regions) on every slice is valid. */
    @Test
    void integerStoredNoiseIsValidThroughTheMenu() {
        ImageStack st = new ImageStack(128, 128);
        for (int s = 0; s < 20; s++) {
            float[] v = Phantoms.disk(128, 128, 64, 64, 40, 200, 2, 1, 4000 + s);
            short[] p = new short[v.length];
            for (int i = 0; i < v.length; i++) {
                p[i] = (short) Math.round(v[i]);
            }
            st.addSlice(new ShortProcessor(128, 128, p, null));
        }
        ImagePlus imp = new ImagePlus("uint16 noise", st);
        imp.show();
        add(new Roi(49, 49, 30, 30), "signal");
        add(new Roi(2, 2, 24, 24), "bg1");
        add(new Roi(102, 2, 24, 24), "bg2");
        add(new Roi(2, 102, 24, 24), "bg3");
        add(new Roi(102, 102, 24, 24), "bg4");
        IJ.run(imp, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] slices=[All slices]");
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(imp));
        assertNotNull(rt);
        int valid = 0;
        for (int r = 0; r < rt.size(); r++) {
            valid += "valid".equals(rt.getStringValue("Verdict", r)) ? 1 : 0;
        }
        assertEquals(20, rt.size());
        assertTrue(valid >= 18, valid + " of 20 valid");
    }

    /** 20.2 and 20.3 in Fiji: signed data measured with the Gaussian model or refused, in Fiji's words. */
    @Test
    void signedDataInFiji() {
        SplittableRandom r = new SplittableRandom(8);
        ImageStack st = new ImageStack(64, 64);
        for (int f = 0; f < 10; f++) {
            float[] p = new float[64 * 64];
            for (int i = 0; i < p.length; i++) {
                p[i] = (float) (-5 + 3 * r.nextGaussian());
            }
            st.addSlice(new FloatProcessor(64, 64, p));
        }
        ImagePlus imp = new ImagePlus("real part", st);
        imp.show();
        add(new Roi(10, 10, 40, 40), "signal");
        IJ.run(imp, "SNR Map (Repeated Acquisitions)...", "channels=1 slices=[Current slice]");
        ResultsTable rt = ResultsTable.getResultsTable(RepeatedSnrCommand.tableTitle(imp));
        assertNotNull(rt);
        assertTrue(rt.getStringValue("Warnings", 0).contains("Gaussian model"), rt.getStringValue("Warnings", 0));
        assertEquals(-5.0 / 3.0, rt.getValue("SNR (corrected)", 0), 0.1);
        add(new Roi(50, 50, 12, 12), "bg");
        IJ.log("\\Clear");
        run(imp, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] slices=[Current slice]");
        String log = IJ.getLog();
        assertTrue(log.contains("not a magnitude image"), log);
        noFlags(log);
    }

    /** 20.3: a report that exists is refused in Fiji's words (the dialog's field, never --force). */
    @Test
    void existingReportIsRefusedInFijisWords() throws Exception {
        ImagePlus a = IJ.openImage("sample-images/aster_disk_1ch.tif");
        a.show();
        Path report = Files.writeString(dir.resolve("qa.html"), "an earlier report");
        run(a, "Phantom QA...", "second=None regions=Automatic fraction=0.75 channels=1 phase=Unknown baseline=5 "
                + "slice=1 report=[" + report + "]");
        String log = IJ.getLog();
        assertTrue(log.contains("tick Replace existing files"), log);
        noFlags(log);
        assertEquals("an earlier report", Files.readString(report));
    }

    /** 20.6: Phantom QA's overlay key is the report's and the ROI Manager's: five roles in five colours. */
    @Test
    void phantomQaShowsOneColourKey() throws Exception {
        ImagePlus a = IJ.openImage("sample-images/aster_disk_1ch.tif");
        a.show();
        IJ.run(a, "Phantom QA...", "second=None regions=Automatic fraction=0.75 channels=1 phase=Unknown baseline=5 "
                + "slice=1 log=[" + dir.resolve("qa.csv") + "] trends=[" + dir.resolve("trends") + "]");
        Overlay ov = a.getOverlay();
        assertNotNull(ov);
        int keys = 0;
        for (int i = 0; i < ov.size(); i++) {
            Roi r = ov.get(i);
            if (r instanceof TextRoi t && "legend".equals(r.getProperty(Face.MARK))) {
                QaImages.KeyEntry k = QaImages.KEY.get(keys++);
                assertEquals(k.label(), t.getText().trim());
                assertEquals(k.colour(), t.getStrokeColor());
            }
        }
        assertEquals(5, keys, "the five roles of the report's key");
        // the ROI Manager's regions carry the same colours as their roles in the key
        for (Roi r : rm.getRoisAsArray()) {
            Color c = QaImages.colour(r.getName());
            assertEquals(c, r.getStrokeColor(), r.getName());
        }
        assertTrue(Files.isDirectory(dir.resolve("trends")), "the trends folder (a Browse field) was created");
    }

    /** 20.10: Stability in Fiji refuses a one-session baseline, as Phantom QA does, in the dialog's words. */
    @Test
    void stabilityBaselineAsPhantomQa() {
        ImageStack st = new ImageStack(64, 64);
        for (int f = 0; f < 30; f++) {
            st.addSlice(new FloatProcessor(64, 64, Phantoms.disk(64, 64, 32, 32, 20, 800, 8, 1, 50 + f)));
        }
        ImagePlus s = new ImagePlus("series", st);
        s.show();
        run(s, "Stability (Time Series)...", "slices=[Current slice] skip=2 square=21 baseline=1");
        String log = IJ.getLog();
        assertTrue(log.contains("Baseline sessions at least 2"), log);
        noFlags(log);
    }
}
