package org.noisewise.cli;

import ij.ImagePlus;
import ij.gui.Plot;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Progress;
import org.noisewise.measure.Roles;
import org.noisewise.measure.StabilityMeasure;
import org.noisewise.series.Stability;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise stability}: time-series stability figures of a repeated phantom series. */
@Command(name = "stability", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Time-series stability of a phantom series: SFNR, static-noise SNR, percent fluctuation, drift "
                + "and the radius of decorrelation (Weisskoff curve), per z slice, after dropping the first frames and "
                + "a second-order detrend of every voxel.",
            "The series is a hyperstack's time frames, a plain stack (its slices are the frames of one slice), a NIfTI "
                + "4-D file or a DICOM series of repeats."})
public class StabilityCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "SERIES", description = "The series (TIFF, NIfTI 4-D, DICOM file or folder).")
    Path image;

    @Option(names = "--slice", paramLabel = "N", description = "1-based z slice (default: every one).")
    Integer slice;

    @Option(names = "--skip", paramLabel = "N", defaultValue = "" + Stability.DEFAULT_SKIP,
            description = "Frames to drop at the start, for the steady state (default: ${DEFAULT-VALUE}).")
    int skip;

    @Option(names = "--roi-size", paramLabel = "S", defaultValue = "" + Stability.DEFAULT_ROI,
            description = "Side of the square region centred on the phantom, pixels (default: ${DEFAULT-VALUE}).")
    int roiSize;

    @Mixin
    RegionOptions regions;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--maps", paramLabel = "OUT.tif", description = "Write the signal, fluctuation-noise, SFNR and "
            + "static-noise maps as a 4-slice TIFF (OUT_z2.tif ... when there are several z slices).")
    Path maps;

    @Option(names = "--plots", paramLabel = "DIR", description = "Write the series, spectrum and Weisskoff plots as PNG "
            + "files into this existing folder.")
    Path plots;

    @Option(names = "--log", paramLabel = "qa.csv", description = "QA log to append one row per slice to (created if "
            + "missing).")
    Path log;

    @Option(names = "--report", paramLabel = "out.html", description = "Write a self-contained HTML report.")
    Path report;

    @Mixin
    LogKeyOptions logKeys;

    @Option(names = "--force", description = "Replace output files that exist (never the input).")
    boolean force;

    @Mixin
    ProgressOption progressOption;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "stability");
        if (logKeys.baseline < 2) {
            throw new InputException("--baseline must be at least 2 sessions, was " + logKeys.baseline);
        }
        if (plots != null) {
            ImageWriter.outputFolder(plots, "plots");
        }
        progress.report(0.0, "reading " + image.getFileName());
        ImagePlus imp = ImageFiles.open(image, echoOption.get());
        int[] zs = Slices.selectZ(imp, slice);
        List<Path> outputs = new ArrayList<>();
        for (int z : zs) {
            if (maps != null) {
                outputs.add(perSlice(maps, z, zs.length));
            }
            if (plots != null) {
                for (String kind : KINDS) {
                    outputs.add(plotPath(kind, z, zs.length));
                }
            }
        }
        for (Path p : outputs) {
            ImageWriter.checkWritable(p, force, image);
            ImageWriter.checkFolderWritable(p);
        }
        StabilityMeasure.Outcome out = run(imp, image.getFileName().toString(), regions,
                new StabilityMeasure.Options(zs, skip, roiSize, maps != null, plots != null, log, report, force, logKeys.scanner,
                        logKeys.coil, logKeys.protocol, logKeys.baseline), image, progress);
        Measurement m = out.measurement();
        for (int i = 0; i < m.images().size(); i++) {
            ImageWriter.saveTiff(m.images().get(i), perSlice(maps, zs[i], zs.length), force, image);
        }
        if (plots != null) {
            for (int i = 0; i < zs.length; i++) {
                for (int k = 0; k < KINDS.length; k++) {
                    Plot p = m.plots().get(KINDS.length * i + k);
                    ImageWriter.savePng(p.getImagePlus(), plotPath(KINDS[k], zs[i], zs.length), force, image);
                }
            }
        }
        Output.notes(spec.commandLine().getErr(), "stability", m.notes());
        Output.print(spec.commandLine().getOut(), m.rows(), json);
        if (report != null) {
            spec.commandLine().getErr().println("stability: wrote report " + report);
        }
        if (log != null) {
            spec.commandLine().getErr().println("stability: appended " + zs.length + " row" + (zs.length == 1 ? "" : "s")
                    + " to " + log);
        }
        spec.commandLine().getErr().flush();
        return 0;
    }

    static final String[] KINDS = {"series", "spectrum", "weisskoff"};

    /** The stability measurement of one opened series (shared with batch). */
    static StabilityMeasure.Outcome run(ImagePlus imp, String name, RegionOptions regions, StabilityMeasure.Options o,
                                        Path source, Progress progress) throws InputException {
        regions.refuseContrast("stability");
        regions.refuseAutoAir("stability");
        Roles roles = regions.resolve(imp.getWidth(), imp.getHeight());
        if (roles.signal().size() > 1) {
            throw new InputException("give one signal region for the stability figures (" + roles.signal().size()
                    + " were given)");
        }
        Region signal = roles.signal().isEmpty() ? null : roles.signal().get(0);
        return StabilityMeasure.run(imp, name, signal, o, source, progress);
    }

    private Path plotPath(String kind, int z, int count) {
        return plots.resolve(String.format(Locale.ROOT, "stability_%s%s.png", kind, count == 1 ? "" : "_z" + z));
    }

    private static Path perSlice(Path file, int z, int count) {
        return OutputPaths.perZ(file, z, count);
    }
}
