package org.noisewise.imagej;

import ij.ImagePlus;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.plugin.PlugIn;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.RicianCorrection;
import org.noisewise.io.ImagePlanes;
import org.noisewise.measure.CorrectionMeasure;
import org.noisewise.measure.Measurement;

/**
 * {@code Plugins>Noisewise>Rician Bias Correction...}: a new 32-bit image with the magnitude noise
 * bias removed, given sigma (typed in, or measured per slice from background regions by maximum
 * likelihood, reported in a table and the Log).
 *
 * <p>Macro keys: {@code sigma} (the per-channel noise SD in calibrated units; 0 = measure from the
 * background regions), {@code channels} (L), {@code method} ([Koay-Basser (mean inversion)],
 * [Power: sqrt(M^2 - 2L sigma^2)] or [Local second moment (N x N window)]), {@code window} (the local
 * method's side, odd), {@code append}, {@code role_<name>}.
 */
public class RicianCorrectionCommand implements PlugIn {

    static final String TITLE = "Rician Bias Correction";

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, imp -> {
            Face.checkImage(imp, TITLE);
            RegionRoles regions = RegionRoles.of(imp);
            String unit = ImagePlanes.valueUnit(imp);
            GenericDialog gd = new GenericDialog(TITLE);
            gd.addNumericField("Sigma (0 = measure from background regions):", 0, 4, 10, unit);
            gd.addNumericField("Channels (L):", 1, 0, 4, "(receive channels)");
            gd.addChoice("Method:", RicianCorrection.Method.labels(), RicianCorrection.Method.KOAY_BASSER.label());
            gd.addNumericField("Window (local method):", RicianCorrection.DEFAULT_WINDOW, 0, 4, "pixels (odd)");
            regions.addFields(gd);
            Face.addAppend(gd);
            gd.addHelp(Face.help("Rician Bias Correction"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            double sigma = gd.getNextNumber();
            int channels = (int) Math.round(gd.getNextNumber());
            RicianCorrection.Method method = RicianCorrection.Method.parse(gd.getNextChoice());
            int window = (int) Math.round(gd.getNextNumber());
            regions.readFields(gd);
            boolean append = gd.getNextBoolean();
            if (gd.invalidNumber() || channels < 1) {
                throw new InputException("Sigma must be a number and Channels a whole number of at least 1.");
            }
            List<Roi> background = sigma == 0 ? regions.backgroundRegions() : List.of();
            if (sigma == 0 && background.isEmpty()) {
                throw new InputException("Sigma is 0 (measure it) but there are no background regions: type sigma, or "
                        + "add regions in air named 'background' to the ROI Manager.");
            }
            Measurement m = measure(imp, sigma, background, channels, method, window);
            Face.showNew(m.images().get(0));
            Face.show(TITLE, imp, m.rows(), append);
            Face.log(TITLE, m.notes());
            if (!background.isEmpty()) {
                Face.overlay(imp, List.of(), background);
            }
            Face.reactivate(imp);
        });
    }

    /**
     * A corrected copy of every slice (not shown). With {@code sigma = 0}, sigma is measured on each
     * slice from {@code background} (maximum likelihood). Never modifies {@code imp}.
     */
    public static ImagePlus process(ImagePlus imp, double sigma, List<Roi> background, int channels,
                                    RicianCorrection.Method method) throws InputException {
        return measure(imp, sigma, background, channels, method, RicianCorrection.DEFAULT_WINDOW).images().get(0);
    }

    static Measurement measure(ImagePlus imp, double sigma, List<Roi> background, int channels,
                               RicianCorrection.Method method, int window) throws InputException {
        Face.checkImage(imp, TITLE);
        return CorrectionMeasure.run(imp, imp.getTitle(), RegionRoles.roles(List.of(),
                background == null ? List.of() : background, imp),
                new CorrectionMeasure.Options(sigma, channels, method, window), ImageJProgress.INSTANCE);
    }

    /** The title of the table a first run on {@code imp} shows (later runs get unique titles). */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
