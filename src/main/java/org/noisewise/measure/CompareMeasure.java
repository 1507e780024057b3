package org.noisewise.measure;

import ij.ImagePlus;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.RepeatedMaps;
import org.noisewise.io.ProtocolHeaders;
import org.noisewise.io.StackPlanes;
import org.noisewise.protocol.Protocol;
import org.noisewise.protocol.ProtocolScaling;
import org.noisewise.report.ProtocolRows;
import org.noisewise.report.ResultRow;

/**
 * Measured against predicted: the corrected SNR of two acquisitions (each a series, a pair or a single
 * image, both of the same kind), their ratio B/A with a 95% interval, and the ratio the two protocols
 * predict; {@code consistent} when the prediction lies inside the interval.
 */
public final class CompareMeasure {

    private CompareMeasure() {
    }

    /**
     * @param from   protocol of A given by the user (overrides its header), or null
     * @param to     protocol of B given by the user, or null
     * @param zs     1-based z slices
     */
    public static Measurement run(ImagePlus a, String titleA, ImagePlus b, String titleB, Protocol from, Protocol to,
                                  double fieldExponent, Roles roles, int channels, int[] zs, Progress progress)
            throws InputException {
        ImagePlanes.requireGrayscale(a);
        ImagePlanes.requireGrayscale(b);
        if (a.getWidth() != b.getWidth() || a.getHeight() != b.getHeight()) {
            throw new InputException("'" + titleA + "' is " + a.getWidth() + "x" + a.getHeight() + " pixels and '" + titleB
                    + "' " + b.getWidth() + "x" + b.getHeight() + ": the same regions are measured on both, so give "
                    + "images of one matrix (resample one, or compare protocols of the same matrix)");
        }
        if (StackPlanes.zCount(a) != StackPlanes.zCount(b)) {
            throw new InputException("'" + titleA + "' has " + StackPlanes.zCount(a) + " z slices and '" + titleB + "' "
                    + StackPlanes.zCount(b) + ": give acquisitions of the same slices (or choose one with the slice option)");
        }
        Planes.requireDifferent(a, titleA, b, titleB);
        String kindA = InputSnr.kind(a);
        String kindB = InputSnr.kind(b);
        if (!kindA.equals(kindB)) {
            throw new InputException("'" + titleA + "' " + describe(a) + " and '" + titleB + "' " + describe(b)
                    + ": compare inputs of one kind (two series, two pairs or two single images), so that both SNRs come "
                    + "from the same method");
        }
        List<String> notes = Measurement.imageNotes(a, b);
        Protocol pa = protocol(a, titleA, from, notes);
        Protocol pb = protocol(b, titleB, to, notes);
        ProtocolScaling.Prediction p = ProtocolScaling.predict(pa, pb, fieldExponent);
        notes.addAll(p.notes());
        List<ResultRow> rows = new ArrayList<>();
        for (int i = 0; i < zs.length; i++) {
            int z = zs[i];
            progress.report((double) i / zs.length, "Compare protocols: z " + z);
            boolean series = kindA.equals("repeated");
            RepeatedAcquisitions.Maps ma = series ? RepeatedMaps.compute(a, z) : null;
            RepeatedAcquisitions.Maps mb = series ? RepeatedMaps.compute(b, z) : null;
            for (Region reg : roles.signals()) {
                InputSnr sa = InputSnr.measure(a, titleA, z, reg, roles.background(), channels, ma);
                InputSnr sb = InputSnr.measure(b, titleB, z, reg, roles.background(), channels, mb);
                ProtocolScaling.MeasuredRatio m = ProtocolScaling.measuredRatio(sa.figures(), sb.figures(), p.ratio());
                rows.add(ProtocolRows.comparison(titleA, titleB, z, sa.method(), reg.name(), sa.figures().snr(),
                        sb.figures().snr(), m, p, pa, pb));
            }
        }
        progress.report(1.0, "");
        return new Measurement(rows, List.of(), List.of(), notes);
    }

    private static String describe(ImagePlus imp) {
        int k = StackPlanes.repeatCount(imp);
        return k >= 3 ? "is a series of " + k + " repeats" : k == 2 ? "is a pair" : "is a single image";
    }

    /** The header's protocol with the user's values over it; a note says where it came from. */
    static Protocol protocol(ImagePlus imp, String title, Protocol given, List<String> notes) {
        Protocol header = ProtocolHeaders.of(imp);
        Protocol p = given == null ? header : header.overriddenBy(given);
        notes.add("protocol of '" + title + "': " + (p.text().isEmpty() ? "nothing known" : p.text())
                + (given == null ? " (from the header)" : header.text().isEmpty() ? " (as given)"
                : " (header, with the values given)"));
        for (String n : header.notes()) {
            notes.add(title + ": " + n);
        }
        return p;
    }
}
