package org.noisewise.io;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.noisewise.estimate.InputException;

/**
 * One DICOM file's header, read in a single pass: the facts that place each of its frames in a
 * series (DICOM PS3.3 C.7.6.2 Image Plane, C.7.6.16 multi-frame functional groups) and where its
 * pixel data lie, with the frames' stored values when asked for. Explicit and implicit VR little
 * endian and explicit VR big endian (PS3.5 7.1, A.1-A.3), with or without the Part 10 preamble;
 * sequences and items of defined and undefined length (PS3.5 7.5). Everything else in the header
 * is skipped by its length. ImageJ's own reader gives the header text ({@code Info}) shown to
 * users; this reader gives what ImageJ's does not: per-frame positions, temporal indices and rescale.
 */
public final class DicomFile {

    /** Files up to this size are read into a per-thread buffer; larger ones are mapped. */
    private static final int BUFFERED = 4 << 20;
    private static final ThreadLocal<byte[]> BUFFER = ThreadLocal.withInitial(() -> new byte[64 << 10]);

    private static final int ITEM = 0xFFFEE000;
    private static final int ITEM_END = 0xFFFEE00D;
    private static final int SEQUENCE_END = 0xFFFEE0DD;
    private static final int PIXEL_DATA = 0x7FE00010;
    private static final int PER_FRAME = 0x52009230;
    private static final int SHARED = 0x52009229;
    /**
     * Siemens' private Number of Images in Mosaic, element 0A of the block (0019,0010) = "SIEMENS MR HEADER"
     * (an unsigned short; in implicit VR files its type comes from here).
     */
    private static final int MOSAIC_SLICES = 0x0019100A;

    /** Binary value representations of the tags read here, for implicit VR files (PS3.6). */
    private static final Map<Integer, String> BINARY = Map.ofEntries(
            Map.entry(0x00280002, "US"), Map.entry(0x00280010, "US"), Map.entry(0x00280011, "US"),
            Map.entry(0x00280100, "US"), Map.entry(0x00280101, "US"), Map.entry(0x00280103, "US"),
            Map.entry(0x00209057, "UL"), Map.entry(0x00209128, "UL"), Map.entry(0x00209157, "UL"),
            Map.entry(0x00189082, "FD"), Map.entry(MOSAIC_SLICES, "US"));
    /** Sequences read into (the rest are skipped whole). */
    private static final Set<Integer> SEQUENCES = Set.of(SHARED, PER_FRAME, 0x00209111, 0x00209113, 0x00209116,
            0x00289110, 0x00289145, 0x00189114);
    /** Top-level elements kept (the rest are skipped by their length). */
    private static final Set<Integer> KEPT = Set.of(0x00020002, 0x00020010, 0x00080008, 0x00080016, 0x00080018,
            0x0020000E, 0x00190010, MOSAIC_SLICES,
            0x00200032, 0x00200037, 0x00200100, 0x00200105, 0x00200012, 0x00200013, 0x00180086, 0x00180081,
            0x00280002, 0x00280008, 0x00280010, 0x00280011, 0x00280100, 0x00280103, 0x00281052, 0x00281053,
            0x00280030, 0x00180050, 0x00180088);
    private static final Set<String> BINARY_VR = Set.of("US", "SS", "UL", "SL", "FD", "FL");
    private static final Set<String> LONG_VR = Set.of("OB", "OD", "OF", "OL", "OV", "OW", "SQ", "SV", "UC", "UN",
            "UR", "UT", "UV");
    /**
     * The value representations of PS3.5 6.2 by their two capital letters ({@code 26 * first + second}),
     * with whether each has the long (32-bit) length, so reading one allocates and hashes nothing.
     */
    private static final String[] VRS = new String[26 * 26];
    private static final boolean[] LONG = new boolean[26 * 26];
    /** {@link #KEPT} and {@link #SEQUENCES} as sorted tags, looked up without boxing. */
    private static final int[] KEPT_TAGS;
    private static final int[] SEQUENCE_TAGS;

