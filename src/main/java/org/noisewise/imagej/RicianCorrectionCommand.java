package org.noisewise.imagej;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.plugin.PlugIn;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RicianCorrection;
import org.noisewise.io.CorrectedImages;

/**
 * {@code Plugins>Noisewise>Rician Bias Correction...}: a new 32-bit image with the magnitude noise
 * bias removed pixel by pixel, given sigma (typed in, or measured per slice from background regions
 * by maximum likelihood).
 *
 * <p>Macro keys: {@code sigma} (the per-channel noise SD in calibrated units; 0 = measure from the
 * background regions), {@code channels} (L), {@code method} ([Koay-Basser (mean inversion)] or
 * [Power: sqrt(M^2 - 2L sigma^2)]), {@code region_N} roles.
 */
public class RicianCorrectionCommand implements PlugIn {

    static final String TITLE = "Rician Bias Correction";

    @Override
    public void run(String arg) {
        ImagePlus imp = WindowManager.getCurrentImage();
        if (imp == null) {
            IJ.noImage();
            return;
        }
        RegionRoles regions = RegionRoles.of(imp);
        GenericDialog gd = new GenericDialog(TITLE);
        gd.addNumericField("Sigma (0 = measure from background regions):", 0, 4);
        gd.addNumericField("Channels (L):", 1, 0);
        gd.addChoice("Method:", RicianCorrection.Method.labels(), RicianCorrection.Method.KOAY_BASSER.label());
        regions.addFields(gd);
        gd.addHelp("<html><b>Rician Bias Correction</b><br>Koay-Basser: the amplitude whose expected magnitude "
                + "equals the pixel value (0 at or below the pure-noise mean).<br>Power: sqrt(M^2 - 2L sigma^2), "
                + "0 where negative; unbiased in power, biased low near zero.</html>");
        gd.showDialog();
        if (gd.wasCanceled()) {
            return;
        }
        double sigma = gd.getNextNumber();
        int channels = (int) Math.round(gd.getNextNumber());
        RicianCorrection.Method method = RicianCorrection.Method.parse(gd.getNextChoice());
        regions.readFields(gd);
        try {
            if (gd.invalidNumber() || channels < 1) {
                throw new InputException("sigma must be a number and the channel count a whole number of at least 1");
            }
            process(imp, sigma, sigma == 0 ? regions.backgroundRegions() : List.of(), channels, method).show();
        } catch (InputException e) {
            IJ.error(TITLE, e.getMessage());
        } catch (RuntimeException e) {
            Errors.unexpected(TITLE, e);
        }
    }

    /**
     * A corrected copy of every slice. With {@code sigma = 0}, sigma is measured on each slice from
     * {@code background} (maximum likelihood). Never modifies {@code imp}.
     */
    public static ImagePlus process(ImagePlus imp, double sigma, List<Roi> background, int channels,
                                    RicianCorrection.Method method) throws InputException {
        List<Region> bg = sigma == 0 && background != null && !background.isEmpty()
                ? RegionRoles.toRegions(background, "background", imp.getWidth(), imp.getHeight()) : List.of();
        ImagePlus out = CorrectedImages.correct(imp, sigma, bg, channels, method, IJ::showProgress);
        IJ.showProgress(1.0);
        return out;
    }
}
