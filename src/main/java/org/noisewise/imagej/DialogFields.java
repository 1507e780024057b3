package org.noisewise.imagej;

import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageMetadata;

/**
 * Dialog fields shared by the commands, with their macro keys: {@code channels} (a whole number or
 * {@code auto}) and {@code phase} (the phase-encoding direction, defaulting to DICOM 0018,1312).
 */
final class DialogFields {

    /** Phase-encoding choices, in the order of {@link PhaseDirection}. */
    static final String[] PHASES = {"Rows (ghosts left/right)", "Columns (ghosts above/below)", "Unknown"};

    private DialogFields() {
    }

    static void addChannels(GenericDialog gd) {
        gd.addStringField("Channels (L or auto):", "1", 6);
    }

    static void addPhase(GenericDialog gd, ImagePlus imp) {
        gd.addChoice("Phase encoding:", PHASES, PHASES[ImageMetadata.phaseDirection(imp).ordinal()]);
    }

    static PhaseDirection nextPhase(GenericDialog gd) {
        return PhaseDirection.values()[Arrays.asList(PHASES).indexOf(gd.getNextChoice())];
    }

    /** {@code none} followed by the titles of the other open images. */
    static String[] otherImages(ImagePlus imp, String none) {
        List<String> titles = new ArrayList<>();
        titles.add(none);
        int[] ids = WindowManager.getIDList();
        if (ids != null) {
            for (int id : ids) {
                ImagePlus other = WindowManager.getImage(id);
                if (other != null && other != imp) {
                    titles.add(other.getTitle());
                }
            }
        }
        return titles.toArray(new String[0]);
    }

    /** The title of the first open image other than {@code current} (its own title when there is none). */
    static String otherTitle(ImagePlus current) {
        int[] ids = WindowManager.getIDList();
        if (ids != null) {
            for (int id : ids) {
                ImagePlus imp = WindowManager.getImage(id);
                if (imp != null && imp != current) {
                    return imp.getTitle();
                }
            }
        }
        return current.getTitle();
    }

    /** The file the image was opened from, or null (so outputs never replace it). */
    static java.nio.file.Path sourceFile(ImagePlus imp) {
        ij.io.FileInfo fi = imp.getOriginalFileInfo();
        if (fi == null || fi.fileName == null || fi.directory == null || fi.directory.isEmpty()) {
            return null;
        }
        return java.nio.file.Path.of(fi.directory, fi.fileName);
    }

    /** "auto" gives {@code null} (estimate the channel count); otherwise a whole number of at least 1. */
    static Integer parseChannels(String text) throws InputException {
        String t = text.trim();
        if (t.equalsIgnoreCase("auto")) {
            return null;
        }
        try {
            int l = Integer.parseInt(t);
            if (l >= 1) {
                return l;
            }
        } catch (NumberFormatException e) {
            // fall through to the message
        }
        throw new InputException("The Channels field must be a whole number of at least 1, or auto; it was '" + text
                + "'.");
    }
}
