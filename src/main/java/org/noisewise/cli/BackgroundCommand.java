package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.io.ImageFiles;
import org.noisewise.measure.BackgroundMeasure;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.NoiseScanMeasure;
import org.noisewise.measure.Progress;
import org.noisewise.measure.Roles;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code noisewise background}: single-image SNR with a corrected background sigma. */
@Command(name = "background", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Single-image SNR: the signal amplitude (the signal-region mean corrected for the Rice / "
                + "noncentral-chi bias) over the noise sigma measured in background (air) regions under the "
                + "Rayleigh / chi(2L) model of magnitude noise; the plain ratio is shown beside it.",
                "Valid only for an unfiltered sum-of-squares magnitude image whose background is neither masked nor "
                        + "ghosted; otherwise acquire twice and use the difference method."})
public class BackgroundCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "IMAGE", description = "Image file (TIFF, DICOM, NIfTI or any format ImageJ reads).")
    Path image;

    @Mixin
    RegionOptions regions;

    @Mixin
    ChannelsOption channelOption;

    @Mixin
    EchoOption echoOption;

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

    @Mixin
    NoiseScanOption noiseScan;

    @Option(names = "--sigma-map", paramLabel = "OUT.tif",
            description = "With --noise-scan: write the noise-only scan's sigma over a window around each pixel as a "
                    + "32-bit TIFF (a slice per measured slice; NaN where the scan is masked).")
    Path sigmaMap;

    @Option(names = "--sigma-window", paramLabel = "N", defaultValue = "15",
            description = "With --sigma-map: the window's side in pixels (odd, at least 3; default 15).")
    int sigmaWindow;

    @Option(names = "--air-mask", paramLabel = "OUT.tif",
            description = "With --background auto: write the air found as an 8-bit TIFF (255 = air), a slice per "
                    + "measured slice.")
    Path airMask;

    @Option(names = "--force", description = "Replace an output file that exists.")
    boolean force;

    @Mixin
    ProgressOption progressOption;

    @Option(names = "--json", description = "Write one JSON object (an array of objects for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        Integer channels = channelOption.get(true);
        SigmaEstimator est = parseEstimator(estimator);
        PhaseDirection dir = phase == null ? null : parsePhase(phase);
        Progress progress = progressOption.sink(spec.commandLine().getErr(), "background");
        progress.report(0.0, "reading " + image.getFileName());
        AirMask.check(airMask, regions, force, image);
        checkNoiseScanOptions(est, dir);
        ImagePlus imp = ImageFiles.open(image, echoOption.get());
        Measurement m;
        if (noiseScan.given()) {
            ImagePlus scan = noiseScan.open(echoOption.get());
            Roles roles = regions.resolve(imp.getWidth(), imp.getHeight());
            RegionOptions.require(roles, true, true, false);
            m = NoiseScanMeasure.run(imp, image.getFileName().toString(), scan, noiseScan.title(), roles,
                    new NoiseScanMeasure.Options(channelOption.stated() ? channels : null, sigmaWindow, sigmaMap != null), Slices.select(imp, slice),
                    progress);
            if (sigmaMap != null) {
                ImageWriter.saveTiff(m.images().stream().filter(i -> i.getTitle().endsWith(" sigma map")).findFirst()
                        .orElseThrow(), sigmaMap, force, image);
            }
        } else {
            ImagePlus other = second == null ? null : ImageFiles.open(second, echoOption.get());
            m = measure(imp, image.getFileName().toString(), regions, channels, est, dir, slice, other, progress);
        }
        AirMask.write(m, airMask, force, image);
        Output.notes(spec.commandLine().getErr(), "background", m.notes());
        Output.print(spec.commandLine().getOut(), m.rows(), json);
        return 0;
    }

    /** Options that go with --noise-scan only, or not with it, refused before anything is read. */
    private void checkNoiseScanOptions(SigmaEstimator est, PhaseDirection dir) throws InputException {
        if (!noiseScan.given()) {
            if (sigmaMap != null) {
                throw new InputException("--sigma-map maps the sigma of a noise-only scan: add --noise-scan NOISE, or "
                        + "leave --sigma-map out");
            }
            return;
        }
        if (second != null) {
            throw new InputException("--second and --noise-scan are two ways to measure sigma: give one of them");
        }
        if (est != SigmaEstimator.ML) {
            throw new InputException("with --noise-scan sigma is the maximum-likelihood estimate of the scan: leave "
                    + "--estimator out");
        }
        if (dir != null) {
            throw new InputException("--phase is for the background's ghosting check, which a noise-only scan does "
                    + "not need: leave --phase out");
        }
        if (sigmaWindow < 3 || sigmaWindow % 2 == 0) {
            throw new InputException("--sigma-window must be an odd number of pixels, at least 3 (was " + sigmaWindow
                    + ")");
        }
        if (sigmaMap != null) {
            ImageWriter.checkWritable(sigmaMap, force, image);
        }
        if (sigmaMap != null && sigmaMap.equals(airMask)) {
            throw new InputException("--sigma-map and --air-mask name the same file: give two names");
        }
    }

    /** The background method on one opened image (shared with batch). */
    static Measurement measure(ImagePlus imp, String title, RegionOptions regions, Integer channels, SigmaEstimator est,
                               PhaseDirection phase, Integer slice, ImagePlus second, Progress progress)
            throws InputException {
        Roles roles = regions.resolve(imp.getWidth(), imp.getHeight());
        RegionOptions.require(roles, true, true, true);
        return BackgroundMeasure.run(imp, title, roles, new BackgroundMeasure.Options(channels, est, phase),
                Slices.select(imp, slice), second, progress);
    }

    static SigmaEstimator parseEstimator(String text) throws InputException {
        try {
            return SigmaEstimator.parse(text);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        }
    }

    static PhaseDirection parsePhase(String text) throws InputException {
        try {
            return PhaseDirection.parse(text);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        }
    }
}