    static {
        for (String vr : new String[] {"AE", "AS", "AT", "CS", "DA", "DS", "DT", "FD", "FL", "IS", "LO", "LT", "OB",
            "OD", "OF", "OL", "OV", "OW", "PN", "SH", "SL", "SQ", "SS", "ST", "SV", "TM", "UC", "UI", "UL", "UN", "UR",
            "US", "UT", "UV"}) {
            int code = 26 * (vr.charAt(0) - 'A') + (vr.charAt(1) - 'A');
            VRS[code] = vr;
            LONG[code] = LONG_VR.contains(vr);
        }
        KEPT_TAGS = sorted(KEPT);
        SEQUENCE_TAGS = sorted(SEQUENCES);
    }

    private static int[] sorted(Set<Integer> tags) {
        int[] out = tags.stream().mapToInt(Integer::intValue).sorted().toArray();
        return out;
    }

    private static boolean in(int[] sortedTags, int tag) {
        return java.util.Arrays.binarySearch(sortedTags, tag) >= 0;
    }

    /** Where one frame sits and what its header says of it. */
    public record Frame(int index, double[] position, double[] orientation, Integer temporalIndex,
                        Integer stackPosition, Double echoTime, double slope, double intercept) {
    }

    private final Path path;
    private final String transferSyntax;
    private final String sopClass;
    private final String sopInstance;
    private final String seriesUid;
    private final int rows;
    private final int columns;
    private final int bitsAllocated;
    private final boolean signed;
    private final Double instance;
    private final Integer acquisition;
    private final Integer temporal;
    private final Integer statedRepeats;
    private final Double echoNumber;
    private final double[] pixelSpacing;
    private final Double thickness;
    private final Double spacingBetween;
    private final boolean enhanced;
    private final boolean pixelData;
    private final boolean mosaicType;
    private final Integer mosaicSlices;
    private final List<Frame> frames;
    private final List<Object> pixels;

    private DicomFile(Path path, Map<Integer, Object> top, String transferSyntax, List<Frame> frames,
                      List<Object> pixels, boolean pixelData) {
        this.path = path;
        this.pixelData = pixelData;
        this.transferSyntax = transferSyntax;
        String sop = text(top.get(0x00080016));
        this.sopClass = sop != null ? sop : text(top.get(0x00020002));
        this.sopInstance = text(top.get(0x00080018));
        this.seriesUid = text(top.get(0x0020000E));
        this.rows = orDefault(integer(top.get(0x00280010)), 0);
        this.columns = orDefault(integer(top.get(0x00280011)), 0);
        this.bitsAllocated = orDefault(integer(top.get(0x00280100)), 16);
        this.signed = orDefault(integer(top.get(0x00280103)), 0) == 1;
        this.instance = number(top.get(0x00200013));
        this.acquisition = integer(top.get(0x00200012));
        this.temporal = integer(top.get(0x00200100));
        this.statedRepeats = integer(top.get(0x00200105));
        this.echoNumber = number(top.get(0x00180086));
        double[] ps = numbers(top.get(0x00280030));
        this.pixelSpacing = valid(ps != null ? ps : numbers(get(top, SHARED, 0x00289110, 0x00280030)), 2);
        Double t = number(top.get(0x00180050));
        this.thickness = t != null ? t : number(get(top, SHARED, 0x00289110, 0x00180050));
        Double sb = number(top.get(0x00180088));
        this.spacingBetween = sb != null ? sb : number(get(top, SHARED, 0x00289110, 0x00180088));
        this.enhanced = top.get(PER_FRAME) instanceof List<?> l && !l.isEmpty();
        this.mosaicType = Mosaic.named(text(top.get(0x00080008)));
        String creator = text(top.get(0x00190010));
        this.mosaicSlices = creator != null && creator.trim().equals("SIEMENS MR HEADER")
                ? unsignedShort(top.get(MOSAIC_SLICES)) : null;
        this.frames = List.copyOf(frames);
        this.pixels = pixels;
    }

