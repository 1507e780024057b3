package org.noisewise.measure;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.ImageStack;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.report.ResultRow;
import org.noisewise.testing.TestImages;

/** Every measurement whose image states its protocol reports the SNR efficiency SNR / (V sqrt(T)). */
class EfficiencyTest {

    /** DICOM header lines as ImageJ keeps them with an image (and in the TIFF files it writes). */
    static final String HEADER = String.join("\n",
            "0018,0050  Slice Thickness: 4",
            "0018,0083  Number of Averages: 2",
            "0018,0089  Number of Phase Encoding Steps: 96",
            "0018,0095  Pixel Bandwidth: 192",
            "0028,0030  Pixel Spacing: 1.5\\1.5", "");

    static ImagePlus pair(boolean header) {
        ImageStack st = new ImageStack(TestImages.SIZE, TestImages.SIZE);
        st.addSlice(TestImages.phantom("a", 100, 4, 1, 1).getProcessor());
        st.addSlice(TestImages.phantom("b", 100, 4, 1, 2).getProcessor());
        ImagePlus imp = new ImagePlus("pair", st);
        if (header) {
            imp.setProperty("Info", HEADER);
        }
        return imp;
    }

    @Test
    void differenceRowsCarryTheEfficiency() throws InputException {
        Roles roles = Roles.of(Region.rectangle("signal", 33, 33, 30, 30, TestImages.SIZE, TestImages.SIZE), List.of());
        Measurement m = DifferenceMeasure.frames(pair(true), "pair", 1, 2, roles, 1, new int[] {1}, Progress.NONE);
        ResultRow row = m.rows().get(0);
        double snr = ((Number) row.get("snr")).doubleValue();
        double v = 1.5 * 1.5 * 4; // mm^3
        double t = 96.0 * 2 / 192; // s
        assertEquals(snr / (v * Math.sqrt(t)), ((Number) row.get("snr_efficiency")).doubleValue(), 1e-9 * snr);
        assertEquals(((Number) row.get("snr_ci95[0]")).doubleValue() / (v * Math.sqrt(t)),
                ((Number) row.get("snr_efficiency_ci95[0]")).doubleValue(), 1e-9 * snr);
        assertTrue(m.notes().stream().anyMatch(n -> n.contains("SNR efficiency from the header")), m.notes().toString());

        Measurement plain = DifferenceMeasure.frames(pair(false), "pair", 1, 2, roles, 1, new int[] {1}, Progress.NONE);
        assertNull(plain.rows().get(0).get("snr_efficiency"));
        assertTrue(plain.rows().get(0).headings().stream().anyMatch(h -> h.startsWith("SNR efficiency")),
                "the column is there (blank) so tables and CSV keep one shape");
    }

    /** Phantom QA writes the efficiency to its table and to the QA log. */
    @Test
    void qaLogRecordsTheEfficiency(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir) throws Exception {
        ImagePlus imp = ij.IJ.openImage("sample-images/aster_disk_1ch.tif");
        imp.setProperty("Info", HEADER);
        java.nio.file.Path log = dir.resolve("qa.csv");
        QaMeasure.Options o = new QaMeasure.Options(0.75, null, 1, null, false, "Aster", "head", "weekly", 5, log, null,
                false, 1);
        QaMeasure.Outcome out = QaMeasure.run(imp, null, null, o, null);
        double snr = ((Number) out.row().get("snr")).doubleValue();
        double expected = snr / (1.5 * 1.5 * 4 * Math.sqrt(96.0 * 2 / 192));
        assertEquals(expected, ((Number) out.row().get("snr_efficiency")).doubleValue(), 1e-9 * expected);
        java.util.List<String> lines = java.nio.file.Files.readAllLines(log);
        java.util.List<String> header = java.util.List.of(lines.get(0).split(","));
        String[] row = lines.get(1).split(",");
        assertEquals(expected, Double.parseDouble(row[header.indexOf("snr_efficiency")]), 1e-9 * expected);
    }
}
