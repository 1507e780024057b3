package org.noisewise.cli;

import ij.ImagePlus;
import ij.gui.Roi;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.noisewise.estimate.BackgroundSnr;
import org.noisewise.estimate.BackgroundSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.RoiRegions;
import org.noisewise.io.RoleNames;
import org.noisewise.report.BackgroundSnrRows;
import org.noisewise.report.ResultRow;
import picocli.CommandLine.Command;
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

    @Option(names = "--signal", paramLabel = "x,y,w,h", converter = RegionConverter.class,
            description = "Signal region: rectangle x,y,w,h in pixels (top-left corner, as ImageJ reports it) or oval:x,y,w,h.")
    RegionSpec signal;

    @Option(names = "--background", paramLabel = "x,y,w,h", converter = RegionConverter.class,
            description = "Background region in air; repeat for several regions (pooled).")
    List<RegionSpec> background = new ArrayList<>();

    @Option(names = "--rois", paramLabel = "FILE",
            description = "ImageJ ROI file (.roi or ROI Manager .zip); roles by name: signal..., background.../bg.../air.../noise...")
    Path rois;

    @Option(names = "--channels", paramLabel = "L", defaultValue = "1",
            description = "Receive channels combined by root sum of squares (default: ${DEFAULT-VALUE}).")
    int channels;

    @Option(names = "--estimator", paramLabel = "NAME", defaultValue = "ml",
            description = "Sigma reported: ml (default), mean, sd or median. All four are always listed.")
    String estimator;

    @Option(names = "--slice", paramLabel = "N", description = "1-based slice of a stack (default: every slice).")
    Integer slice;

    @Option(names = "--json", description = "Write one JSON object (an array of objects for several slices).")
    boolean json;

    @Override
    public Integer call() throws InputException {
        if (channels < 1) {
            throw new InputException("--channels must be at least 1, was " + channels);
        }
        SigmaEstimator est;
        try {
            est = SigmaEstimator.parse(estimator);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        }
        ImagePlus imp = ImageFiles.open(image);
        int w = imp.getWidth();
        int h = imp.getHeight();
        Region sig = null;
        List<Region> bg = new ArrayList<>();
        if (rois != null) {
            List<Roi> list = RoiRegions.read(rois);
            for (int i = 0; i < list.size(); i++) {
                Roi r = list.get(i);
                String name = RoiRegions.nameOf(r, i);
                RoleNames role = RoleNames.fromName(r.getName());
                if (role == RoleNames.SIGNAL && signal == null) {
                    if (sig != null) {
                        throw new InputException("ROI file '" + rois + "' has more than one region named signal...: keep one");
                    }
                    sig = RoiRegions.toRegion(r, name, w, h);
                } else if (role == RoleNames.BACKGROUND) {
                    bg.add(RoiRegions.toRegion(r, name, w, h));
                }
            }
        }
        if (signal != null) {
            sig = signal.toRegion("signal", w, h);
        }
        for (int i = 0; i < background.size(); i++) {
            bg.add(background.get(i).toRegion("background " + (i + 1), w, h));
        }
        if (sig == null) {
            throw new InputException("no signal region: give --signal x,y,w,h or a ROI file with a region named 'signal'");
        }
        if (bg.isEmpty()) {
            throw new InputException("no background region: give --background x,y,w,h (in air, clear of the object "
                    + "and of ghosts) or a ROI file with regions named 'background...'");
        }
        BackgroundSnr.Options options = new BackgroundSnr.Options(channels, est);
        String unit = ImagePlanes.valueUnit(imp);
        String title = image.getFileName().toString();
        List<ResultRow> rows = new ArrayList<>();
        for (int n : Slices.select(imp, slice)) {
            BackgroundSnrResult r = BackgroundSnr.analyze(ImagePlanes.calibratedPixels(imp, n), sig, bg, options);
            rows.add(BackgroundSnrRows.row(title, n, unit, r));
        }
        Output.print(spec.commandLine().getOut(), rows, json);
        return 0;
    }
}