    /** A leaf value: the bytes of one element. */
    private record Value(String vr, byte[] bytes, boolean bigEndian) {
        String text() {
            int end = bytes.length;
            while (end > 0 && (bytes[end - 1] == ' ' || bytes[end - 1] == 0)) {
                end--;
            }
            int start = 0;
            while (start < end && bytes[start] == ' ') {
                start++;
            }
            return new String(bytes, start, end - start, StandardCharsets.ISO_8859_1);
        }

        double[] numbers() {
            if (!BINARY_VR.contains(vr)) {
                return decimals();
            }
            ByteBuffer b = ByteBuffer.wrap(bytes).order(bigEndian ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
            switch (vr) {
                case "US": {
                    double[] v = new double[bytes.length / 2];
                    for (int i = 0; i < v.length; i++) {
                        v[i] = b.getShort(2 * i) & 0xffff;
                    }
                    return v;
                }
                case "SS": {
                    double[] v = new double[bytes.length / 2];
                    for (int i = 0; i < v.length; i++) {
                        v[i] = b.getShort(2 * i);
                    }
                    return v;
                }
                case "UL": {
                    double[] v = new double[bytes.length / 4];
                    for (int i = 0; i < v.length; i++) {
                        v[i] = b.getInt(4 * i) & 0xffffffffL;
                    }
                    return v;
                }
                case "SL": {
                    double[] v = new double[bytes.length / 4];
                    for (int i = 0; i < v.length; i++) {
                        v[i] = b.getInt(4 * i);
                    }
                    return v;
                }
                case "FD": {
                    double[] v = new double[bytes.length / 8];
                    for (int i = 0; i < v.length; i++) {
                        v[i] = b.getDouble(8 * i);
                    }
                    return v;
                }
                case "FL": {
                    double[] v = new double[bytes.length / 4];
                    for (int i = 0; i < v.length; i++) {
                        v[i] = b.getFloat(4 * i);
                    }
                    return v;
                }
                default:
                    return decimals();
            }
        }

        /** The backslash-separated decimal strings of a DS or IS value (PS3.5 6.2), NaN where one is not a number. */
        private double[] decimals() {
            String t = text();
            if (t.isEmpty()) {
                return new double[0];
            }
            String[] p = t.split("\\\\");
            double[] v = new double[p.length];
            for (int i = 0; i < p.length; i++) {
                try {
                    v[i] = Double.parseDouble(p[i].trim());
                } catch (NumberFormatException e) {
                    v[i] = Double.NaN;
                }
            }
            return v;
        }
    }

    /**
     * Reads a file's header (and, when {@code withPixels}, every frame's stored values).
     *
     * @return null when the file is not DICOM (no preamble and no plausible first element)
     */
    public static DicomFile read(Path path, boolean withPixels) throws InputException {
        try (FileChannel ch = FileChannel.open(path, StandardOpenOption.READ)) {
            long size = ch.size();
            if (size > PEEK && !withPixels) {
                // a header-only read of a large file: its first PEEK bytes tell one that is not DICOM (a TIFF
                // beside the series), and hold the whole header of most single-frame files
                ByteBuffer head = readFully(ch, PEEK);
                if (syntaxOf(head) == null) {
                    return null;
                }
                try {
                    return parse(path, head, false, true);
                } catch (InputException | Incomplete e) {
                    // the header goes on past these bytes (or is damaged): read the whole file below
                }
                ch.position(0);
            }
            ByteBuffer b = size <= BUFFERED ? readFully(ch, (int) size) : ch.map(FileChannel.MapMode.READ_ONLY, 0, size);
            return parse(path, b, withPixels, false);
        } catch (IOException e) {
            throw new InputException("cannot read '" + path + "': " + e.getMessage() + "; check that it exists and "
                    + "can be read");
        }
    }

    /** The next {@code length} bytes of {@code ch} (fewer at its end), in this thread's buffer. */
    private static ByteBuffer readFully(FileChannel ch, int length) throws IOException {
        byte[] buf = BUFFER.get();
        if (buf.length < length) {
            buf = new byte[(int) Math.max(length, buf.length * 2L)];
            BUFFER.set(buf);
        }
        ByteBuffer w = ByteBuffer.wrap(buf, 0, length);
        while (w.hasRemaining() && ch.read(w) >= 0) {
            // until full or at the end of the file
        }
        return ByteBuffer.wrap(buf, 0, w.position()).slice();
    }

