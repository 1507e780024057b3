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
import org.noisewise.sample.SampleCatalog;
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
                ImageStack st = new ImageStack(SampleCatalog.SIZE, SampleCatalog.SIZE);
                for (float[] frame : s.generate()) {
                    st.addSlice(new FloatProcessor(SampleCatalog.SIZE, SampleCatalog.SIZE, frame));
                }
                ImagePlus imp = new ImagePlus(s.file(), st);
                imp.setProperty("Info", "Noisewise generated sample (invented scenario): " + s.description());
                imp.getCalibration().pixelWidth = SampleCatalog.PIXEL_MM;
                imp.getCalibration().pixelHeight = SampleCatalog.PIXEL_MM;
                imp.getCalibration().pixelDepth = 5.0;
                imp.getCalibration().setUnit("mm");
                FileSaver saver = new FileSaver(imp);
                String path = out.resolve(s.file()).toString();
                if (!(st.getSize() > 1 ? saver.saveAsTiffStack(path) : saver.saveAsTiff(path))) {
                    throw new InputException("could not write " + out.resolve(s.file()));
                }
                truth.add(toJson(s));
            }
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
