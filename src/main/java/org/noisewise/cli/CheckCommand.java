package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.HistogramPlot;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageMetadata;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.ImageWriter;
import org.noisewise.report.MethodRows;
import org.noisewise.report.ResultRow;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise check}: does the background behave like magnitude noise? */
@Command(name = "check", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Background noise check: fit to the Rayleigh / chi(2L) model (bootstrap p-value), agreement "
                + "of the mean-, SD-, ML- and median-based sigmas, zeros, clipping and quantisation, and a verdict "
                + "(valid, questionable, invalid) with reasons."})
public class CheckCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "IMAGE", description = "Image file.")
    Path image;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Option(names = "--slice", paramLabel = "N", description = "1-based slice (default: every slice).")
    Integer slice;

    @Option(names = "--plot", paramLabel = "OUT.png",
            description = "Write the histogram with the fitted curve as PNG (first checked slice).")
    Path plot;

    @Option(names = "--force", description = "Replace an output file that exists.")
    boolean force;

    @Option(names = "--phase", paramLabel = "ROW|COL",
            description = "Phase-encoding direction for the ghosting check (default: DICOM 0018,1312, else unknown).")
    String phase;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        Integer channels = channelOption.get(true);
        if (plot != null) {
            ImageWriter.checkWritable(plot, force);
        }
        ImagePlus imp = ImageFiles.open(image);
        RegionOptions.Resolved reg = regions.resolve(imp.getWidth(), imp.getHeight());
        if (reg.background().isEmpty()) {
            throw RegionOptions.noBackground();
        }
        String unit = ImagePlanes.valueUnit(imp);
        BackgroundDiagnostics.Options options = new BackgroundDiagnostics.Options(channels,
                phase == null ? ImageMetadata.phaseDirection(imp) : BackgroundCommand.parsePhase(phase),
                BackgroundValues.storage(imp));
        List<ResultRow> rows = new ArrayList<>();
        boolean plotted = false;
        for (int n : Slices.select(imp, slice)) {
            float[] px = ImagePlanes.calibratedPixels(imp, n);
            double[] values = Region.pooledMagnitudes(px, reg.background());
            BackgroundDiagnostics.Diagnosis r = BackgroundDiagnostics.diagnose(px, imp.getWidth(), imp.getHeight(),
                    reg.signal(), reg.background(), options);
            rows.add(MethodRows.check(image.getFileName().toString(), n, unit, r));
            if (plot != null && !plotted) {
                ImageWriter.savePng(HistogramPlot.build("Background histogram - " + image.getFileName(), values, r, unit)
                        .getImagePlus(), plot, force);
                plotted = true;
            }
        }
        Output.print(spec.commandLine().getOut(), rows, json);
        return 0;
    }
}