    /**
     * A header-only read of a larger file first reads this far: enough to tell whether it is DICOM and,
     * usually, to reach the pixel data.
     */
    private static final int PEEK = 64 << 10;

    /** A header-only parse of a file's first bytes that ended before the pixel data (no stack trace). */
    private static final class Incomplete extends RuntimeException {
        private static final long serialVersionUID = 1L;
        static final Incomplete INSTANCE = new Incomplete();

        private Incomplete() {
            super(null, null, false, false);
        }
    }

    /** What {@link #syntaxOf} says of a file with the preamble: its transfer syntax is in the meta group. */
    private static final String PREAMBLE = "preamble";

    /**
     * How a file starts (little-endian buffer from byte 0): {@link #PREAMBLE} for "DICM" at byte 128,
     * else the transfer syntax its first element implies (a file without the preamble), or null when
     * it is not DICOM.
     */
    private static String syntaxOf(ByteBuffer b) {
        int n = b.limit();
        if (n >= 132 && b.get(128) == 'D' && b.get(129) == 'I' && b.get(130) == 'C' && b.get(131) == 'M') {
            return PREAMBLE;
        }
        if (n < 8) {
            return null;
        }
        // the first element's group read as little endian, whatever order the buffer was given in
        int g = (b.get(0) & 0xff) | (b.get(1) & 0xff) << 8;
        if (g == 0x0800) {
            return "1.2.840.10008.1.2.2";
        }
        if (g == 0x0008 || g == 0x0002) {
            return Character.isUpperCase(b.get(4)) && Character.isUpperCase(b.get(5)) ? DicomWriter.EXPLICIT_LE
                    : DicomWriter.IMPLICIT_LE;
        }
        return null;
    }

    /**
     * Parses a file's bytes; with {@code prefix}, {@code b} holds only the file's first bytes, and a header
     * that does not reach the pixel data within them throws {@link Incomplete}.
     */
    private static DicomFile parse(Path path, ByteBuffer b, boolean withPixels, boolean prefix)
            throws InputException {
        b.order(ByteOrder.LITTLE_ENDIAN);
        int n = b.limit();
        int pos;
        String syntax = syntaxOf(b);
        if (syntax == null) {
            return null;
        }
        Map<Integer, Object> top = new HashMap<>();
        if (PREAMBLE.equals(syntax)) {
            pos = 132;
            // the file meta group: always explicit VR little endian (PS3.10 7.1)
            Parser meta = new Parser(b, true, false, path);
            while (pos + 8 <= n && (b.getShort(pos) & 0xffff) == 0x0002) {
                pos = meta.element(pos, top, 0);
            }
            Object ts = top.get(0x00020010);
            syntax = ts instanceof Value v ? v.text() : DicomWriter.EXPLICIT_LE;
        } else {
            pos = 0;
        }
        String compressed = FileChecks.COMPRESSED.get(syntax);
        if (compressed != null) {
            throw new InputException("'" + path + "' holds " + compressed + " DICOM pixel data (transfer syntax " + syntax
                    + "), which Noisewise cannot decode: decompress it first, for example with DCMTK's dcmdjpeg, dcmdrle "
                    + "or dcmdjp2k, or gdcmconv --raw, then measure the uncompressed copy");
        }
        boolean big = syntax.equals("1.2.840.10008.1.2.2");
        boolean explicit = !syntax.equals(DicomWriter.IMPLICIT_LE);
        Parser p = new Parser(b, explicit, big, path);
        long pixelOffset = -1;
        long pixelLength = 0;
        while (pos + 8 <= n) {
            int tag = p.tag(pos);
            if (tag == PIXEL_DATA) {
                Parser.Header h = p.header(pos);
                if (h.length() < 0) {
                    throw new InputException("'" + path + "' holds encapsulated (compressed) pixel data, which Noisewise "
                            + "cannot decode: export the series uncompressed");
                }
                pixelOffset = pos + h.size();
                pixelLength = h.length();
                break;
            }
            pos = p.element(pos, top, 0);
        }
        if (prefix && pixelOffset < 0) {
            throw Incomplete.INSTANCE;
        }
        List<Frame> frames = frameFacts(top);
        List<Object> pixels = null;
        if (withPixels && pixelOffset >= 0) {
            pixels = framePixels(path, top, b, frames.size(), pixelOffset, pixelLength, big);
        }
        return new DicomFile(path, top, syntax, frames, pixels, pixelOffset >= 0);
    }

