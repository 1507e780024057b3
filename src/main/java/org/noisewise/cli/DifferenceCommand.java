package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.StackPlanes;
import org.noisewise.report.MethodRows;
import org.noisewise.report.ResultRow;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise difference}: the NEMA two-acquisition difference method. */
@Command(name = "difference", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Two-acquisition (NEMA difference) SNR: sigma = SD(I1 - I2)/sqrt(2) over the signal region, "
                + "SNR = mean(I1)/sigma.",
                "Either two image files, or one stack with --frames a,b (time points of a hyperstack, else slices)."})
public class DifferenceCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(arity = "1..2", paramLabel = "IMAGE", description = "IMAGE_A IMAGE_B, or one STACK with --frames.")
    List<Path> images;

    @Option(names = "--frames", paramLabel = "a,b", converter = FramePair.Converter.class,
            description = "Two 1-based frames of one stack (time points of a hyperstack, else stack slices).")
    FramePair frames;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Option(names = "--slice", paramLabel = "N", description = "1-based slice (z) to measure (default: every slice).")
    Integer slice;

    @Option(names = "--json", description = "Write JSON (an object, or an array for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        int channels = channelOption.get();
        List<ResultRow> rows = new ArrayList<>();
        if (images.size() == 2) {
            if (frames != null) {
                throw new InputException("give either two images or one stack with --frames, not both");
            }
            ImagePlus a = ImageFiles.open(images.get(0));
            ImagePlus b = ImageFiles.open(images.get(1));
            if (a.getWidth() != b.getWidth() || a.getHeight() != b.getHeight() || a.getStackSize() != b.getStackSize()) {
                throw new InputException(String.format("'%s' (%dx%dx%d) and '%s' (%dx%dx%d) differ in size: give two "
                                + "acquisitions of the same matrix and slices", images.get(0).getFileName(), a.getWidth(),
                        a.getHeight(), a.getStackSize(), images.get(1).getFileName(), b.getWidth(), b.getHeight(),
                        b.getStackSize()));
            }
            RegionOptions.Resolved reg = regions.resolve(a.getWidth(), a.getHeight());
            if (reg.signal() == null) {
                throw RegionOptions.noSignal();
            }
            String unit = ImagePlanes.valueUnit(a);
            for (int n : Slices.select(a, slice)) {
                rows.add(MethodRows.difference(images.get(0).getFileName().toString(),
                        images.get(1).getFileName().toString(), n, unit,
                        DifferenceSnr.analyze(ImagePlanes.calibratedPixels(a, n), ImagePlanes.calibratedPixels(b, n), a.getWidth(),
                                reg.signal(), channels)));
            }
        } else {
            if (frames == null) {
                throw new InputException("one image was given: add a second image, or --frames a,b to use two frames "
                        + "of this stack");
            }
            ImagePlus imp = ImageFiles.open(images.get(0));
            rows.addAll(frameRows(imp, images.get(0).getFileName().toString(), regions, frames, channels, slice));
        }
        Output.print(spec.commandLine().getOut(), rows, json);
        return 0;
    }

    /** The difference method on two frames of one opened stack: one row per z slice. */
    static List<ResultRow> frameRows(ImagePlus imp, String name, RegionOptions regions, FramePair frames, int channels,
                                     Integer slice) throws InputException {
        if (frames.a() == frames.b()) {
            throw new InputException("--frames names frame " + frames.a() + " twice: choose two different frames");
        }
        if (StackPlanes.repeatCount(imp) < 2) {
            throw new InputException("'" + name + "' holds a single frame: the difference method needs two acquisitions");
        }
        RegionOptions.Resolved reg = regions.resolve(imp.getWidth(), imp.getHeight());
        if (reg.signal() == null) {
            throw RegionOptions.noSignal();
        }
        String unit = ImagePlanes.valueUnit(imp);
        List<ResultRow> rows = new ArrayList<>();
        for (int z : zSlices(imp, slice)) {
            rows.add(MethodRows.difference(name + " frame " + frames.a(), name + " frame " + frames.b(), z, unit,
                    DifferenceSnr.analyze(ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, frames.a())),
                            ImagePlanes.calibratedPixels(imp, StackPlanes.index(imp, z, frames.b())), imp.getWidth(),
                            reg.signal(), channels)));
        }
        return rows;
    }

    static int[] zSlices(ImagePlus imp, Integer slice) throws InputException {
        int zs = StackPlanes.zCount(imp);
        if (slice == null) {
            return java.util.stream.IntStream.rangeClosed(1, zs).toArray();
        }
        if (slice < 1 || slice > zs) {
            throw new InputException("--slice " + slice + " does not exist: the stack has " + zs + " z slice(s)");
        }
        return new int[] {slice};
    }
}
