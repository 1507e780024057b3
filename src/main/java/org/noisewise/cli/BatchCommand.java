package org.noisewise.cli;

import com.google.gson.JsonArray;
import ij.ImagePlus;
import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.stream.Stream;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.io.DicomSeries;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.Progress;
import org.noisewise.report.Formats;
import org.noisewise.report.ResultRow;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code noisewise batch}: one method over every image and DICOM series below a folder, walked in
 * a fixed (sorted) order. Every file is accounted for: measured rows have status {@code ok}, and a
 * file that cannot be read or measured gets a row with status {@code error} and the reason.
 */
@Command(name = "batch", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Run one method over every image file and DICOM series below FOLDER (sorted order), one row "
                + "per series and slice; files that cannot be read or measured get a row saying why.",
                "Exit status 0 when every file was measured, 4 when some could not be (their rows say why)."})
public class BatchCommand implements Callable<Integer> {

    /** Exit status when some files could not be measured. */
    public static final int EXIT_SOME_FAILED = 4;

    /** The methods batch can run. */
    enum Method { background, difference, repeat, stability }

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FOLDER", description = "Folder to walk (sub-folders included).")
    Path folder;

    @Option(names = "--method", required = true, paramLabel = "NAME",
            description = "background, difference (two frames of each stack), repeat or stability.")
    Method method;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--estimator", paramLabel = "NAME", defaultValue = "ml", description = "background: ml, mean, sd or median.")
    String estimator;

    @Option(names = "--phase", paramLabel = "ROW|COL", description = "background: phase-encoding direction.")
    String phase;

    @Option(names = "--frames", paramLabel = "a,b", defaultValue = "1,2", converter = FramePair.Converter.class,
            description = "difference: the two frames of each stack (default: ${DEFAULT-VALUE}).")
    FramePair frames;

    @Option(names = "--rician", description = "repeat: accepted for compatibility; the correction is always applied.")
    boolean rician;

    @Option(names = "--skip", paramLabel = "N", description = "stability: frames to drop at the start (default: "
            + org.noisewise.series.Stability.DEFAULT_SKIP + ").")
    Integer skip;

    @Option(names = "--roi-size", paramLabel = "S", description = "stability: side of the square centred on the phantom "
            + "(default: " + org.noisewise.series.Stability.DEFAULT_ROI + ").")
    Integer roiSize;

    @Option(names = "--slice", paramLabel = "N", description = "1-based slice (z) of each image (default: every slice).")
    Integer slice;

    @Option(names = {"--out", "--csv"}, paramLabel = "FILE", description = "Write the rows as CSV.")
    Path csv;

    @Option(names = "--force", description = "Replace the CSV file if it exists.")
    boolean force;

    @Option(names = "--json", description = "Write the rows as a JSON array instead of a table.")
    boolean json;

    /** One thing to measure: an image file or a DICOM series. */
    record Item(String name, Path path, DicomSeries.Series series) {
    }

