package org.noisewise.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonObject;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.Warning;

class FormatsTest {

    @Test
    void jsonNestsKeysAndNullsNonFiniteNumbers() {
        ResultRow row = new ResultRow()
                .add("sigma", "Sigma [a.u.]", 2.5)
                .add("sigma_ci95[0]", "low", 2.0)
                .add("sigma_ci95[1]", "high", 3.0)
                .add("pixels.signal", "Signal pixels", 400)
                .add("snr", "SNR", Double.NaN)
                .add("warnings", "Warnings", List.of(new Warning("low_snr", "careful, low")));
        JsonObject o = Formats.toJson(row);
        assertEquals(2.5, o.get("sigma").getAsDouble());
        assertEquals(3.0, o.getAsJsonArray("sigma_ci95").get(1).getAsDouble());
        assertEquals(400, o.getAsJsonObject("pixels").get("signal").getAsInt());
        assertTrue(o.get("snr").isJsonNull());
        assertEquals("low_snr", o.getAsJsonArray("warnings").get(0).getAsJsonObject().get("code").getAsString());
        assertTrue(Formats.toJsonString(o).contains("\"snr\": null"));
    }

    @Test
    void textCellsAndTables() {
        assertEquals("", Formats.text(Double.NaN));
        assertEquals("24.0312", Formats.text(24.03124));
        assertEquals("5", Formats.text(5.0));
        assertEquals("1.5e-07", Formats.text(1.5e-7));
        assertEquals("a; b", Formats.text(List.of(new Warning("x", "a"), new Warning("y", "b"))));
        assertEquals("\"a,b\"", Formats.csvField("a,b"));
        ResultRow r1 = new ResultRow().add("a", "Alpha", 1.0).add("b", "B", "x");
        ResultRow r2 = new ResultRow().add("a", "Alpha", 22.5).add("b", "B", "yy");
        String t = Formats.alignedText(List.of(r1, r2));
        String[] lines = t.split("\\R");
        assertEquals(3, lines.length);
        assertTrue(lines[0].startsWith("Alpha  B"), t);
        assertTrue(lines[2].startsWith("22.5   yy"), t);
    }

    @Test
    void trailingZerosGoBeforeTheExponentOnly() {
        assertEquals("1.23e+05", Formats.trimZeros("1.23000e+05"));
        assertEquals("1e-05", Formats.trimZeros("1.00000e-05"));
        assertEquals("100", Formats.trimZeros("100.000"));
        assertEquals("-2.5", Formats.trimZeros("-2.50000"));
        assertEquals("0.0001", Formats.trimZeros("0.000100000"));
        assertEquals("120", Formats.trimZeros("120"));
        assertEquals("1e+10", Formats.trimZeros("1e+10"));
        assertEquals("10.01", Formats.sig(10.01, 4));
        assertEquals("1.235e+06", Formats.sig(1234567.0, 4));
        assertEquals("0", Formats.text(0.0));
    }

    @Test
    void tableColumnsAreAsWideAsTheirWidestCellAndIntervalsSetTheDecimals() {
        ResultRow r1 = new ResultRow().add("snr", "SNR", 100.4912).add("snr_ci95[0]", "low", 99.9987)
                .add("snr_ci95[1]", "high", 100.9876).add("image", "Image", "a");
        ResultRow r2 = new ResultRow().add("snr", "SNR", 7.24).add("snr_ci95[0]", "low", 6.0)
                .add("snr_ci95[1]", "high", 8.5).add("image", "Image", "long name");
        String[] lines = Formats.alignedText(List.of(r1, r2)).split("\\R");
        // half-widths 0.49 and 1.25: two significant digits of them give 2 and 1 decimals
        assertEquals("SNR     low     high    Image", lines[0].stripTrailing());
        assertEquals("100.49  100.00  100.99  a", lines[1].stripTrailing());
        assertEquals("7.2     6.0     8.5     long name", lines[2].stripTrailing());
        assertEquals(lines[0].length(), lines[2].length(), "every line padded to the same columns");
    }

    @Test
    void rowsWithMoreColumnsKeepEveryColumnInItsPlace() {
        // a 2-D image's row beside a Z x T series' row (which names its z slice and repeat)
        ResultRow flat = new ResultRow().add("image", "Image", "a").add("slice", "Slice", 1).add("snr", "SNR", 20.0);
        ResultRow series = new ResultRow().add("image", "Image", "b").add("slice", "Slice", 5)
                .add("snr", "SNR", 30.0).addAfter("slice", "z", "Z slice", 1).addAfter("z", "repeat", "Repeat", 2);
        String csv = Formats.toCsv(List.of(flat, series));
        String[] lines = csv.split("\r\n");
        assertEquals("Image,Slice,Z slice,Repeat,SNR", lines[0]);
        assertEquals("a,1,,,20.0", lines[1]);
        assertEquals("b,5,1,2,30.0", lines[2]);
        String[] table = Formats.alignedText(List.of(flat, series)).split("\\R");
        assertEquals("Image  Slice  Z slice  Repeat  SNR", table[0].stripTrailing());
        assertEquals("a      1                       20", table[1].stripTrailing());
        assertEquals("b      5      1        2       30", table[2].stripTrailing());
    }
}