    /** Walks elements, keeping leaves and the sequences named in {@link #SEQUENCES}. */
    private static final class Parser {
        private final ByteBuffer b;
        private final boolean explicit;
        private final boolean big;
        private final Path path;

        Parser(ByteBuffer b, boolean explicit, boolean big, Path path) {
            this.b = b.duplicate().order(big ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
            this.explicit = explicit;
            this.big = big;
            this.path = path;
        }

        record Header(String vr, long length, int size) {
        }

        int tag(int pos) {
            return ((b.getShort(pos) & 0xffff) << 16) | (b.getShort(pos + 2) & 0xffff);
        }

        Header header(int pos) throws InputException {
            int tag = tag(pos);
            if (tag == ITEM || tag == ITEM_END || tag == SEQUENCE_END) {
                return new Header(null, signedLength(b.getInt(pos + 4)), 8);
            }
            if (!explicit) {
                String vr = BINARY.get(tag);
                return new Header(vr, signedLength(b.getInt(pos + 4)), 8);
            }
            need(pos + 8);
            int c0 = b.get(pos + 4) - 'A';
            int c1 = b.get(pos + 5) - 'A';
            int code = c0 >= 0 && c0 < 26 && c1 >= 0 && c1 < 26 ? 26 * c0 + c1 : -1;
            String vr = code >= 0 ? VRS[code] : null;
            boolean longLength;
            if (vr != null) {
                longLength = LONG[code];
            } else {
                vr = new String(new byte[] {b.get(pos + 4), b.get(pos + 5)}, StandardCharsets.US_ASCII);
                longLength = LONG_VR.contains(vr);
            }
            if (longLength) {
                need(pos + 12);
                return new Header(vr, signedLength(b.getInt(pos + 8)), 12);
            }
            return new Header(vr, b.getShort(pos + 6) & 0xffff, 8);
        }

        private static long signedLength(int raw) {
            return raw == -1 ? -1 : raw & 0xffffffffL;
        }

        private void need(int end) throws InputException {
            if (end > b.limit()) {
                throw truncated();
            }
        }

        InputException truncated() {
            return new InputException("'" + path + "' is truncated or damaged: its DICOM header ends before an element "
                    + "it describes; copy or export the file again");
        }

        /** Reads the element at {@code pos} into {@code into}; returns the position after it. */
        int element(int pos, Map<Integer, Object> into, int depth) throws InputException {
            if (depth > 16) {
                throw new InputException("'" + path + "' nests DICOM sequences more than 16 deep: it is damaged");
            }
            int tag = tag(pos);
            Header h = header(pos);
            int start = pos + h.size();
            boolean sequence = "SQ".equals(h.vr()) || !explicit && in(SEQUENCE_TAGS, tag)
                    || h.length() < 0 && (h.vr() == null || "UN".equals(h.vr()));
            if (sequence && h.length() >= 0 && !in(SEQUENCE_TAGS, tag)) {
                if (start + h.length() > b.limit()) {
                    throw truncated();
                }
                return (int) (start + h.length());
            }
            if (sequence) {
                // an undefined-length UN element holds an implicit-VR sequence (PS3.5 6.2.2)
                Parser inner = "UN".equals(h.vr()) ? new Parser(b, false, big, path) : this;
                List<Map<Integer, Object>> items = new ArrayList<>();
                int end = h.length() < 0 ? b.limit() : (int) Math.min(b.limit(), start + h.length());
                if (h.length() >= 0 && start + h.length() > b.limit()) {
                    throw truncated();
                }
                int q = start;
                while (q + 8 <= end) {
                    int t = inner.tag(q);
                    long len = signedLength(b.getInt(q + 4));
                    q += 8;
                    if (t == SEQUENCE_END) {
                        break;
                    }
                    if (t != ITEM) {
                        throw new InputException("'" + path + "' is damaged: a DICOM sequence holds something other "
                                + "than items");
                    }
                    Map<Integer, Object> item = new HashMap<>();
                    int itemEnd = len < 0 ? end : (int) Math.min(end, q + len);
                    while (q + 8 <= itemEnd) {
                        if (inner.tag(q) == ITEM_END) {
                            q += 8;
                            break;
                        }
                        q = inner.element(q, item, depth + 1);
                    }
                    if (len >= 0) {
                        q = itemEnd;
                    }
                    items.add(item);
                }
                if (in(SEQUENCE_TAGS, tag)) {
                    into.put(tag, items);
                }
                return h.length() < 0 ? q : (int) (start + h.length());
            }
            if (h.length() < 0) {
                throw new InputException("'" + path + "' is damaged: an element of undefined length is not a sequence");
            }
            long end = start + h.length();
            if (end > b.limit()) {
                throw truncated();
            }
            if (h.length() <= 1024 && (depth > 0 || in(KEPT_TAGS, tag))) {
                byte[] v = new byte[(int) h.length()];
                b.get(start, v);
                String vr = h.vr() != null ? h.vr() : BINARY.getOrDefault(tag, "TX");
                into.put(tag, new Value(vr, v, big && (tag >>> 16) != 2));
            }
            return (int) end;
        }
    }

