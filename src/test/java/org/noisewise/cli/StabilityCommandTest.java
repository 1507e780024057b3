package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.phantom.QaLog;
import org.noisewise.sample.StabilitySample;

/** {@code noisewise stability} on the bundled series: figures, JSON keys, files, the QA log, and bad input. */
class StabilityCommandTest {

    static final String SERIES = "sample-images/" + StabilitySample.FILE;

    @TempDir
    Path dir;

    @Test
    void jsonPlotsMapsLogAndReport() throws Exception {
        Path log = dir.resolve("qa.csv");
        CliRunner.Result r = CliRunner.run("stability", SERIES, "--json", "--plots", dir.toString(), "--maps",
                dir.resolve("maps.tif").toString(), "--log", log.toString(), "--report", dir.resolve("r.html").toString());
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        for (String k : new String[] {"sfnr", "sfnr_ci95", "snr", "snr_ci95", "percent_fluctuation", "drift_percent", "rdc",
            "weisskoff", "frames_used", "roi_size", "signal_mean"}) {
            assertTrue(o.has(k), "JSON lacks " + k);
        }
        assertEquals("stability", o.get("method").getAsString());
        assertEquals(100, o.get("frames_used").getAsInt());
        assertEquals(21, o.get("roi_size").getAsInt());
        JsonArray w = o.getAsJsonArray("weisskoff");
        assertEquals(21, w.size());
        assertEquals(1, w.get(0).getAsJsonObject().get("n").getAsInt());
        assertEquals(o.get("rdc").getAsDouble(), w.get(0).getAsJsonObject().get("cv_percent").getAsDouble()
                / w.get(20).getAsJsonObject().get("cv_percent").getAsDouble(), 1e-9, "RDC = F(1) / F(21)");
        JsonArray ci = o.getAsJsonArray("sfnr_ci95");
        assertTrue(ci.get(0).getAsDouble() <= StabilitySample.trueSfnr() && StabilitySample.trueSfnr() <= ci.get(1).getAsDouble());
        for (String f : new String[] {"stability_series.png", "stability_spectrum.png", "stability_weisskoff.png", "maps.tif",
            "r.html"}) {
            assertTrue(Files.size(dir.resolve(f)) > 0, f);
        }
        assertTrue(Files.readString(dir.resolve("r.html")).contains("Weisskoff"));
        QaLog.Entry e = QaLog.parse(Files.readString(log)).get(0);
        assertEquals("stability", e.get("method"));
        assertEquals(o.get("sfnr").getAsDouble(), e.number("sfnr"), 1e-9);
        assertEquals(o.get("rdc").getAsDouble(), e.number("rdc"), 1e-9);
        // the same pixels again: flagged as a duplicate, not part of the baseline
        CliRunner.Result again = CliRunner.run("stability", SERIES, "--log", log.toString());
        assertEquals(0, again.status(), again.err());
        assertTrue(QaLog.parse(Files.readString(log)).get(1).get("flags").contains("duplicate"));
        // outputs are not replaced without --force
        CliRunner.Result refused = CliRunner.run("stability", SERIES, "--report", dir.resolve("r.html").toString());
        assertEquals(3, refused.status());
        assertTrue(refused.err().contains("--force"), refused.err());
    }

    @Test
    void givenRegionAndSkip() {
        CliRunner.Result r = CliRunner.run("stability", SERIES, "--json", "--signal", "27,27,11,11", "--skip", "4");
        assertEquals(0, r.status(), r.err());
        JsonObject o = JsonParser.parseString(r.out()).getAsJsonObject();
        assertEquals(98, o.get("frames_used").getAsInt());
        assertEquals(11, o.get("roi_size").getAsInt());
        assertEquals(121, o.getAsJsonObject("pixels").get("signal").getAsInt());
    }

    @Test
    void badInputIsOneClearLine() {
        CliRunner.Result one = CliRunner.run("stability", "sample-images/aster_disk_1ch.tif");
        assertEquals(3, one.status());
        assertTrue(one.err().contains("at least 10"), one.err());
        assertFalse(one.err().contains("Exception"), one.err());
        CliRunner.Result out = CliRunner.run("stability", SERIES, "--signal", "60,60,10,10");
        assertEquals(3, out.status());
        assertTrue(out.err().contains("outside"), out.err());
        CliRunner.Result big = CliRunner.run("stability", SERIES, "--roi-size", "70");
        assertEquals(3, big.status());
        assertTrue(big.err().contains("does not fit"), big.err());
        CliRunner.Result batch = CliRunner.run("batch", "sample-images", "--method", "background", "--skip", "3");
        assertEquals(3, batch.status());
        assertTrue(batch.err().contains("--method stability"), batch.err());
    }
}
