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

    /**
     * The bundled 8-channel sample (true SNR 24, generated): the corrected SNR's interval contains the
     * truth with room to spare (at least a fifth of its half-width from either end), where the plain
     * ratio's interval, centred on a magnitude mean that is about 0.6% high for 8 channels at SNR 24
     * (noncentral chi mean, closed form), sits nearer its edge.
     */
    @Test
    void eightChannelSampleIntervalHoldsTheTruth() throws InputException {
        SampleCatalog.Sample s = SampleCatalog.SAMPLES.stream().filter(x -> x.file().equals("bramble_disk_8ch.tif"))
                .findFirst().orElseThrow();
        ImagePlus imp = ImageFiles.open(DIR.resolve(s.file()));
        var signal = org.noisewise.estimate.Region.rectangle("signal", s.signal().x(), s.signal().y(), s.signal().w(),
                s.signal().h(), SampleCatalog.SIZE, SampleCatalog.SIZE);
        java.util.List<org.noisewise.estimate.Region> bg = new java.util.ArrayList<>();
        for (SampleCatalog.Rect r : s.background()) {
            bg.add(org.noisewise.estimate.Region.rectangle("bg", r.x(), r.y(), r.w(), r.h(), SampleCatalog.SIZE,
                    SampleCatalog.SIZE));
        }
        var r = org.noisewise.diagnose.BackgroundSnr.analyze(ImagePlanes.calibratedPixels(imp, 1), SampleCatalog.SIZE,
                SampleCatalog.SIZE, signal, bg, new org.noisewise.diagnose.BackgroundSnr.Options(8,
                        org.noisewise.estimate.SigmaEstimator.ML));
        var ci = r.snrCi95();
        double half = 0.5 * ci.width();
        assertTrue(ci.contains(s.trueSnr()), ci.toString());
        assertTrue(Math.min(s.trueSnr() - ci.low(), ci.high() - s.trueSnr()) >= 0.2 * half, ci.toString());
        assertEquals(org.noisewise.diagnose.Verdict.VALID, r.verdict());
    }
}
