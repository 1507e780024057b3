package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import java.io.ByteArrayInputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Base64;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.phantom.QaLog;

class QaCommandTest {

    @TempDir
    Path dir;

    private static final String A = "sample-images/aster_disk_acq1.tif";
    private static final String B = "sample-images/aster_disk_acq2.tif";

    @Test
    void jsonHasTheDocumentedFields() {
        CliRunner.Result r = CliRunner.run("qa", A, B, "--json");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        for (String k : List.of("snr", "sigma", "verdict", "uniformity_piu", "ghosting_percent", "regions", "warnings",
                "snr_ci95", "sigma_ci95", "nema_nonuniformity_percent", "method")) {
            assertTrue(o.has(k), "missing " + k);
        }
        assertEquals("difference", o.get("method").getAsString());
        assertEquals(24.0, o.get("snr").getAsDouble(), 1.5);
        JsonObject signal = o.getAsJsonObject("regions").getAsJsonObject("signal");
        assertEquals("oval", signal.get("shape").getAsString());
        assertTrue(signal.get("w").getAsDouble() > 50);
        assertTrue(o.getAsJsonObject("regions").has("ghost_top"));
        assertTrue(o.getAsJsonObject("regions").has("uniformity_high"));
        assertTrue(o.get("uniformity_piu").getAsDouble() > 90);
        CliRunner.Result single = CliRunner.run("qa", "sample-images/aster_disk_1ch.tif", "--json");
        assertEquals("background", JsonParser.parseString(single.out()).getAsJsonObject().get("method").getAsString());
        CliRunner.Result stack = CliRunner.run("qa", "sample-images/aster_disk_repeats.tif", "--repeats", "--json");
        assertEquals("repeated", JsonParser.parseString(stack.out()).getAsJsonObject().get("method").getAsString());
        // without --repeats a plain stack is a stack of z slices: one slice, background method
        CliRunner.Result slices = CliRunner.run("qa", "sample-images/aster_disk_repeats.tif", "--slice", "3", "--json");
        JsonObject z3 = JsonParser.parseString(slices.out()).getAsJsonObject();
        assertEquals("background", z3.get("method").getAsString());
        assertEquals(3, z3.get("slice").getAsInt());
    }

    @Test
    void limitsNeedAFieldStrength() {
        CliRunner.Result r = CliRunner.run("qa", A, B, "--limits");
        assertEquals(3, r.status());
        assertTrue(r.err().contains("--field"), r.err());
        assertTrue(CliRunner.run("qa", A, B, "--limits", "--field", "-3").err().contains("positive"));
        CliRunner.Result ok = CliRunner.run("qa", A, B, "--limits", "--field", "3", "--json");
        JsonObject o = JsonParser.parseString(ok.out()).getAsJsonObject();
        assertEquals(82.0, o.getAsJsonObject("limits").get("piu_min").getAsDouble());
        assertEquals("yes", o.getAsJsonObject("limits").get("piu_pass").getAsString());
    }

    /** The report: every embedded image decodes, and its results table holds the same numbers as the JSON. */
    @Test
    void reportImagesDecodeAndNumbersMatchJson() throws Exception {
        Path log = dir.resolve("qa.csv");
        for (int i = 0; i < 3; i++) {
            assertEquals(0, CliRunner.run("qa", A, B, "--log", log.toString(), "--scanner", "Aster").status());
        }
        Path html = dir.resolve("report.html");
        CliRunner.Result r = CliRunner.run("qa", A, B, "--log", log.toString(), "--scanner", "Aster", "--report",
                html.toString(), "--json");
        assertEquals(0, r.status(), r.err());
        String text = Files.readString(html);
        Matcher img = Pattern.compile("data:image/png;base64,([A-Za-z0-9+/=]+)").matcher(text);
        int images = 0;
        while (img.find()) {
            assertNotNull(ImageIO.read(new ByteArrayInputStream(Base64.getDecoder().decode(img.group(1)))),
                    "an embedded image does not decode");
            images++;
        }
        // regions, histogram and one trend plot per metric this session has
        JsonObject o0 = JsonParser.parseString(r.out()).getAsJsonObject();
        long metrics = QaLog.METRICS.keySet().stream().filter(k -> o0.has(k) && !o0.get(k).isJsonNull()).count();
        assertEquals(2 + metrics, images);
        assertTrue(text.contains("medical physicist"), "the caution is missing");
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        // the full value in data-value equals the JSON; the shown value is it rounded to meaningful digits
        Matcher cell = Pattern.compile("<td data-key=\"([^\"]+)\" data-value=\"([^\"]+)\">([^<]*)</td>")
                .matcher(text);
        int compared = 0;
        while (cell.find()) {
            JsonElement e = lookup(o, cell.group(1));
            if (e != null && e.isJsonPrimitive() && e.getAsJsonPrimitive().isNumber()) {
                double full = Double.parseDouble(cell.group(2));
                assertEquals(e.getAsDouble(), full, 0.0, cell.group(1));
                double shown = Double.parseDouble(cell.group(3));
                assertEquals(full, shown, Math.abs(full) * 5e-4 + 0.05, cell.group(1));
                assertTrue(cell.group(3).length() <= 12, "too many digits shown: " + cell.group(3));
                compared++;
            }
        }
        // the SNR is shown to the digits its interval supports: half-width about 0.5 gives 2 decimals
        Matcher snr = Pattern.compile("data-key=\"snr\" data-value=\"[^\"]+\">(\\d+\\.(\\d+))<").matcher(text);
        assertTrue(snr.find(), "no SNR cell");
        assertEquals(2, snr.group(2).length(), snr.group(1));
        assertTrue(compared >= 15, "compared only " + compared + " numbers");
        assertEquals(4, QaLog.parse(Files.readString(log)).size());
        Path trends = Files.createDirectory(dir.resolve("trends"));
        assertEquals(0, CliRunner.run("qa", A, B, "--log", log.toString(), "--scanner", "Aster", "--trends",
                trends.toString()).status());
        for (String metric : List.of("snr", "sigma", "uniformity_piu", "ghosting_percent")) {
            Path png = trends.resolve("trend_" + metric + ".png");
            assertNotNull(ImageIO.read(png.toFile()), "trend plot " + metric + " does not decode");
        }
        CliRunner.Result again = CliRunner.run("qa", A, B, "--report", html.toString());
        assertEquals(3, again.status());
        assertFalse(again.err().isBlank());
    }

    private static JsonElement lookup(JsonObject o, String key) {
        JsonElement cur = o;
        for (String part : key.split("\\.")) {
            Matcher m = Pattern.compile("(.+)\\[(\\d+)]").matcher(part);
            if (m.matches()) {
                cur = cur.getAsJsonObject().get(m.group(1));
                cur = cur == null ? null : cur.getAsJsonArray().get(Integer.parseInt(m.group(2)));
            } else {
                cur = cur.getAsJsonObject().get(part);
            }
            if (cur == null || cur.isJsonNull()) {
                return null;
            }
        }
        return cur;
    }
}
