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
}