    // ---- facts --------------------------------------------------------------------------------------------------

    private static Object get(Map<Integer, Object> m, int... path) {
        Object o = m;
        for (int tag : path) {
            if (o instanceof Map<?, ?> map) {
                o = map.get(tag);
            } else if (o instanceof List<?> list && !list.isEmpty() && list.get(0) instanceof Map<?, ?> first) {
                o = first.get(tag);
            } else {
                return null;
            }
        }
        return o;
    }

    /**
     * A private unsigned short: written as US, or as UN or OB when the file was converted without the
     * private dictionary (two bytes in the file's byte order), or as a decimal string; null otherwise.
     */
    private static Integer unsignedShort(Object o) {
        if (!(o instanceof Value v)) {
            return null;
        }
        if (v.bytes().length == 2 && TWO_BYTES.contains(v.vr())) {
            int lo = v.bytes()[v.bigEndian() ? 1 : 0] & 0xff;
            int hi = v.bytes()[v.bigEndian() ? 0 : 1] & 0xff;
            return hi << 8 | lo;
        }
        if (v.vr().equals("IS") || v.vr().equals("DS")) {
            double[] d = v.numbers();
            return d.length == 1 && d[0] >= 0 && d[0] == Math.rint(d[0]) ? (int) d[0] : null;
        }
        return null;
    }

    /** Value representations under which a private unsigned short may stand as its two bytes. */
    private static final Set<String> TWO_BYTES = Set.of("US", "UN", "OB", "OW", "TX");

    private static String text(Object o) {
        return o instanceof Value v ? v.text() : null;
    }

    private static double[] numbers(Object o) {
        return o instanceof Value v ? v.numbers() : null;
    }

    private static Double number(Object o) {
        double[] v = numbers(o);
        return v == null || v.length == 0 || Double.isNaN(v[0]) ? null : v[0];
    }

    private static Integer integer(Object o) {
        Double d = number(o);
        return d == null ? null : (int) Math.round(d);
    }

