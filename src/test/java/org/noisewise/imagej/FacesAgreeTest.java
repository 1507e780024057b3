package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.frame.RoiManager;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.cli.NoisewiseCli;
import org.noisewise.testing.ImageJHarness;
import org.noisewise.testing.TestImages;

/** The command line and the ImageJ command give identical numbers and columns on the same image and regions. */
class FacesAgreeTest {

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
    void backgroundMethodAgreesAcrossFaces() throws Exception {
        ImagePlus imp = TestImages.phantom("agree.tif", 100, 4, 1, 42);
        Path file = TestImages.saveTiff(imp, dir, "agree.tif");
        ImagePlus opened = IJ.openImage(file.toString());
        RoiManager rm = RoiManager.getRoiManager();
        rm.reset();
        for (Object[] r : new Object[][] {{"signal", new Roi(38, 38, 20, 20)}, {"bg1", new Roi(1, 1, 14, 14)},
            {"bg2", new Roi(80, 80, 14, 14)}}) {
            ((Roi) r[1]).setName((String) r[0]);
            rm.addRoi((Roi) r[1]);
        }
        IJ.run(opened, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] "
                + "slices=[Current slice] roles=[Region names] phase=Unknown");
        ResultsTable rt = ResultsTable.getResultsTable(BackgroundSnrCommand.tableTitle(opened));

        StringWriter out = new StringWriter();
        int status = NoisewiseCli.execute(new String[] {"background", file.toString(), "--signal", "38,38,20,20",
            "--background", "1,1,14,14", "--background", "80,80,14,14", "--json"}, new PrintWriter(out),
                new PrintWriter(new StringWriter()));
        assertEquals(0, status);
        JsonObject o = JsonParser.parseString(out.toString()).getAsJsonObject();
        assertEquals(o.get("snr").getAsDouble(), rt.getValue("SNR (corrected)", 0), 0.0);
        assertEquals(o.get("sigma").getAsDouble(), rt.getValue("Sigma [a.u.]", 0), 0.0);
        assertEquals(o.getAsJsonArray("snr_ci95").get(1).getAsDouble(), rt.getValue("SNR 95% high", 0), 0.0);
        assertEquals(o.get("verdict").getAsString(), rt.getStringValue("Verdict", 0));

        // the batch CSV's columns are the ImageJ table's, then Status and Error
        Path folder = Files.createDirectory(dir.resolve("batch"));
        Files.copy(file, folder.resolve("agree.tif"));
        Path csv = dir.resolve("out.csv");
        NoisewiseCli.execute(new String[] {"batch", folder.toString(), "--method", "background", "--signal",
            "38,38,20,20", "--background", "1,1,14,14", "--background", "80,80,14,14", "--out", csv.toString()},
                new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter()));
        List<String> csvHeadings = Arrays.asList(Files.readAllLines(csv).get(0).split(","));
        List<String> tableHeadings = Arrays.asList(rt.getHeadings());
        assertEquals(tableHeadings, csvHeadings.subList(0, csvHeadings.size() - 2));
    }
}
