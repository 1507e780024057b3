package org.noisewise.io;

import ij.ImagePlus;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.protocol.Protocol;

/**
 * The acquisition parameters an image's DICOM header states (standard tags only), as a {@link Protocol};
 * what is not stated stays null. Images written by Noisewise or ImageJ keep the header text they were
 * opened with, so a TIFF saved from a DICOM series still carries it.
 */
public final class ProtocolHeaders {

    private ProtocolHeaders() {
    }

    /**
     * Pixel spacing 0028,0030, slice thickness 0018,0050 (else spacing between slices 0018,0088), acquisition
     * matrix 0018,1310 (the acquired voxel when the image was interpolated), phase-encoding steps 0018,0089,
     * averages 0018,0083, pixel bandwidth 0018,0095, field strength 0018,0087, MR acquisition type 0018,0023
     * and parallel reduction factors 0018,9069 and 0018,9155; every value read is named in the notes.
     *
     * <p>Partitions of a 3-D acquisition (every slice of a slab carries the whole slab's sampling time): the
     * out-of-plane phase-encoding steps when stated (0018,9232), else the slices of the volume (the z slices
     * of a series read with its layout, else the slices of a stack without time frames); one slice given
     * alone leaves them unknown (with a note), never 1.
     */
    public static Protocol of(ImagePlus imp) {
        List<String> notes = new ArrayList<>();
        double[] voxel = voxel(imp, notes);
        Double phase = ImageMetadata.number(imp, "0018,0089");
        Double averages = ImageMetadata.number(imp, "0018,0083");
        Double bandwidth = ImageMetadata.number(imp, "0018,0095");
        Double field = ImageMetadata.number(imp, "0018,0087");
        named(notes, "phase-encoding steps", phase, "0018,0089");
        named(notes, "averages", averages, "0018,0083");
        named(notes, "pixel bandwidth (Hz/pixel)", bandwidth, "0018,0095");
        named(notes, "field strength (T)", field, "0018,0087");
        Double partitions = null;
        String type = ImageMetadata.tag(imp, "0018,0023");
        if (type != null && type.trim().equalsIgnoreCase("3D")) {
            Double outOfPlane = positive(ImageMetadata.number(imp, "0018,9232"));
            int slices = Arrangement.known(imp) || StackPlanes.hasTimeAxis(imp) ? imp.getNSlices()
                    : imp.getStackSize();
            if (outOfPlane != null) {
                partitions = outOfPlane;
                notes.add(String.format(Locale.ROOT, "3-D acquisition (0018,0023): %s partitions from the out-of-plane "
                        + "phase-encoding steps (0018,9232)", number(outOfPlane)));
            } else if (slices > 1) {
                partitions = (double) slices;
                notes.add(String.format(Locale.ROOT, "3-D acquisition (0018,0023): its %d slices taken as the "
                        + "partitions (every slice of a slab carries the whole slab's sampling time)", slices));
            } else {
                notes.add("3-D acquisition (0018,0023), but one slice is given and the header states no out-of-plane "
                        + "phase-encoding steps (0018,9232): the number of partitions is unknown; give it "
                        + "(partitions=N) or open the whole volume");
            }
        }
        Double inPlane = ImageMetadata.number(imp, "0018,9069");
        Double outPlane = ImageMetadata.number(imp, "0018,9155");
        Double r = null;
        if (inPlane != null || outPlane != null) {
            r = (inPlane == null ? 1.0 : inPlane) * (outPlane == null ? 1.0 : outPlane);
            notes.add(String.format(Locale.ROOT, "acceleration R = %s from the parallel reduction factors "
                    + "(0018,9069 / 0018,9155)", r));
        }
        boolean slab = type != null && type.trim().equalsIgnoreCase("3D");
        return new Protocol(voxel, positive(phase), partitions, positive(averages), positive(bandwidth),
                positive(field), r == null || r < 1 ? null : r, null, notes, slab);
    }

    private static void named(List<String> notes, String what, Double v, String tag) {
        if (positive(v) != null) {
            notes.add(what + " " + number(v) + " from the header (" + tag + ")");
        }
    }

    private static String number(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e9 ? Long.toString((long) v) : String.format(Locale.ROOT, "%.4g", v);
    }

    private static Double positive(Double d) {
        return d != null && d > 0 && Double.isFinite(d) ? d : null;
    }

    /** The voxel: acquired from the acquisition matrix where stated, else the pixel spacing; null when unknown. */
    private static double[] voxel(ImagePlus imp, List<String> notes) {
        String spacing = ImageMetadata.tag(imp, "0028,0030");
        Double thickness = positive(ImageMetadata.number(imp, "0018,0050"));
        if (thickness == null) {
            thickness = positive(ImageMetadata.number(imp, "0018,0088"));
        }
        if (spacing == null || thickness == null) {
            return null;
        }
        double dy;
        double dx;
        try {
            String[] s = spacing.split("\\\\");
            dy = Double.parseDouble(s[0].trim());
            dx = Double.parseDouble(s[s.length > 1 ? 1 : 0].trim());
        } catch (NumberFormatException e) {
            return null;
        }
        if (!(dx > 0) || !(dy > 0)) {
            return null;
        }
        notes.add(String.format(Locale.ROOT, "pixel spacing %s x %s mm (0028,0030) and slice thickness %s mm (%s) from "
                + "the header", number(dy), number(dx), number(thickness), ImageMetadata.number(imp, "0018,0050") != null
                ? "0018,0050" : "0018,0088"));
        int[] m = matrix(ImageMetadata.tag(imp, "0018,1310"));
        if (m != null) {
            int freq = m[0] > 0 ? m[0] : m[1];
            int phase = m[2] > 0 ? m[2] : m[3];
            if (freq > 0 && phase > 0) {
                double fovX = dx * imp.getWidth();
                double fovY = dy * imp.getHeight();
                boolean phaseAlongRows = ImageMetadata.phaseDirection(imp) == PhaseDirection.ROW;
                double ax = fovX / (phaseAlongRows ? phase : freq);
                double ay = fovY / (phaseAlongRows ? freq : phase);
                if (Math.abs(ax * ay - dx * dy) > 1e-6 * dx * dy) {
                    notes.add(String.format(Locale.ROOT, "acquired voxel %.4g x %.4g mm from the acquisition matrix "
                            + "(0018,1310), not the interpolated pixel spacing %.4g x %.4g mm", ax, ay, dx, dy));
                }
                return new double[] {ax, ay, thickness};
            }
        }
        return new double[] {dx, dy, thickness};
    }

    private static int[] matrix(String v) {
        if (v == null) {
            return null;
        }
        String[] s = v.trim().split("[\\\\\\s]+"); // ImageJ writes US values with spaces, text values with '\'
        if (s.length != 4) {
            return null;
        }
        int[] m = new int[4];
        try {
            for (int i = 0; i < 4; i++) {
                m[i] = Integer.parseInt(s[i].trim());
            }
        } catch (NumberFormatException e) {
            return null;
        }
        return m;
    }
}
