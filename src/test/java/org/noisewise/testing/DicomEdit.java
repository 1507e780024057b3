package org.noisewise.testing;

import java.io.ByteArrayOutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.Set;

/**
 * Minimal editing of explicit-VR little-endian DICOM files for tests: insert or replace short
 * string elements (such as DS and IS values). Elements are kept in ascending tag order.
 */
public final class DicomEdit {

    private static final Set<String> LONG_VR = Set.of("OB", "OW", "OF", "SQ", "UT", "UN");

    private DicomEdit() {
    }

    /** Returns a copy with a binary element of unsigned shorts (VR US), e.g. the acquisition matrix 0018,1310. */
    public static byte[] setUs(byte[] dicom, int group, int element, int... values) {
        ByteBuffer v = ByteBuffer.allocate(2 * values.length).order(ByteOrder.LITTLE_ENDIAN);
        for (int x : values) {
            v.putShort((short) x);
        }
        return put(dicom, group, element, "US", v.array());
    }

    /** Returns a copy with a binary element of doubles (VR FD), e.g. a parallel reduction factor. */
    public static byte[] setFd(byte[] dicom, int group, int element, double value) {
        return put(dicom, group, element, "FD", ByteBuffer.allocate(8).order(ByteOrder.LITTLE_ENDIAN).putDouble(value)
                .array());
    }

    /** Returns a copy of {@code dicom} with element (group, element) set to {@code value} with VR {@code vr}. */
    public static byte[] set(byte[] dicom, int group, int element, String vr, String value) {
        String v = value.length() % 2 == 1 ? value + " " : value;
        return put(dicom, group, element, vr, v.getBytes(StandardCharsets.US_ASCII));
    }

    private static byte[] put(byte[] dicom, int group, int element, String vr, byte[] v) {
        ByteBuffer b = ByteBuffer.wrap(dicom).order(ByteOrder.LITTLE_ENDIAN);
        int pos = 132;
        long target = ((long) group << 16) | element;
        while (pos < dicom.length) {
            int g = b.getShort(pos) & 0xffff;
            int e = b.getShort(pos + 2) & 0xffff;
            String elVr = new String(dicom, pos + 4, 2, StandardCharsets.US_ASCII);
            int header;
            long len;
            if (LONG_VR.contains(elVr)) {
                header = 12;
                len = b.getInt(pos + 8) & 0xffffffffL;
            } else {
                header = 8;
                len = b.getShort(pos + 6) & 0xffff;
            }
            long tag = ((long) g << 16) | e;
            if (tag == target) {
                return splice(dicom, pos, (int) (pos + header + len), element(group, element, vr, v));
            }
            if (tag > target && g != 2) {
                return splice(dicom, pos, pos, element(group, element, vr, v));
            }
            if (len == 0xffffffffL) {
                throw new IllegalArgumentException("undefined-length element before the target: not supported");
            }
            pos += header + (int) len;
        }
        throw new IllegalArgumentException("no place found for the element");
    }

    private static byte[] element(int group, int element, String vr, byte[] text) {
        ByteBuffer b = ByteBuffer.allocate(8 + text.length).order(ByteOrder.LITTLE_ENDIAN);
        b.putShort((short) group).putShort((short) element);
        b.put(vr.getBytes(StandardCharsets.US_ASCII)).putShort((short) text.length).put(text);
        return b.array();
    }

    private static byte[] splice(byte[] src, int from, int to, byte[] insert) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.write(src, 0, from);
        out.write(insert, 0, insert.length);
        out.write(src, to, src.length - to);
        return out.toByteArray();
    }
}
