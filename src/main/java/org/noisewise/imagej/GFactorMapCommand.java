package org.noisewise.imagej;

import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.plugin.PlugIn;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.io.StackPlanes;
import org.noisewise.measure.GFactorMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Planes;

/**
 * {@code Plugins>Noisewise>g-Factor Map...}: {@code g = SNR_full / (SNR_accelerated sqrt(R))} from two open
 * acquisitions, each a series of repeats of the same slices or a pair: a pixel map from the temporal mean
 * and SD maps and each signal region's pooled value with its 95% interval.
 *
 * <p>Macro keys: {@code full}, {@code accelerated} (image titles); {@code acceleration} (R);
 * {@code window} (odd side of the variance-averaging window of the map; 0 = default: 1 for series,
 * {@value GFactorMeasure#PAIR_WINDOW} for a pair); {@code channels}; {@code slices}; {@code map}
 * (show the map); {@code append}; {@code role_<name>}.
 */
public class GFactorMapCommand implements PlugIn {

    static final String TITLE = "g-Factor Map";

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, current -> {
            Face.checkImage(current, TITLE);
            int[] ids = WindowManager.getIDList();
            if (ids == null || ids.length < 2) {
                throw new InputException("The g-factor needs two open acquisitions of the same slices: the full one and "
                        + "the accelerated one, each a stack of repeats (or a pair). Open both, then run it again.");
            }
            RegionRoles regions = RegionRoles.of(current);
            GenericDialog gd = new GenericDialog(TITLE);
            gd.addImageChoice("Full (unaccelerated):", current.getTitle());
            gd.addImageChoice("Accelerated:", DialogFields.otherTitle(current));
            gd.addNumericField("Acceleration (R):", 2, 2, 5, "(factor)");
            gd.addNumericField("Window for the map:", 0, 0, 4, "pixels (odd; 0 = default)");
            gd.addNumericField("Channels (L):", 1, 0, 4, "(receive channels)");
            gd.addChoice("Slices:", new String[] {BackgroundSnrCommand.CURRENT, BackgroundSnrCommand.ALL},
                    BackgroundSnrCommand.CURRENT);
            gd.addCheckbox("Map (show the g-factor map)", true);
            regions.addFields(gd);
            Face.addAppend(gd);
            gd.addHelp(Face.help("g-Factor Map"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            ImagePlus full = gd.getNextImage();
            ImagePlus accel = gd.getNextImage();
            double r = gd.getNextNumber();
            int window = (int) Math.round(gd.getNextNumber());
            int channels = (int) Math.round(gd.getNextNumber());
            boolean all = BackgroundSnrCommand.ALL.equals(gd.getNextChoice());
            boolean map = gd.getNextBoolean();
            regions.readFields(gd);
            boolean append = gd.getNextBoolean();
            if (gd.invalidNumber() || channels < 1 || window < 0) {
                throw new InputException("Acceleration must be a number of at least 1, Window 0 or an odd whole number, "
                        + "Channels a whole number of at least 1.");
            }
            List<Roi> signal = regions.withSelectionOf(full).signalRegions();
            Measurement m = measure(full, accel, r, window == 0 ? null : window, signal, channels, all, map);
            m.images().forEach(Face::showNew);
            if (!m.rows().isEmpty()) {
                Face.show(TITLE, full, m.rows(), append);
            }
            Face.log(TITLE, m.notes());
            Face.overlay(full, signal, List.of());
            Face.reactivate(full);
        });
    }

    /** Measures without dialogs; never modifies the images; the maps are returned, not shown. */
    public static Measurement measure(ImagePlus full, ImagePlus accel, double acceleration, Integer window,
                                      List<Roi> signal, int channels, boolean allSlices, boolean map)
            throws InputException {
        Face.checkImage(full, TITLE);
        Face.checkImage(accel, TITLE);
        if (full == accel) {
            throw new InputException("The same image was chosen twice: choose the full and the accelerated acquisition.");
        }
        ImagePlus fullSeries = Face.series(full);
        int[] zs = allSlices ? Planes.allZ(fullSeries) : new int[] {Face.currentZ(fullSeries, full)};
        return GFactorMeasure.run(fullSeries, full.getTitle(), Face.series(accel), accel.getTitle(), acceleration,
                RegionRoles.roles(signal == null ? List.of() : signal, List.of(), full), channels, zs, window, map,
                ImageJProgress.INSTANCE);
    }

    /** The title of the table a first run on {@code imp} shows. */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
