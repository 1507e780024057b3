package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.noisewise.estimate.InputException;
import org.noisewise.measure.Progress;
import org.noisewise.io.ImageFiles;
import org.noisewise.measure.QaMeasure;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise qa}: phantom QA in one pass. */
@Command(name = "qa", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Phantom QA in one pass: find the phantom, place the regions, measure SNR (difference method for "
                + "two acquisitions, repeated acquisitions for a stack of repeats, else background with its verdict), "
                + "percent integral uniformity, NEMA non-uniformity and percent-signal ghosting; append to a QA log "
                + "with baseline control limits; write an HTML report.",
                "A QA measurement, not an acceptance test by itself: defer to the site's qualified medical physicist."})
public class QaCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(arity = "1..*", paramLabel = "IMAGE", description = "IMAGE [IMAGE2]: one scan, or two identical acquisitions.")
    List<Path> images;

    @Option(names = "--log", paramLabel = "qa.csv", description = "QA log to append this measurement to (created if missing).")
    Path log;

    @Option(names = "--report", paramLabel = "out.html", description = "Write a self-contained HTML report.")
    Path report;

    @Option(names = "--trends", paramLabel = "DIR",
            description = "With --log: write one trend plot per metric as PNG (trend_<metric>.png) into DIR.")
    Path trends;

    @Option(names = "--force", description = "Replace the report and trend files if they exist (never an input).")
    boolean force;

    @Option(names = "--fraction", paramLabel = "F", defaultValue = "0.75",
            description = "Signal-region fraction of the phantom area (default: ${DEFAULT-VALUE}, NEMA MS 1).")
    double fraction;

    @Option(names = "--limits", description = "Apply the published large-phantom action limits (PIU, ghosting); only for "
            + "scans made by that procedure.")
    boolean limits;

    @Option(names = "--field", paramLabel = "T", description = "Field strength in tesla (default: DICOM 0018,0087).")
    Double field;

    @Mixin
    LogKeyOptions logKeys;

    @Option(names = "--phase", paramLabel = "ROW|COL", description = "Phase-encoding direction (default: DICOM 0018,1312).")
    String phase;

    @Option(names = "--background", paramLabel = "auto",
            description = "auto: take the background from all the air found in the slice (pure-noise pixels, ghosts, "
                    + "zeros and clipped values left out) instead of the regions placed beside the phantom.")
    String background;

    @Option(names = "--air-mask", paramLabel = "OUT.tif",
            description = "With --background auto: write the air found as an 8-bit TIFF (255 = air).")
    Path airMask;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

    @Option(names = "--slice", paramLabel = "N", defaultValue = "1", description = "1-based z slice (default: ${DEFAULT-VALUE}).")
    int slice;

    @Mixin
    ProgressOption progressOption;

    @Option(names = "--repeats", description = "IMAGE is a plain stack of repeated acquisitions of one slice (measured by "
            + "the repeated-acquisition method), not a stack of z slices. A hyperstack's time frames are always repeats.")
    boolean repeats;

    @Option(names = "--json", description = "Write the result as JSON.")
    boolean json;

    @Override
    public Integer call() throws InputException {
        if (!(fraction > 0 && fraction <= 1)) {
            throw new InputException("--fraction must be between 0 and 1, was " + fraction);
        }
        if (logKeys.baseline < 2) {
            throw new InputException("--baseline must be at least 2 sessions, was " + logKeys.baseline);
        }
        if (images.size() > 2) {
            throw new InputException(images.size() + " images were given: phantom QA takes one scan, or two identical "
                    + "acquisitions for the difference method; run it once per session");
        }
        Integer channels = channelOption.get(true);
        boolean autoAir = background != null;
        if (autoAir && !background.trim().equalsIgnoreCase("auto")) {
            throw new InputException("qa places its own background regions beside the phantom: --background takes only "
                    + "auto here (all the air), was '" + background + "'");
        }
        AirMask.check(airMask, autoAir, force, images.toArray(new Path[0]));
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "qa");
        progress.report(0.0, "reading " + images.get(0).getFileName());
        ImagePlus first = ImageFiles.open(images.get(0), echoOption.get());
        ImagePlus second = images.size() > 1 ? ImageFiles.open(images.get(1), echoOption.get()) : null;
        if (trends != null && log == null) {
            throw new InputException("--trends plots the QA log: give --log qa.csv as well");
        }
        if (limits && field == null && org.noisewise.io.ImageMetadata.number(first, "0018,0087") == null) {
            throw new InputException("the published limits depend on field strength, which '" + images.get(0)
                    .getFileName() + "' does not state (DICOM 0018,0087): give it with --field T");
        }
        QaMeasure.Options o = new QaMeasure.Options(fraction, phase == null ? null : BackgroundCommand.parsePhase(phase),
                channels, field, limits, logKeys.scanner, logKeys.coil, logKeys.protocol, logKeys.baseline, log, report,
                force, slice, trends, repeats, autoAir);
        QaMeasure.Outcome out = QaMeasure.run(first, second, null, o, images.get(0),
                progress);
        if (airMask != null && out.result().air() != null) {
            AirMask.write(new ImagePlus(first.getTitle() + " air mask", org.noisewise.io.QaImages.maskProcessor(
                    out.result().air().mask(), first.getWidth(), first.getHeight())), airMask, force,
                    images.toArray(new Path[0]));
        }
        Output.notes(spec.commandLine().getErr(), "qa", out.notes());
        Output.print(spec.commandLine().getOut(), List.of(out.row()), json);
        if (report != null) {
            spec.commandLine().getErr().println("qa: wrote report " + report);
        }
        if (log != null) {
            spec.commandLine().getErr().println("qa: appended to " + log + " (" + (out.history().size() + 1)
                    + " row(s))");
        }
        spec.commandLine().getErr().flush();
        return 0;
    }
}
