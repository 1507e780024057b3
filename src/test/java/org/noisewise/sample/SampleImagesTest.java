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

    /** The two-tissue sample is what the generator makes, and its regions lie in the two gels. */
    @Test
    void committedTissueSampleMatchesTheGenerator() throws InputException {
        ImagePlus imp = ImageFiles.open(DIR.resolve(TissueSample.FILE));
        float[][] frames = TissueSample.generate();
        assertEquals(TissueSample.REPEATS, imp.getStackSize());
        for (int f = 0; f < frames.length; f++) {
            assertArrayEquals(frames[f], ImagePlanes.calibratedPixels(imp, f + 1), "frame " + (f + 1));
        }
    }

    /** The head-like sample is what the generator makes (16-bit values). */
    @Test
    void committedHeadSampleMatchesTheGenerator() throws InputException {
        ImagePlus imp = ImageFiles.open(DIR.resolve(HeadSample.FILE));
        assertEquals(16, imp.getBitDepth());
        assertArrayEquals(HeadSample.generate(), (short[]) imp.getProcessor().getPixels());
    }

    /** The noise-only-scan pair is what the generator makes. */
    @Test
    void committedNoiseScanPairMatchesTheGenerator() throws InputException {
        assertArrayEquals(NoiseScanSample.image(), ImagePlanes.calibratedPixels(
                ImageFiles.open(DIR.resolve(NoiseScanSample.IMAGE)), 1));
        assertArrayEquals(NoiseScanSample.noise(), ImagePlanes.calibratedPixels(
                ImageFiles.open(DIR.resolve(NoiseScanSample.NOISE)), 1));
    }

    /** The bundled DICOM series folder holds exactly the files the generator writes, byte for byte. */
    @Test
    void committedDicomSeriesMatchesTheGenerator() throws IOException {
        Path folder = DIR.resolve(DicomSample.FOLDER);
        java.util.List<org.noisewise.io.DicomSeriesWriter.File> files = org.noisewise.io.DicomSeriesWriter.singleFrame(
                org.noisewise.cli.GenerateSamplesCommand.dicomSpec());
        try (java.util.stream.Stream<Path> s = Files.list(folder)) {
            assertEquals(files.size(), s.count(), "no other files in " + folder);
        }
        assertEquals(DicomSample.SLICES * DicomSample.REPEATS, files.size());
        for (org.noisewise.io.DicomSeriesWriter.File f : files) {
            assertArrayEquals(f.bytes(), Files.readAllBytes(folder.resolve(f.name())), f.name());
        }
    }

    @Test
    void truthFileMatchesTheCatalog() throws IOException {
        JsonObject root = JsonParser.parseString(Files.readString(DIR.resolve("truth.json"))).getAsJsonObject();
        JsonArray samples = root.getAsJsonArray("samples");
        assertEquals(SampleCatalog.SAMPLES.size() + 1 + ProtocolSamples.ALL.size() + 4, samples.size(),
                "the image samples, the stability series, the protocol series, the two-tissue and head samples, the "
                        + "DICOM series and the noise-only-scan pair");
        JsonObject scan = samples.get(samples.size() - 1).getAsJsonObject();
        assertEquals(NoiseScanSample.IMAGE, scan.get("file").getAsString());
        assertEquals(NoiseScanSample.NOISE, scan.get("noise_scan").getAsString());
        assertEquals(NoiseScanSample.trueSnr(NoiseScanSample.CENTRE), scan.get("true_snr").getAsDouble(), 0.0);
        JsonObject head = samples.get(samples.size() - 3).getAsJsonObject();
        assertEquals(HeadSample.FILE, head.get("file").getAsString());
        assertEquals(HeadSample.SIGMA, head.get("sigma").getAsDouble(), 0.0);
        JsonObject tissues = samples.get(samples.size() - 4).getAsJsonObject();
        assertEquals(TissueSample.FILE, tissues.get("file").getAsString());
        assertEquals(8.0, tissues.get("true_cnr").getAsDouble(), 0.0);
        assertEquals(TissueSample.CONTRAST.toString(), tissues.get("contrast").getAsString());
        JsonObject dicom = samples.get(samples.size() - 2).getAsJsonObject();
        assertEquals(DicomSample.FOLDER + "/", dicom.get("file").getAsString());
        assertEquals(DicomSample.trueSnr(4), dicom.getAsJsonArray("true_snr_per_slice").get(3).getAsDouble());
        JsonObject st = samples.get(SampleCatalog.SAMPLES.size()).getAsJsonObject();
        for (int i = 0; i < ProtocolSamples.ALL.size(); i++) {
            JsonObject o = samples.get(SampleCatalog.SAMPLES.size() + 1 + i).getAsJsonObject();
            assertEquals(ProtocolSamples.ALL.get(i).file(), o.get("file").getAsString());
            assertEquals(ProtocolSamples.ALL.get(i).sigma(), o.get("sigma").getAsDouble());
        }
        assertEquals(org.noisewise.sample.StabilitySample.FILE, st.get("file").getAsString());
        assertEquals(org.noisewise.sample.StabilitySample.trueSfnr(), st.get("true_sfnr").getAsDouble());
        for (int i = 0; i < SampleCatalog.SAMPLES.size(); i++) {
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
        assertTrue(text.contains("read as 4 slices x 10 repeats from DICOM positions"), "the DICOM series sample");
        assertTrue(text.contains("sigma, automatic air ("), "the head-like sample with all the air");
        assertTrue(text.contains("SNR (corrected), noise-only scan"), "the accelerated pair with its noise-only scan");
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

    /**
     * The bundled stability series is what its generator makes (a hyperstack of 102 frames, a frame every
     * 2 s), and the stability figures' intervals contain its true SFNR and static-noise SNR (closed forms
     * in {@code StabilitySample}).
     */
    @Test
    void stabilitySeriesMatchesTheGeneratorAndItsTruth() throws InputException {
        ImagePlus imp = ImageFiles.open(DIR.resolve(org.noisewise.sample.StabilitySample.FILE));
        short[][] frames = org.noisewise.sample.StabilitySample.generate();
        assertEquals(frames.length, imp.getNFrames());
        assertEquals(2.0, imp.getCalibration().frameInterval, 1e-12);
        for (int t = 0; t < frames.length; t++) {
            assertArrayEquals(frames[t], (short[]) imp.getStack().getPixels(imp.getStackIndex(1, 1, t + 1)), "frame " + t);
        }
        var out = org.noisewise.measure.StabilityMeasure.run(imp, "sample", null,
                org.noisewise.measure.StabilityMeasure.Options.measure(new int[] {1}, 2, 21, false, false), null,
                org.noisewise.measure.Progress.NONE);
        var r = out.results().get(0);
        assertTrue(r.sfnrCi95().contains(org.noisewise.sample.StabilitySample.trueSfnr()), r.sfnrCi95().toString());
        assertTrue(r.snrCi95().contains(org.noisewise.sample.StabilitySample.trueSnr()), r.snrCi95().toString());
        assertEquals(100, r.framesUsed());
        assertEquals(2.0, r.repetitionSeconds(), 1e-12);
    }

    /**
     * The bundled protocol series are what their generator makes, their headers state the protocol, and
     * the measured ratio of the 8- and 2-average series contains the true ratio 2 (sigma 4 against 8),
     * which is also the prediction (four times the averages); the g-factor over a strip of the accelerated
     * series is within 3% of the RMS of the generated ramp there.
     */
    @Test
    void protocolSeriesCompareAndGFactor() throws InputException {
        for (ProtocolSamples.Series ps : ProtocolSamples.ALL) {
            ImagePlus imp = ImageFiles.open(DIR.resolve(ps.file()));
            float[][] frames = ps.generate();
            assertEquals(frames.length, imp.getNFrames(), ps.file());
            for (int t = 0; t < frames.length; t++) {
                assertArrayEquals(frames[t], (float[]) imp.getStack().getPixels(t + 1), ps.file() + " frame " + t);
            }
        }
        ImagePlus a = ImageFiles.open(DIR.resolve(ProtocolSamples.AVG2.file()));
        ImagePlus b = ImageFiles.open(DIR.resolve(ProtocolSamples.AVG8.file()));
        org.noisewise.estimate.Region sig = org.noisewise.estimate.Region.rectangle("signal", 20, 20, 24, 24, 64, 64);
        var m = org.noisewise.measure.CompareMeasure.run(a, "avg2", b, "avg8", null, null, 1.0,
                org.noisewise.measure.Roles.of(sig, java.util.List.of()), 1, new int[] {1},
                org.noisewise.measure.Progress.NONE);
        var row = m.rows().get(0);
        assertEquals(2.0, ((Number) row.get("ratio_predicted")).doubleValue(), 1e-12);
        double lo = ((Number) row.get("ratio_measured_ci95[0]")).doubleValue();
        double hi = ((Number) row.get("ratio_measured_ci95[1]")).doubleValue();
        assertTrue(lo < 2 && hi > 2, lo + " - " + hi);
        assertEquals(Boolean.TRUE, row.get("consistent"));
        // the README's worked example prints these (Compare Protocols)
        assertEquals(1.943, ((Number) row.get("ratio_measured")).doubleValue(), 5e-4);
        assertEquals(1.884, lo, 5e-4);
        assertEquals(2.005, hi, 5e-4);

        ImagePlus full = ImageFiles.open(DIR.resolve(ProtocolSamples.FULL.file()));
        ImagePlus acc = ImageFiles.open(DIR.resolve(ProtocolSamples.ACCEL2.file()));
        org.noisewise.estimate.Region strip = org.noisewise.estimate.Region.rectangle("strip", 48, 20, 6, 24, 64, 64);
        var g = org.noisewise.measure.GFactorMeasure.run(full, "full", acc, "accel", 2.0,
                org.noisewise.measure.Roles.of(strip, java.util.List.of()), 1, new int[] {1}, null, false,
                org.noisewise.measure.Progress.NONE);
        double ms = 0;
        for (int x = 48; x < 54; x++) {
            ms += ProtocolSamples.g(x) * ProtocolSamples.g(x) / 6;
        }
        double truth = Math.sqrt(ms);
        assertEquals(truth, ((Number) g.rows().get(0).get("g_mean")).doubleValue(), 0.03 * truth);
        // the README's worked example prints these (g-Factor Map)
        assertEquals(1.395, ((Number) g.rows().get(0).get("g_mean")).doubleValue(), 5e-4);
        // the smallest K whose pixel precision (the SD ratio's exact distribution) is at most 10%
        assertEquals(org.noisewise.protocol.GFactor.repeatsNeeded(1), ((Number) g.rows().get(0).get("repeats_needed"))
                .intValue());
    }
}
