package org.noisewise.imagej;

import ij.ImagePlus;
import ij.gui.GenericDialog;
import java.util.Arrays;
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
        throw new InputException("channels must be a whole number of at least 1, or auto; was '" + text + "'");
    }
}
