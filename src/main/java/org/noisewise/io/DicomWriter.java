package org.noisewise.io;

import java.io.ByteArrayOutputStream;
import java.math.BigInteger;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * Writes DICOM Part 10 files the way scanners store them, for the bundled sample series and the
 * tests of the readers: a 128-byte preamble, "DICM", the file meta group (explicit VR little
 * endian, PS3.10 7.1), then the data set in ascending tag order in explicit VR little endian
 * (1.2.840.10008.1.2.1) or implicit VR little endian (1.2.840.10008.1.2), with sequences of
 * defined or undefined length (both are allowed by PS3.5 7.5). Uncompressed pixel data only.
 */
public final class DicomWriter {

    /** Explicit VR little endian. */
    public static final String EXPLICIT_LE = "1.2.840.10008.1.2.1";
    /** Implicit VR little endian. */
    public static final String IMPLICIT_LE = "1.2.840.10008.1.2";
    /** MR Image Storage (one image per file). */
    public static final String MR_IMAGE = "1.2.840.10008.5.1.4.1.1.4";
    /** Enhanced MR Image Storage (one multi-frame file with functional groups). */
    public static final String ENHANCED_MR_IMAGE = "1.2.840.10008.5.1.4.1.1.4.1";

    private DicomWriter() {
    }

    /** A data set (or a sequence item): elements by tag, written in ascending order. */
    public static final class Dataset {
        private final TreeMap<Integer, Element> elements = new TreeMap<>();

        /** A text element (AE, CS, DA, DS, IS, LO, PN, SH, TM, UI, ...), padded to even length as PS3.5 6.2 asks. */
        public Dataset text(int tag, String vr, String value) {
            byte[] b = value.getBytes(StandardCharsets.US_ASCII);
            if (b.length % 2 == 1) {
                byte[] p = new byte[b.length + 1];
                System.arraycopy(b, 0, p, 0, b.length);
                p[b.length] = vr.equals("UI") ? 0 : (byte) ' ';
                b = p;
            }
            elements.put(tag, new Element(vr, b, null));
            return this;
        }

        /** A decimal string of one or more numbers (backslash-separated), written with up to 16 characters each. */
        public Dataset decimals(int tag, double... values) {
            StringBuilder s = new StringBuilder();
            for (int i = 0; i < values.length; i++) {
                if (i > 0) {
                    s.append('\\');
                }
                s.append(decimal(values[i]));
            }
            return text(tag, "DS", s.toString());
        }

        /** An integer string. */
        public Dataset integer(int tag, long value) {
            return text(tag, "IS", Long.toString(value));
        }

        /** Unsigned shorts (US). */
        public Dataset us(int tag, int... values) {
            ByteBuffer b = ByteBuffer.allocate(2 * values.length).order(ByteOrder.LITTLE_ENDIAN);
            for (int v : values) {
                b.putShort((short) v);
            }
            elements.put(tag, new Element("US", b.array(), null));
            return this;
        }

        /** Unsigned longs (UL). */
        public Dataset ul(int tag, long... values) {
            ByteBuffer b = ByteBuffer.allocate(4 * values.length).order(ByteOrder.LITTLE_ENDIAN);
            for (long v : values) {
                b.putInt((int) v);
            }
            elements.put(tag, new Element("UL", b.array(), null));
            return this;
        }

        /** Doubles (FD). */
        public Dataset fd(int tag, double... values) {
            ByteBuffer b = ByteBuffer.allocate(8 * values.length).order(ByteOrder.LITTLE_ENDIAN);
            for (double v : values) {
                b.putDouble(v);
            }
            elements.put(tag, new Element("FD", b.array(), null));
            return this;
        }

        /** A sequence of items. */
        public Dataset sequence(int tag, Dataset... items) {
            elements.put(tag, new Element("SQ", null, List.of(items)));
            return this;
        }

        /** 16-bit pixel data (OW), frames one after another. */
        public Dataset pixels(short[]... frames) {
            int n = 0;
            for (short[] f : frames) {
                n += f.length;
            }
            ByteBuffer b = ByteBuffer.allocate(2 * n).order(ByteOrder.LITTLE_ENDIAN);
            for (short[] f : frames) {
                for (short v : f) {
                    b.putShort(v);
                }
            }
            elements.put(0x7FE00010, new Element("OW", b.array(), null));
            return this;
        }

        /** A shallow copy (the same elements). */
        public Dataset copy() {
            Dataset d = new Dataset();
            d.elements.putAll(elements);
            return d;
        }

        /** Removes an element. */
        public Dataset remove(int tag) {
            elements.remove(tag);
            return this;
        }

        Map<Integer, Element> elements() {
            return elements;
        }
    }

    private record Element(String vr, byte[] value, List<Dataset> items) {
    }

