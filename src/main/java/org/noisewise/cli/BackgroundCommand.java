package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.BackgroundSnr;
import org.noisewise.estimate.BackgroundSnrResult;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImageMetadata;
import org.noisewise.io.ImagePlanes;
import org.noisewise.report.BackgroundSnrRows;
import org.noisewise.report.ResultRow;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise background}: single-image SNR with a corrected background sigma. */
@Command(name = "background", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Single-image SNR: signal-region mean over the noise sigma measured in background (air) "
                + "regions, corrected for the Rayleigh / chi(2L) distribution of magnitude noise.",
                "Valid only for an unfiltered sum-of-squares magnitude image whose background is neither masked nor "
                        + "ghosted; otherwise acquire twice and use the difference method."})
public class BackgroundCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "IMAGE", description = "Image file (TIFF, DICOM or any format ImageJ reads).")
    Path image;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Option(names = "--estimator", paramLabel = "NAME", defaultValue = "ml",
            description = "Sigma reported: ml (default), mean, sd or median. All four are always listed.")
    String estimator;

    @Option(names = "--slice", paramLabel = "N", description = "1-based slice of a stack (default: every slice).")
    Integer slice;

    @Option(names = "--phase", paramLabel = "ROW|COL",
            description = "Phase-encoding direction (ROW: ghosts left/right; COL: above/below), for the ghosting "
                    + "check; default: from DICOM 0018,1312, else unknown.")
    String phase;

    @Option(names = "--second", paramLabel = "IMAGE2",
            description = "A second identical acquisition: its difference sigma over the signal region is compared with "
                    + "the background sigma, and a disagreement is reported.")
    Path second;

    @Option(names = "--json", description = "Write one JSON object (an array of objects for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        Integer channels = channelOption.get(true);
        SigmaEstimator est;
        try {
            est = SigmaEstimator.parse(estimator);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        }
        ImagePlus imp = ImageFiles.open(image);
        ImagePlus other = second == null ? null : ImageFiles.open(second);
        List<ResultRow> rows = rows(imp, image.getFileName().toString(), regions, channels, est, phase, slice, other);
        Output.print(spec.commandLine().getOut(), rows, json);
        return 0;
    }

    /** The background method on one opened image: one row per selected slice. */
    static List<ResultRow> rows(ImagePlus imp, String title, RegionOptions regions, Integer channels,
                                SigmaEstimator est, String phase, Integer slice, ImagePlus second) throws InputException {
        if (second != null && (second.getWidth() != imp.getWidth() || second.getHeight() != imp.getHeight()
                || second.getStackSize() != imp.getStackSize())) {
            throw new InputException("the second acquisition differs in size from '" + title
                    + "': give two acquisitions of the same matrix and slices");
        }
        RegionOptions.Resolved reg = regions.resolve(imp.getWidth(), imp.getHeight());
        if (reg.signal() == null) {
            throw RegionOptions.noSignal();
        }
        if (reg.background().isEmpty()) {
            throw RegionOptions.noBackground();
        }
        PhaseDirection dir = phase == null ? ImageMetadata.phaseDirection(imp) : parsePhase(phase);
        BackgroundSnr.Options options = new BackgroundSnr.Options(channels, est, dir, BackgroundValues.storage(imp));
        String unit = ImagePlanes.valueUnit(imp);
        List<ResultRow> rows = new ArrayList<>();
        for (int n : Slices.select(imp, slice)) {
            float[] px = ImagePlanes.calibratedPixels(imp, n);
            BackgroundSnr.Options o = options;
            if (second != null) {
                DifferenceSnrResult d = DifferenceSnr.analyze(px, ImagePlanes.calibratedPixels(second, n), imp.getWidth(),
                        reg.signal(),
                        channels == null ? 1 : channels);
                o = options.withDifference(new BackgroundSnr.DifferenceSigma(d.sigma(), d.sigmaCi95()));
            }
            BackgroundSnrResult r = BackgroundSnr.analyze(px, imp.getWidth(), imp.getHeight(), reg.signal(),
                    reg.background(), o);
            rows.add(BackgroundSnrRows.row(title, n, unit, r));
        }
        return rows;
    }

    static PhaseDirection parsePhase(String text) throws InputException {
        try {
            return PhaseDirection.parse(text);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        }
    }
}
