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

    /**
     * The acquisition date and time from DICOM (0008,0022 / 0008,0032, else the study date and time
     * 0008,0020 / 0008,0030) as ISO {@code yyyy-MM-ddTHH:mm:ss}, or {@code null} when the image does not
     * state it (a file's modification time is not an acquisition time).
     */
    public static String acquired(ImagePlus imp) {
        String date = firstNonBlank(tag(imp, "0008,0022"), tag(imp, "0008,0020"));
        String time = firstNonBlank(tag(imp, "0008,0032"), tag(imp, "0008,0030"));
        if (date == null || !date.matches("\\d{8}")) {
            return null;
        }
        String d = date.substring(0, 4) + "-" + date.substring(4, 6) + "-" + date.substring(6, 8);
        if (time != null && time.matches("\\d{4}.*")) {
            d += "T" + time.substring(0, 2) + ":" + time.substring(2, 4)
                    + (time.matches("\\d{6}.*") ? ":" + time.substring(4, 6) : ":00");
        }
        return d;
    }

    /**
     * A key for the QA log: the option when given, else the DICOM tag (and a second one appended,
     * e.g. manufacturer model and serial number), else "unknown".
     */
    public static String key(String option, ImagePlus imp, String tag, String extraTag) {
        if (option != null && !option.isBlank()) {
            return option.trim();
        }
        String v = tag(imp, tag);
        String e = extraTag == null ? null : tag(imp, extraTag);
        String s = v == null ? "" : v;
        if (e != null) {
            s = s.isEmpty() ? e : s + " " + e;
        }
        return s.isEmpty() ? "unknown" : s;
    }

    /** A DICOM number (e.g. field strength 0018,0087), or null. */
    public static Double number(ImagePlus imp, String tag) {
        String s = tag(imp, tag);
        if (s == null) {
            return null;
        }
        try {
            return Double.parseDouble(s.split("\\\\")[0].trim());
        } catch (NumberFormatException e) {
            return null;
        }
    }

    private static String firstNonBlank(String a, String b) {
        return a != null && !a.isBlank() ? a : b != null && !b.isBlank() ? b : null;
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
