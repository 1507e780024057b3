package org.noisewise.imagej;

import ij.ImagePlus;
import ij.gui.GenericDialog;
import ij.plugin.PlugIn;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.io.Arrangement;

/**
 * {@code Plugins>Noisewise>Arrange Series...}: shows how Noisewise reads a stack that ImageJ opened
 * from DICOM (File > Import > Image Sequence of a series folder, or an enhanced multi-frame file): a
 * new hyperstack of its z slices and repeats, arranged from the headers as the measuring commands
 * arrange it, with one echo of a multi-echo series; Siemens mosaics (a stack of them, or one) are cut
 * into their slices, which the measuring commands leave to this command. The original stack is not
 * changed; the new image holds copies of its planes, with each image's rescale applied when they differ.
 *
 * <p>Macro keys: {@code echo} (1 for the first echo; 0 when the series holds one echo).
 */
public class ArrangeSeriesCommand implements PlugIn {

    static final String TITLE = "Arrange Series";

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, imp -> {
            Face.checkImage(imp, TITLE);
            if (imp.getStackSize() < 2 && Arrangement.of(imp, null, Face.ECHO_HINT_ARRANGE, null) == imp) {
                throw new InputException("'" + imp.getTitle() + "' is a single image: there is no series to arrange.");
            }
            GenericDialog gd = new GenericDialog(TITLE);
            gd.addNumericField("Echo:", 0, 0, 4, "(1 = first; 0 = the series has one echo)");
            gd.addHelp(Face.help("Arrange Series"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            int echo = (int) Math.round(gd.getNextNumber());
            if (gd.invalidNumber() || echo < 0) {
                throw new InputException("Echo must be a whole number: 1 for the first echo, 0 when there is one echo.");
            }
            ImagePlus out = process(imp, echo == 0 ? null : echo);
            Face.showNew(out);
            Face.log(TITLE, List.of(Arrangement.note(out)));
        });
    }

    /** The arranged series as a new image (copies of the planes); never modifies {@code imp}. */
    public static ImagePlus process(ImagePlus imp, Integer echo) throws InputException {
        ImagePlus view = Arrangement.of(imp, echo, Face.ECHO_HINT_ARRANGE, null);
        if (view == imp) {
            throw new InputException("'" + imp.getTitle() + "' holds no DICOM headers that place its images (no "
                    + "Image Position in its slice labels, not an enhanced DICOM file), or it is a hyperstack already: "
                    + "it is measured as it is.");
        }
        ImagePlus copy = view.duplicate();
        copy.setTitle(imp.getTitle() + " (arranged)");
        copy.setDimensions(1, view.getNSlices(), view.getNFrames());
        copy.setOpenAsHyperStack(view.getNSlices() > 1 && view.getNFrames() > 1);
        copy.setCalibration(view.getCalibration().copy());
        for (String key : new String[] {"Info", Arrangement.PROPERTY}) {
            if (view.getProperty(key) != null) {
                copy.setProperty(key, view.getProperty(key));
            }
        }
        copy.setProperty(org.noisewise.io.BackgroundValues.PER_SLICE_PROPERTY,
                view.getProperty(org.noisewise.io.BackgroundValues.PER_SLICE_PROPERTY));
        return copy;
    }
}