    private static List<Frame> frameFacts(Map<Integer, Object> top) {
        Object perFrame = top.get(PER_FRAME);
        double[] orientation = numbers(top.get(0x00200037));
        double[] sharedOrientation = numbers(get(top, SHARED, 0x00209116, 0x00200037));
        double slope = orDefault(number(top.get(0x00281053)), 1.0);
        double intercept = orDefault(number(top.get(0x00281052)), 0.0);
        Double sharedSlope = number(get(top, SHARED, 0x00289145, 0x00281053));
        Double sharedIntercept = number(get(top, SHARED, 0x00289145, 0x00281052));
        Double sharedEcho = number(get(top, SHARED, 0x00189114, 0x00189082));
        int count = Math.max(1, orDefault(integer(top.get(0x00280008)), 1));
        List<Frame> out = new ArrayList<>(count);
        if (perFrame instanceof List<?> items && !items.isEmpty()) {
            for (int i = 0; i < count; i++) {
                Map<?, ?> item = i < items.size() ? (Map<?, ?>) items.get(i) : Map.of();
                @SuppressWarnings("unchecked")
                Map<Integer, Object> m = (Map<Integer, Object>) item;
                double[] pos = numbers(get(m, 0x00209113, 0x00200032));
                double[] ori = numbers(get(m, 0x00209116, 0x00200037));
                Double s = number(get(m, 0x00289145, 0x00281053));
                Double c = number(get(m, 0x00289145, 0x00281052));
                Double te = number(get(m, 0x00189114, 0x00189082));
                out.add(new Frame(i, valid(pos, 3), valid(ori != null ? ori : sharedOrientation != null
                        ? sharedOrientation : orientation, 6), integer(get(m, 0x00209111, 0x00209128)),
                        integer(get(m, 0x00209111, 0x00209057)), te != null ? te : sharedEcho,
                        s != null ? s : sharedSlope != null ? sharedSlope : slope,
                        c != null ? c : sharedIntercept != null ? sharedIntercept : intercept));
            }
            return out;
        }
        double[] pos = count == 1 ? numbers(top.get(0x00200032)) : null;
        for (int i = 0; i < count; i++) {
            out.add(new Frame(i, valid(pos, 3), valid(orientation, 6), null, null, null, slope, intercept));
        }
        return out;
    }

    private static double[] valid(double[] v, int n) {
        if (v == null || v.length != n) {
            return null;
        }
        for (double x : v) {
            if (!Double.isFinite(x)) {
                return null;
            }
        }
        return v;
    }

    private static <T> T orDefault(T v, T d) {
        return v == null ? d : v;
    }

