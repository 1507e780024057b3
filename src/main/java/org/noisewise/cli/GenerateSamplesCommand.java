package org.noisewise.cli;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileSaver;
import ij.process.FloatProcessor;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.report.Formats;
import org.noisewise.io.DicomSeriesWriter;
import org.noisewise.sample.DicomSample;
import org.noisewise.sample.SampleCatalog;
import org.noisewise.sample.ProtocolSamples;
import org.noisewise.sample.StabilitySample;
import org.noisewise.sample.HeadSample;
import org.noisewise.sample.NoiseScanSample;
import org.noisewise.sample.TissueSample;
import org.noisewise.sample.SampleCatalog.Rect;
import org.noisewise.sample.SampleCatalog.Sample;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code noisewise generate-samples}: writes the bundled demo images and their truth file. */
@Command(name = "generate-samples", hidden = true, mixinStandardHelpOptions = true,
        description = "Regenerates the sample images and truth.json (deterministic, seeded).")
public class GenerateSamplesCommand implements Callable<Integer> {

    @Option(names = "--out", defaultValue = "sample-images", description = "Folder to write into.")
    Path out;

    @Override
    public Integer call() throws InputException {
        try {
            Files.createDirectories(out);
            JsonArray truth = new JsonArray();
            for (Sample s : SampleCatalog.SAMPLES) {
                writeDiskStack(out, s.file(), s.generate(), s.description());
                truth.add(toJson(s));
            }
            writeStability(out);
            truth.add(stabilityTruth());
            for (ProtocolSamples.Series ps : ProtocolSamples.ALL) {
                writeProtocolSeries(out, ps);
                truth.add(protocolTruth(ps));
            }
            writeTissues(out);
            truth.add(tissueTruth());
            writeHead(out);
            truth.add(headTruth());
            writeDicomSeries(out);
            truth.add(dicomTruth());
            writeNoiseScanPair(out);
            truth.add(noiseScanTruth());
            JsonObject root = new JsonObject();
            root.addProperty("scenario", "Invented: the imaging-physics bench of the fictional Fernhollow Institute.");
            root.addProperty("generator", "org.noisewise.sample.SampleCatalog (java -jar target/noisewise.jar generate-samples)");
            root.add("samples", truth);
            Files.writeString(out.resolve("truth.json"), Formats.toJsonString(root) + "\n", StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new InputException("cannot write samples to '" + out + "': " + e.getMessage());
        }
        return 0;
    }

    /** The stability series as a hyperstack of one slice and its frames, 16-bit, with its frame interval. */
    static void writeStability(Path out) throws InputException {
        int n = StabilitySample.SIZE;
        ImageStack st = new ImageStack(n, n);
        for (short[] frame : StabilitySample.generate()) {
            st.addSlice(new ij.process.ShortProcessor(n, n, frame, null));
        }
        ImagePlus imp = new ImagePlus(StabilitySample.FILE, st);
        imp.setDimensions(1, 1, StabilitySample.FRAMES);
        imp.setOpenAsHyperStack(true);
        imp.setProperty("Info", "Noisewise generated sample (invented scenario): Aster, weekly stability series of the "
                + "disk phantom");
        imp.getCalibration().pixelWidth = StabilitySample.PIXEL_MM;
        imp.getCalibration().pixelHeight = StabilitySample.PIXEL_MM;
        imp.getCalibration().pixelDepth = 4.0;
        imp.getCalibration().setUnit("mm");
        imp.getCalibration().frameInterval = StabilitySample.FRAME_SECONDS;
        imp.getCalibration().setTimeUnit("sec");
        if (!new FileSaver(imp).saveAsTiffStack(out.resolve(StabilitySample.FILE).toString())) {
            throw new InputException("could not write " + out.resolve(StabilitySample.FILE));
        }
    }

    /** A protocol sample as a hyperstack of one slice and its repeats, 32-bit, with its header lines. */
    static void writeProtocolSeries(Path out, ProtocolSamples.Series ps) throws InputException {
        ImageStack st = new ImageStack(ProtocolSamples.SIZE, ProtocolSamples.SIZE);
        for (float[] frame : ps.generate()) {
            st.addSlice(new ij.process.FloatProcessor(ProtocolSamples.SIZE, ProtocolSamples.SIZE, frame));
        }
        ImagePlus imp = new ImagePlus(ps.file(), st);
        imp.setDimensions(1, 1, ps.repeats());
        imp.setOpenAsHyperStack(true);
        imp.setProperty("Info", ps.header());
        imp.getCalibration().pixelWidth = ProtocolSamples.PIXEL_MM;
        imp.getCalibration().pixelHeight = ProtocolSamples.PIXEL_MM;
        imp.getCalibration().pixelDepth = 5.0;
        imp.getCalibration().setUnit("mm");
        if (!new FileSaver(imp).saveAsTiffStack(out.resolve(ps.file()).toString())) {
            throw new InputException("could not write " + out.resolve(ps.file()));
        }
    }

    /** The two-tissue sample: its repeats as stack slices, 32-bit. */
    static void writeTissues(Path out) throws InputException {
        writeDiskStack(out, TissueSample.FILE, TissueSample.generate(), "Bramble, two-compartment gel phantom, 4 repeats");
    }

    /** A 128 x 128 sample of 2 mm pixels, 5 mm slices, 32-bit: one image, or a stack of its frames. */
    private static void writeDiskStack(Path out, String file, float[][] frames, String description)
            throws InputException {
        ImageStack st = new ImageStack(SampleCatalog.SIZE, SampleCatalog.SIZE);
        for (float[] frame : frames) {
            st.addSlice(new FloatProcessor(SampleCatalog.SIZE, SampleCatalog.SIZE, frame));
        }
        writeDiskStack(out, file, st, description);
    }

    /** As above for a stack already made (e.g. 16-bit). */
    private static void writeDiskStack(Path out, String file, ImageStack st, String description)
            throws InputException {
        ImagePlus imp = new ImagePlus(file, st);
        imp.setProperty("Info", "Noisewise generated sample (invented scenario): " + description);
        imp.getCalibration().pixelWidth = SampleCatalog.PIXEL_MM;
        imp.getCalibration().pixelHeight = SampleCatalog.PIXEL_MM;
        imp.getCalibration().pixelDepth = 5.0;
        imp.getCalibration().setUnit("mm");
        FileSaver saver = new FileSaver(imp);
        String path = out.resolve(file).toString();
        if (!(st.getSize() > 1 ? saver.saveAsTiffStack(path) : saver.saveAsTiff(path))) {
            throw new InputException("could not write " + out.resolve(file));
        }
    }

    /** The head-like sample: one 16-bit slice with its ghost and zero-filled bands. */
    static void writeHead(Path out) throws InputException {
        ImageStack st = new ImageStack(HeadSample.SIZE, HeadSample.SIZE);
        st.addSlice(new ij.process.ShortProcessor(HeadSample.SIZE, HeadSample.SIZE, HeadSample.generate(), null));
        writeDiskStack(out, HeadSample.FILE, st, "Aster, head-shaped gel phantom with an 8% Nyquist ghost and "
                + "zero-filled side bands");
    }

    /** The accelerated image and its noise-only scan, one 32-bit slice each. */
    static void writeNoiseScanPair(Path out) throws InputException {
        writeDiskStack(out, NoiseScanSample.IMAGE, new float[][]{NoiseScanSample.image()}, "Bramble, 4-channel array, "
                + "disk phantom with parallel imaging (reduction 2 along x): noise rises to 1.8x in the middle columns");
        writeDiskStack(out, NoiseScanSample.NOISE, new float[][]{NoiseScanSample.noise()}, "Bramble, noise-only scan "
                + "(RF transmitter off) of the same accelerated protocol");
    }

    private static JsonObject noiseScanTruth() {
        JsonObject o = new JsonObject();
        o.addProperty("file", NoiseScanSample.IMAGE);
        o.addProperty("noise_scan", NoiseScanSample.NOISE);
        o.addProperty("description", "Bramble, 4-channel array, disk phantom with parallel imaging: sigma per channel "
                + "5 g(x), g(x) = 1 + 0.8 exp(-(x - 64)^2 / 800), and its noise-only scan, for SNR with a noise-only "
                + "scan");
        o.addProperty("use", "noise_scan");
        o.addProperty("frames", 1);
        o.addProperty("channels", NoiseScanSample.CHANNELS);
        o.addProperty("amplitude", NoiseScanSample.AMPLITUDE);
        o.addProperty("sigma", NoiseScanSample.SIGMA);
        o.addProperty("signal", NoiseScanSample.CENTRE.toString());
        o.addProperty("sigma_at_signal", NoiseScanSample.trueSigma(NoiseScanSample.CENTRE));
        o.addProperty("true_snr", NoiseScanSample.trueSnr(NoiseScanSample.CENTRE));
        o.addProperty("edge", NoiseScanSample.EDGE.toString());
        o.addProperty("true_snr_edge", NoiseScanSample.trueSnr(NoiseScanSample.EDGE));
        o.addProperty("seed", NoiseScanSample.SEED);
        o.addProperty("noise_seed", NoiseScanSample.NOISE_SEED);
        return o;
    }

    private static JsonObject headTruth() {
        JsonObject o = new JsonObject();
        o.addProperty("file", HeadSample.FILE);
        o.addProperty("description", "Aster, single channel, head-shaped gel phantom with an 8% Nyquist ghost (up and "
                + "down) and zero-filled bands of 6 columns at each side, 16-bit, for automatic air");
        o.addProperty("use", "automatic_air");
        o.addProperty("frames", 1);
        o.addProperty("channels", 1);
        o.addProperty("amplitude", HeadSample.OUTER);
        o.addProperty("sigma", HeadSample.SIGMA);
        o.addProperty("true_snr", HeadSample.trueSnr());
        o.addProperty("seed", HeadSample.SEED);
        o.addProperty("signal", HeadSample.SIGNAL.toString());
        return o;
    }

    private static JsonObject tissueTruth() {
        JsonObject o = new JsonObject();
        o.addProperty("file", TissueSample.FILE);
        o.addProperty("description", "Bramble, 8-channel array, two-compartment gel phantom (outer gel and a darker "
                + "insert), 4 repeats, for the contrast-to-noise ratio");
        o.addProperty("use", "contrast");
        o.addProperty("frames", TissueSample.REPEATS);
        o.addProperty("channels", TissueSample.CHANNELS);
        o.addProperty("amplitude", TissueSample.OUTER);
        o.addProperty("contrast_amplitude", TissueSample.INSERT);
        o.addProperty("sigma", TissueSample.SIGMA);
        o.addProperty("true_snr", TissueSample.OUTER / TissueSample.SIGMA);
        o.addProperty("true_cnr", TissueSample.trueCnr());
        o.addProperty("seed", TissueSample.SEED);
        o.addProperty("signal", TissueSample.SIGNAL.toString());
        o.addProperty("contrast", TissueSample.CONTRAST.toString());
        JsonArray bg = new JsonArray();
        for (Rect r : SampleCatalog.BACKGROUND) {
            bg.add(r.toString());
        }
        o.add("background", bg);
        return o;
    }

    /** The DICOM series sample as a scanner writes it: one file per image in a folder of its own. */
    static void writeDicomSeries(Path out) throws IOException {
        Path folder = out.resolve(DicomSample.FOLDER);
        Files.createDirectories(folder);
        DicomSeriesWriter.Spec spec = dicomSpec();
        for (DicomSeriesWriter.File f : DicomSeriesWriter.singleFrame(spec)) {
            Files.write(folder.resolve(f.name()), f.bytes());
        }
    }

    /** The bundled DICOM series' description for the writer. */
    public static DicomSeriesWriter.Spec dicomSpec() {
        DicomSeriesWriter.Spec spec = new DicomSeriesWriter.Spec(DicomSample.FOLDER, DicomSample.SIZE,
                DicomSample.SIZE, DicomSample.SLICES, DicomSample.REPEATS)
                .geometry(DicomSample.PIXEL_MM, DicomSample.THICKNESS_MM, DicomSample.STEP_MM)
                .origin(-128, -128, -9);
        for (int z = 1; z <= DicomSample.SLICES; z++) {
            for (int t = 1; t <= DicomSample.REPEATS; t++) {
                spec.image(z - 1, t - 1, DicomSample.stored(z, t), DicomSample.SLOPE, 0);
            }
        }
        spec.common().text(0x00080020, "DA", "20261119").text(0x00080030, "TM", "093000")
                .text(0x00080022, "DA", "20261119").text(0x00080032, "TM", "093012")
                .text(0x00080070, "LO", "Fernhollow Institute (fictional)").text(0x00081090, "LO", "Aster")
                .text(0x00100010, "PN", "PHANTOM^DISK").text(0x00181030, "LO", "weekly multislice")
                .text(0x00180023, "CS", "2D").decimals(0x00180080, 500).decimals(0x00180083, 1)
                .decimals(0x00180087, 1.5).integer(0x00180089, 64).decimals(0x00180095, 130)
                .us(0x00181310, 64, 0, 0, 64).text(0x00181312, "CS", "COL")
                .text(0x00081030, "LO", "Noisewise generated sample (invented scenario)");
        return spec;
    }

    private static JsonObject dicomTruth() {
        JsonObject o = new JsonObject();
        o.addProperty("file", DicomSample.FOLDER + "/");
        o.addProperty("description", DicomSample.DESCRIPTION);
        o.addProperty("use", "dicom_series");
        o.addProperty("slices", DicomSample.SLICES);
        o.addProperty("frames", DicomSample.REPEATS);
        o.addProperty("channels", 1);
        JsonArray a = new JsonArray();
        JsonArray snr = new JsonArray();
        for (int z = 1; z <= DicomSample.SLICES; z++) {
            a.add(DicomSample.amplitude(z));
            snr.add(DicomSample.trueSnr(z));
        }
        o.add("amplitude_per_slice", a);
        o.addProperty("sigma", DicomSample.SIGMA);
        o.add("true_snr_per_slice", snr);
        o.addProperty("seed", DicomSample.SEED);
        o.addProperty("signal", DicomSample.SIGNAL.toString());
        return o;
    }

    private static JsonObject protocolTruth(ProtocolSamples.Series ps) {
        JsonObject o = new JsonObject();
        o.addProperty("file", ps.file());
        o.addProperty("description", ps.description());
        o.addProperty("use", "protocol");
        o.addProperty("frames", ps.repeats());
        o.addProperty("channels", 1);
        o.addProperty("amplitude", ps.amplitude());
        o.addProperty("sigma", ps.sigma());
        o.addProperty("averages", ps.averages());
        o.addProperty("acceleration", ps.acceleration());
        if (ps.gRamp()) {
            o.addProperty("g_profile", "1 + 0.5 x / 63 (x = column)");
        } else {
            o.addProperty("true_snr", ps.amplitude() / ps.sigma());
        }
        o.addProperty("seed", ps.seed());
        return o;
    }

    private static JsonObject stabilityTruth() {
        JsonObject o = new JsonObject();
        o.addProperty("file", StabilitySample.FILE);
        o.addProperty("description", "Aster, 102-frame stability series of the disk phantom (a frame every 2 s): "
                + "white noise sigma 8, a common fluctuation SD 2, a 4-unit linear drift, the first two frames 5% high");
        o.addProperty("use", "stability");
        o.addProperty("frames", StabilitySample.FRAMES);
        o.addProperty("channels", 1);
        o.addProperty("amplitude", StabilitySample.A);
        o.addProperty("sigma", StabilitySample.SIGMA);
        o.addProperty("common_fluctuation_sd", StabilitySample.S);
        o.addProperty("true_sfnr", StabilitySample.trueSfnr());
        o.addProperty("true_snr", StabilitySample.trueSnr());
        o.addProperty("true_percent_fluctuation", StabilitySample.truePercentFluctuation());
        o.addProperty("true_drift_percent", StabilitySample.trueDriftPercent());
        o.addProperty("true_rdc", StabilitySample.trueRdc());
        o.addProperty("seed", StabilitySample.SEED);
        return o;
    }

    private static JsonObject toJson(Sample s) {
        JsonObject o = new JsonObject();
        o.addProperty("file", s.file());
        o.addProperty("description", s.description());
        o.addProperty("use", s.use().name().toLowerCase(java.util.Locale.ROOT));
        o.addProperty("frames", s.frames());
        o.addProperty("channels", s.channels());
        o.addProperty("amplitude", s.amplitude());
        o.addProperty("sigma", s.sigma());
        o.addProperty("true_snr", s.trueSnr());
        o.addProperty("seed", s.seed());
        o.addProperty("signal", s.signal().toString());
        JsonArray bg = new JsonArray();
        for (Rect r : s.background()) {
            bg.add(r.toString());
        }
        o.add("background", bg);
        return o;
    }
}
