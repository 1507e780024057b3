package org.noisewise.io;

import ij.ImagePlus;
import ij.util.DicomTools;
import org.noisewise.diagnose.PhaseDirection;

/** Acquisition facts read from an image's DICOM header, when it has one. */
public final class ImageMetadata {

    private ImageMetadata() {
    }

    /** A DICOM tag's value ("gggg,eeee"), trimmed, or {@code null}. */
    public static String tag(ImagePlus imp, String tag) {
        Object info = imp.getProperty("Info");
        if (!(info instanceof String s) || !s.contains(tag)) {
            return null;
        }
        String v = DicomTools.getTag(imp, tag);
        return v == null || v.isBlank() ? null : v.trim();
    }

    /** DICOM 0018,1312 In-plane Phase Encoding Direction, or UNKNOWN. */
    public static PhaseDirection phaseDirection(ImagePlus imp) {
        String v = tag(imp, "0018,1312");
        if (v == null) {
            return PhaseDirection.UNKNOWN;
        }
        try {
            return PhaseDirection.parse(v);
        } catch (IllegalArgumentException e) {
            return PhaseDirection.UNKNOWN;
        }
    }
}