    private static List<Object> framePixels(Path path, Map<Integer, Object> top, ByteBuffer b, int count,
                                            long pixelOffset, long pixelLength, boolean bigEndian)
            throws InputException {
        int rows = orDefault(integer(top.get(0x00280010)), 0);
        int cols = orDefault(integer(top.get(0x00280011)), 0);
        int bits = orDefault(integer(top.get(0x00280100)), 16);
        int spp = orDefault(integer(top.get(0x00280002)), 1);
        if (rows <= 0 || cols <= 0) {
            throw new InputException("'" + path + "' states no image size (Rows 0028,0010 and Columns 0028,0011): it "
                    + "is not an image");
        }
        if (spp != 1) {
            throw new InputException("'" + path + "' is a colour image (" + spp + " samples per pixel): Noisewise "
                    + "measures grayscale magnitude images");
        }
        if (bits != 8 && bits != 16) {
            throw new InputException("'" + path + "' stores " + bits + "-bit pixels: Noisewise reads 8- and 16-bit "
                    + "DICOM" + (bits == 1 ? " (a 1-bit image is a mask or segmentation, not a magnitude image)"
                    : " (export such data as 32-bit TIFF or NIfTI)"));
        }
        int plane = rows * cols;
        long need = (long) plane * (bits / 8) * count;
        if (pixelOffset + need > b.limit() || pixelLength < need) {
            throw new InputException(String.format(java.util.Locale.ROOT, "'%s' is truncated: its header describes "
                    + "%d bytes of pixel data (%d frame%s of %dx%d) ending at byte %d, but the file ends at byte %d; the "
                    + "missing part would be read as zeros. Copy or export the file again", path, need, count,
                    count == 1 ? "" : "s", cols, rows, pixelOffset + need, b.limit()));
        }
        boolean signed = orDefault(integer(top.get(0x00280103)), 0) == 1;
        ByteBuffer d = b.duplicate().order(bigEndian ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
        List<Object> out = new ArrayList<>(count);
        for (int f = 0; f < count; f++) {
            int at = (int) (pixelOffset + (long) f * plane * (bits / 8));
            if (bits == 8) {
                byte[] px = new byte[plane];
                d.get(at, px);
                out.add(px);
            } else {
                short[] px = new short[plane];
                d.position(at);
                d.asShortBuffer().get(px);
                if (signed) {
                    // ImageJ's convention for signed 16-bit data: stored + 32768, undone by the calibration
                    for (int i = 0; i < plane; i++) {
                        px[i] = (short) (px[i] + 32768);
                    }
                }
                out.add(px);
            }
        }
        return out;
    }

    // ---- accessors ----------------------------------------------------------------------------------------------

    public Path path() {
        return path;
    }

    public String transferSyntax() {
        return transferSyntax;
    }

    /** Every frame's placement facts, in the file's order. */
    public List<Frame> frames() {
        return frames;
    }

    /** The frames' stored values (read with {@code withPixels}: 8-bit {@code byte[]} or 16-bit {@code short[]}). */
    public List<Object> pixels() {
        return pixels;
    }

    /**
     * True for a DICOM object that is not an image: no Pixel Data (7FE0,0010) and no image size (Rows,
     * Columns), such as a DICOMDIR, a structured report or a presentation state. (An image file that
     * states its size but lacks its pixels is a damaged image, not this.)
     */
    public boolean notAnImage() {
        return !pixelData && rows == 0 && columns == 0;
    }

    /** True when the file holds pixel data that were read. */
    public boolean hasPixels() {
        return pixels != null;
    }

    public int rows() {
        return rows;
    }

    public int columns() {
        return columns;
    }

    public int bitsAllocated() {
        return bitsAllocated;
    }

    /** Pixel Representation 1: two's complement values (kept as stored + 32768, ImageJ's convention). */
    public boolean signed() {
        return signed;
    }

    /** Series Instance UID (0020,000E), or null. */
    public String seriesUid() {
        return seriesUid;
    }

    /** SOP Class UID (0008,0016, else the meta group's 0002,0002), or null. */
    public String sopClass() {
        return sopClass;
    }

    /** SOP Instance UID (0008,0018), or null. */
    public String sopInstance() {
        return sopInstance;
    }

    /** True when Image Type (0008,0008) names this image a MOSAIC (Siemens' tiled slices). */
    public boolean mosaicType() {
        return mosaicType;
    }

    /** Siemens' Number of Images in Mosaic (0019,100A of the block "SIEMENS MR HEADER"), or null. */
    public Integer mosaicSlices() {
        return mosaicSlices;
    }

    /** True for a multi-frame file with per-frame functional groups (Enhanced MR and the like). */
    public boolean enhanced() {
        return enhanced;
    }

    /** Instance Number (0020,0013), or null. */
    public Double instance() {
        return instance;
    }

    /** Acquisition Number (0020,0012), or null. */
    public Integer acquisition() {
        return acquisition;
    }

    /** Temporal Position Identifier (0020,0100), or null. */
    public Integer temporal() {
        return temporal;
    }

    /** Number of Temporal Positions (0020,0105), or null. */
    public Integer statedRepeats() {
        return statedRepeats;
    }

    /** Echo Numbers (0018,0086), or null. */
    public Double echoNumber() {
        return echoNumber;
    }

    /** Pixel Spacing (between rows, between columns) in mm from the top level or the shared Pixel Measures, or null. */
    public double[] pixelSpacing() {
        return pixelSpacing == null ? null : pixelSpacing.clone();
    }

    /** Slice Thickness (0018,0050), top level or shared Pixel Measures, or null. */
    public Double thickness() {
        return thickness;
    }

    /** Spacing Between Slices (0018,0088), top level or shared Pixel Measures, or null. */
    public Double spacingBetween() {
        return spacingBetween;
    }
}
