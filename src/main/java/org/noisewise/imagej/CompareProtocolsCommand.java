package org.noisewise.imagej;

import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.plugin.PlugIn;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.io.StackPlanes;
import org.noisewise.measure.CompareMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.Planes;
import org.noisewise.protocol.Protocol;
import org.noisewise.protocol.ProtocolScaling;

/**
 * {@code Plugins>Noisewise>Compare Protocols...}: the corrected SNR of two open acquisitions (two series,
 * two pairs or two single images) by one method, their measured ratio B/A with a 95% interval, and the
 * ratio their protocols predict (from the DICOM headers, or typed as {@code KEY=VALUE} pairs).
 *
 * <p>Macro keys: {@code image_a}, {@code image_b} (titles); {@code protocol_a}, {@code protocol_b}
 * ({@code KEY=VALUE} pairs over the header, blank for the header alone); {@code field_exponent};
 * {@code channels} (L); {@code slices} ([Current slice] or [All slices]); {@code append};
 * {@code role_<name>}. Regions: ROI Manager regions named {@code signal...} (and {@code background...}
 * for single images), or the selection on image A as the signal.
 */
public class CompareProtocolsCommand implements PlugIn {

    static final String TITLE = "Compare Protocols";

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, current -> {
            Face.checkImage(current, TITLE);
            int[] ids = WindowManager.getIDList();
            if (ids == null || ids.length < 2) {
                throw new InputException("Compare Protocols needs two open acquisitions, one per protocol (two series of "
                        + "repeats, two pairs or two single images): open both, then run it again.");
            }
            RegionRoles regions = RegionRoles.of(current);
            Face.requireRegions(regions, "The SNRs are measured inside a signal region (draw a selection, or add a "
                    + "region named 'signal' to the ROI Manager; single images also need background regions).");
            GenericDialog gd = new GenericDialog(TITLE);
            gd.addImageChoice("Image_a (protocol A):", current.getTitle());
            gd.addImageChoice("Image_b (protocol B):", DialogFields.otherTitle(current));
            gd.addStringField("Protocol_a (KEY=VALUE, blank = header):", "", 40);
            gd.addStringField("Protocol_b (KEY=VALUE, blank = header):", "", 40);
            gd.addNumericField("Field_exponent:", ProtocolScaling.DEFAULT_FIELD_EXPONENT, 2, 5, "(1 by default)");
            gd.addNumericField("Channels (L):", 1, 0, 4, "(receive channels)");
            gd.addChoice("Slices:", new String[] {BackgroundSnrCommand.CURRENT, BackgroundSnrCommand.ALL},
                    BackgroundSnrCommand.CURRENT);
            gd.addMessage("Keys: voxel (mm, 1x1x5), phase, partitions, averages, bandwidth (Hz/pixel), field (T),\n"
                    + "acceleration (R), g; separated by commas. Values typed here replace the header's.");
            regions.addFields(gd);
            Face.addAppend(gd);
            gd.addHelp(Face.help("Compare Protocols"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            ImagePlus a = gd.getNextImage();
            ImagePlus b = gd.getNextImage();
            String pa = gd.getNextString().trim();
            String pb = gd.getNextString().trim();
            double exponent = gd.getNextNumber();
            int channels = (int) Math.round(gd.getNextNumber());
            boolean all = BackgroundSnrCommand.ALL.equals(gd.getNextChoice());
            regions.readFields(gd);
            boolean append = gd.getNextBoolean();
            if (gd.invalidNumber() || channels < 1) {
                throw new InputException("Field_exponent must be a number and Channels a whole number of at least 1.");
            }
            RegionRoles r = regions.withSelectionOf(a);
            List<Roi> signal = r.signalRegions();
            List<Roi> background = r.withRole(org.noisewise.io.RoleNames.BACKGROUND);
            Measurement m = measure(a, b, pa.isEmpty() ? null : Protocol.parse(pa, "Protocol_a"),
                    pb.isEmpty() ? null : Protocol.parse(pb, "Protocol_b"), exponent, signal, background, channels, all);
            Face.show(TITLE, a, m.rows(), append);
            Face.log(TITLE, m.notes());
            Face.overlay(a, signal, background);
            Face.reactivate(a);
        });
    }

    /**
     * Measures without dialogs; never modifies the images.
     *
     * @param from protocol of A over its header, or null
     * @param to   protocol of B over its header, or null
     */
    public static Measurement measure(ImagePlus a, ImagePlus b, Protocol from, Protocol to, double fieldExponent,
                                      List<Roi> signal, List<Roi> background, int channels, boolean allSlices)
            throws InputException {
        Face.checkImage(a, TITLE);
        Face.checkImage(b, TITLE);
        if (a == b) {
            throw new InputException("The same image was chosen twice: choose one acquisition per protocol.");
        }
        if (signal == null || signal.isEmpty()) {
            throw new InputException("There is no signal region: draw one on image A, or add a region named 'signal' "
                    + "to the ROI Manager.");
        }
        ImagePlus seriesA = Face.series(a);
        int[] zs = allSlices ? Planes.allZ(seriesA) : new int[] {Face.currentZ(seriesA, a)};
        return CompareMeasure.run(seriesA, a.getTitle(), Face.series(b), b.getTitle(), from, to, fieldExponent,
                RegionRoles.roles(signal, background, a), channels, zs, ImageJProgress.INSTANCE);
    }

    /** The title of the table a first run on {@code imp} shows (later runs get unique titles). */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