    @Override
    public Integer call() throws InputException {
        if (!Files.isDirectory(folder)) {
            throw new InputException("'" + folder + "' is not a folder: give the folder to walk");
        }
        Integer channels = channelOption.get(method == Method.background);
        if (method != Method.stability && (skip != null || roiSize != null)) {
            throw new InputException("--skip and --roi-size belong to --method stability: leave them out for "
                    + method);
        }
        if (method == Method.stability) {
            regions.refuseContrast("--method stability");
        }
        if (method != Method.background) {
            regions.refuseAutoAir("--method " + method);
        }
        if (skip != null && skip < 0) {
            throw new InputException("--skip must be 0 or more frames, was " + skip);
        }
        if (roiSize != null && roiSize < 1) {
            throw new InputException("--roi-size must be at least 1 pixel, was " + roiSize);
        }
        SigmaEstimator est = BackgroundCommand.parseEstimator(estimator);
        PhaseDirection dir = phase == null ? null : BackgroundCommand.parsePhase(phase);
        if (csv != null) {
            ImageWriter.checkWritable(csv, force);
        }
        if (csv != null) {
            ImageWriter.checkFolderWritable(csv);
        }
        List<Path> leftOut = new ArrayList<>();
        List<Item> items = items(folder, csv, leftOut);
        PrintWriter err = spec.commandLine().getErr();
        if (!leftOut.isEmpty()) {
            err.println("batch: note: " + leftOut.size() + " file(s) that are not images were left out: "
                    + String.join(", ", leftOut.stream().limit(5).map(p -> folder.relativize(p).toString()).toList())
                    + (leftOut.size() > 5 ? ", ..." : ""));
        }
        if (items.isEmpty()) {
            throw new InputException("folder '" + folder + "' and its sub-folders hold no images to measure"
                    + (leftOut.isEmpty() ? "" : " (only " + leftOut.size() + " other file(s))") + ": give the folder of "
                    + "the images");
        }
        long start = System.nanoTime();
        List<ResultRow> rows = new ArrayList<>();
        List<String> headings = null;
        List<Item> failed = new ArrayList<>();
        List<String> failures = new ArrayList<>();
        int measured = 0;
        for (int i = 0; i < items.size(); i++) {
            Item item = items.get(i);
            try {
                ImagePlus imp = item.series() != null
                        ? DicomSeries.open(item.series(), item.name(), echoOption.get(), ImageFiles.ECHO_HINT)
                        : ImageFiles.open(item.path(), echoOption.get());
                List<ResultRow> r = switch (method) {
                    case background -> BackgroundCommand.measure(imp, item.name(), regions, channels, est, dir, slice,
                            null, Progress.NONE).rows();
                    case difference -> DifferenceCommand.frames(imp, item.name(), regions, frames,
                            channels == null ? 1 : channels, slice, Progress.NONE).rows();
                    case repeat -> RepeatCommand.summary(imp, item.name(), regions, channels == null ? 1 : channels,
                            slice, Progress.NONE).rows();
                    case stability -> StabilityCommand.run(imp, item.name(), regions,
                            org.noisewise.measure.StabilityMeasure.Options.measure(Slices.selectZ(imp, slice),
                                    skip == null ? org.noisewise.series.Stability.DEFAULT_SKIP : skip,
                                    roiSize == null ? org.noisewise.series.Stability.DEFAULT_ROI : roiSize, false, false),
                            item.path(), Progress.NONE).measurement().rows();
                };
                for (ResultRow row : r) {
                    rows.add(row.add("status", "Status", "ok").add("error", "Error", ""));
                }
                if (headings == null && !r.isEmpty()) {
                    headings = rows.get(rows.size() - 1).headings();
                }
                measured++;
            } catch (InputException e) {
                failed.add(item);
                failures.add(NoisewiseCli.text(e));
                rows.add(null);
            } catch (RuntimeException e) {
                failed.add(item);
                failures.add("could not be measured (" + e.getClass().getSimpleName() + ": " + e.getMessage() + ")");
                rows.add(null);
            }
            if (items.size() > 1) {
                err.printf(Locale.ROOT, "batch: %d/%d %s (%.1f s)%n", i + 1, items.size(), item.name(),
                        (System.nanoTime() - start) / 1e9);
                err.flush();
            }
        }
        List<ResultRow> complete = fillErrors(rows, failed, failures, headings);
        if (csv != null) {
            ImageWriter.writeText(Formats.toCsv(complete), csv, force);
        }
        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            JsonArray a = new JsonArray();
            complete.forEach(r -> a.add(Formats.toJson(r)));
            out.println(Formats.toJsonString(a));
        } else {
            out.print(Formats.alignedText(complete));
        }
        out.flush();
        err.printf(Locale.ROOT, "batch: %d item(s), %d measured, %d failed, %d row(s) in %.1f s%s%n", items.size(),
                measured, failed.size(), complete.size(), (System.nanoTime() - start) / 1e9,
                csv != null ? "; wrote " + csv : "");
        err.flush();
        return failed.isEmpty() ? 0 : EXIT_SOME_FAILED;
    }

    /** Error rows take the measured rows' columns (blank) so every row has the same columns. */
    private static List<ResultRow> fillErrors(List<ResultRow> rows, List<Item> failed, List<String> failures,
                                              List<String> headings) {
        List<ResultRow> out = new ArrayList<>();
        int f = 0;
        for (ResultRow r : rows) {
            if (r != null) {
                out.add(r);
                continue;
            }
            Item item = failed.get(f);
            String why = failures.get(f);
            f++;
            ResultRow e = new ResultRow();
            if (headings == null) {
                e.add("image", "Image", item.name()).add("status", "Status", "error").add("error", "Error", why);
            } else {
                ResultRow template = rows.stream().filter(x -> x != null).findFirst().orElseThrow();
                for (ResultRow.Cell c : template.tableCells()) {
                    Object v = switch (c.key()) {
                        case "image" -> item.name();
                        case "status" -> "error";
                        case "error" -> why;
                        default -> null;
                    };
                    e.add(c.key(), c.heading(), v);
                }
            }
            out.add(e);
        }
        return out;
    }

    /**
     * Image files and DICOM series below {@code root}, in sorted order; the output file itself is left
     * out, and so are files that are plainly not images (text, tables, documents: {@link ImageFiles#notAnImage}),
     * which go to {@code leftOut} for the note.
     */
    static List<Item> items(Path root, Path exclude, List<Path> leftOut) throws InputException {
        List<Path> dirs;
        try (Stream<Path> s = Files.walk(root)) {
            dirs = s.filter(Files::isDirectory).sorted().toList();
        } catch (IOException e) {
            throw new InputException("cannot walk folder '" + root + "': " + e.getMessage());
        }
        Path skip = exclude == null ? null : exclude.toAbsolutePath().normalize();
        List<Item> items = new ArrayList<>();
        for (Path d : dirs) {
            // one reading of each file's header says whether it is DICOM, and of which series
            DicomSeries.Contents contents = DicomSeries.scan(d, f -> skip == null
                    || !f.toAbsolutePath().normalize().equals(skip));
            // DICOM objects that are not images (a DICOMDIR at the top of an export, reports) are named in the note
            leftOut.addAll(contents.nonImages());
            for (Path f : contents.others()) {
                if (ImageFiles.notAnImage(f)) {
                    leftOut.add(f);
                } else {
                    items.add(new Item(root.relativize(f).toString(), f, null));
                }
            }
            List<DicomSeries.Series> series = contents.series();
            for (int i = 0; i < series.size(); i++) {
                String rel = root.relativize(d).toString();
                String name = (rel.isEmpty() ? "." : rel) + " [DICOM series" + (series.size() > 1 ? " " + (i + 1) : "")
                        + ", " + series.get(i).files().size() + " file(s)]";
                items.add(new Item(name, d, series.get(i)));
            }
        }
        return items;
    }
}
