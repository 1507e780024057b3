package org.noisewise.sample;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.ImagePlus;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.noisewise.cli.NoisewiseCli;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImagePlanes;

/** The bundled samples are exactly what the generator makes, and truth.json describes them. */
class SampleImagesTest {

    private static final Path DIR = Path.of("sample-images");

    @Test
    void committedSamplesMatchTheGenerator() throws InputException {
        for (SampleCatalog.Sample s : SampleCatalog.SAMPLES) {
            ImagePlus imp = ImageFiles.open(DIR.resolve(s.file()));
            assertEquals(SampleCatalog.SIZE, imp.getWidth());
            float[][] frames = s.generate();
            assertEquals(frames.length, imp.getStackSize(), s.file());
            for (int f = 0; f < frames.length; f++) {
                assertArrayEquals(frames[f], ImagePlanes.calibratedPixels(imp, f + 1), s.file() + " frame " + (f + 1));
            }
        }
    }

    @Test
    void truthFileMatchesTheCatalog() throws IOException {
        JsonObject root = JsonParser.parseString(Files.readString(DIR.resolve("truth.json"))).getAsJsonObject();
        JsonArray samples = root.getAsJsonArray("samples");
        assertEquals(SampleCatalog.SAMPLES.size(), samples.size());
        for (int i = 0; i < samples.size(); i++) {
            JsonObject o = samples.get(i).getAsJsonObject();
            SampleCatalog.Sample s = SampleCatalog.SAMPLES.get(i);
            assertEquals(s.file(), o.get("file").getAsString());
            assertEquals(s.sigma(), o.get("sigma").getAsDouble());
            assertEquals(s.trueSnr(), o.get("true_snr").getAsDouble());
            assertEquals(s.channels(), o.get("channels").getAsInt());
        }
    }

    /** The README's main job: the demo measures each sample and its interval covers the truth. */
    @Test
    void demoReportsMeasurementsBesideTruth() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int status = NoisewiseCli.execute(new String[] {"demo"}, new PrintWriter(out), new PrintWriter(err));
        assertEquals(0, status, err.toString());
        String text = out.toString();
        for (SampleCatalog.Sample s : SampleCatalog.SAMPLES) {
            assertTrue(text.contains(s.file()), s.file());
        }
        assertTrue(text.contains("channel count matters"));
        assertTrue(text.contains("warning [low_snr]"));
        assertTrue(text.contains("medical physicist"));
    }
}