    /**
     * The file's bytes: preamble, meta group (SOP class and instance from the data set's 0008,0016 and
     * 0008,0018) and the data set in {@code transferSyntax}.
     *
     * @param undefinedLengths write sequences and items with undefined length and delimiters
     */
    public static byte[] encode(Dataset ds, String transferSyntax, boolean undefinedLengths) {
        boolean explicit = EXPLICIT_LE.equals(transferSyntax);
        if (!explicit && !IMPLICIT_LE.equals(transferSyntax)) {
            throw new IllegalArgumentException("only explicit and implicit VR little endian are written");
        }
        Dataset meta = new Dataset();
        meta.elements.put(0x00020001, new Element("OB", new byte[] {0, 1}, null));
        meta.text(0x00020002, "UI", textOf(ds, 0x00080016));
        meta.text(0x00020003, "UI", textOf(ds, 0x00080018));
        meta.text(0x00020010, "UI", transferSyntax);
        meta.text(0x00020012, "UI", uid("noisewise implementation"));
        meta.text(0x00020013, "SH", "NOISEWISE");
        byte[] metaBody = body(meta, true, false);
        ByteArrayOutputStream out = new ByteArrayOutputStream(metaBody.length + 1024);
        out.writeBytes(new byte[128]);
        out.writeBytes("DICM".getBytes(StandardCharsets.US_ASCII));
        ByteBuffer groupLength = ByteBuffer.allocate(12).order(ByteOrder.LITTLE_ENDIAN);
        groupLength.putShort((short) 2).putShort((short) 0).put("UL".getBytes(StandardCharsets.US_ASCII))
                .putShort((short) 4).putInt(metaBody.length);
        out.writeBytes(groupLength.array());
        out.writeBytes(metaBody);
        out.writeBytes(body(ds, explicit, undefinedLengths));
        return out.toByteArray();
    }

    private static String textOf(Dataset ds, int tag) {
        Element e = ds.elements.get(tag);
        if (e == null || e.value() == null) {
            throw new IllegalArgumentException(String.format("the data set needs element %08X", tag));
        }
        return new String(e.value(), StandardCharsets.US_ASCII).replace("\0", "").trim();
    }

    private static byte[] body(Dataset ds, boolean explicit, boolean undefined) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        for (Map.Entry<Integer, Element> en : ds.elements.entrySet()) {
            int tag = en.getKey();
            Element e = en.getValue();
            byte[] value = e.items() == null ? e.value() : items(e.items(), explicit, undefined);
            boolean undefinedHere = e.items() != null && undefined;
            ByteBuffer h = ByteBuffer.allocate(12).order(ByteOrder.LITTLE_ENDIAN);
            h.putShort((short) (tag >>> 16)).putShort((short) tag);
            if (explicit) {
                h.put(e.vr().getBytes(StandardCharsets.US_ASCII));
                if (longForm(e.vr())) {
                    h.putShort((short) 0).putInt(undefinedHere ? -1 : value.length);
                } else {
                    h.putShort((short) value.length);
                }
            } else {
                h.putInt(undefinedHere ? -1 : value.length);
            }
            out.write(h.array(), 0, h.position());
            out.writeBytes(value);
            if (undefinedHere) {
                out.writeBytes(delimiter(0xFFFEE0DD));
            }
        }
        return out.toByteArray();
    }

    private static byte[] items(List<Dataset> items, boolean explicit, boolean undefined) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        for (Dataset item : items) {
            byte[] b = body(item, explicit, undefined);
            ByteBuffer h = ByteBuffer.allocate(8).order(ByteOrder.LITTLE_ENDIAN);
            h.putShort((short) 0xFFFE).putShort((short) 0xE000).putInt(undefined ? -1 : b.length);
            out.writeBytes(h.array());
            out.writeBytes(b);
            if (undefined) {
                out.writeBytes(delimiter(0xFFFEE00D));
            }
        }
        return out.toByteArray();
    }

    private static byte[] delimiter(int tag) {
        return ByteBuffer.allocate(8).order(ByteOrder.LITTLE_ENDIAN).putShort((short) (tag >>> 16))
                .putShort((short) tag).putInt(0).array();
    }

    private static boolean longForm(String vr) {
        return switch (vr) {
            case "OB", "OD", "OF", "OL", "OV", "OW", "SQ", "SV", "UC", "UN", "UR", "UT", "UV" -> true;
            default -> false;
        };
    }

    /** A decimal string value (at most 16 characters, PS3.5 6.2). */
    static String decimal(double v) {
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        for (int digits = 10; digits >= 1; digits--) {
            String s = new java.math.BigDecimal(v).round(new java.math.MathContext(digits)).stripTrailingZeros()
                    .toPlainString();
            if (s.length() <= 16) {
                return s;
            }
        }
        return String.format(java.util.Locale.ROOT, "%.6g", v);
    }

    /** A deterministic UID under the UUID-derived root 2.25 (PS3.5 B.2) from a name. */
    public static String uid(String name) {
        try {
            byte[] h = MessageDigest.getInstance("SHA-256").digest(name.getBytes(StandardCharsets.UTF_8));
            byte[] u = new byte[16];
            System.arraycopy(h, 0, u, 0, 16);
            u[6] = (byte) ((u[6] & 0x0f) | 0x50); // a name-based UUID layout
            u[8] = (byte) ((u[8] & 0x3f) | 0x80);
            return "2.25." + new BigInteger(1, u);
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }
}
