package org.noisewise.io;

import ij.ImagePlus;
import ij.io.FileInfo;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.noisewise.estimate.InputException;

/**
 * Refuses files that cannot be read whole, before a wrong number is measured from them: compressed
 * DICOM transfer syntaxes ImageJ cannot decode (named, with what to do), and image files whose pixel
 * data end before the header says they do (ImageJ would read the missing part as zeros).
 */
public final class FileChecks {

    /** Compressed DICOM transfer syntaxes by UID (DICOM PS3.5 annex A). */
    static final Map<String, String> COMPRESSED = Map.ofEntries(
            Map.entry("1.2.840.10008.1.2.5", "RLE-compressed"),
            Map.entry("1.2.840.10008.1.2.1.99", "deflate-compressed"),
            Map.entry("1.2.840.10008.1.2.4.50", "JPEG (baseline) compressed"),
            Map.entry("1.2.840.10008.1.2.4.51", "JPEG (extended) compressed"),
            Map.entry("1.2.840.10008.1.2.4.57", "JPEG lossless compressed"),
            Map.entry("1.2.840.10008.1.2.4.70", "JPEG lossless compressed"),
            Map.entry("1.2.840.10008.1.2.4.80", "JPEG-LS lossless compressed"),
            Map.entry("1.2.840.10008.1.2.4.81", "JPEG-LS compressed"),
            Map.entry("1.2.840.10008.1.2.4.90", "JPEG 2000 lossless compressed"),
            Map.entry("1.2.840.10008.1.2.4.91", "JPEG 2000 compressed"),
            Map.entry("1.2.840.10008.1.2.4.100", "MPEG-2 compressed"),
            Map.entry("1.2.840.10008.1.2.4.201", "HTJ2K compressed"));

    private FileChecks() {
    }

    /** The DICOM transfer syntax UID (0002,0010) of a file with the DICOM preamble, or null. */
    static String transferSyntax(Path f) {
        try (InputStream in = Files.newInputStream(f)) {
            byte[] head = in.readNBytes(132 + 8192);
            if (head.length < 140 || head[128] != 'D' || head[129] != 'I' || head[130] != 'C' || head[131] != 'M') {
                return null;
            }
            // the file meta group is always explicit VR little endian (PS3.10 7.1)
            ByteBuffer b = ByteBuffer.wrap(head).order(ByteOrder.LITTLE_ENDIAN);
            int pos = 132;
            while (pos + 8 <= head.length) {
                int group = b.getShort(pos) & 0xffff;
                int element = b.getShort(pos + 2) & 0xffff;
                if (group != 2) {
                    return null;
                }
                String vr = new String(head, pos + 4, 2, StandardCharsets.US_ASCII);
                int header = 8;
                long len;
                if (vr.equals("OB") || vr.equals("OW") || vr.equals("SQ") || vr.equals("UN") || vr.equals("UT")) {
                    if (pos + 12 > head.length) {
                        return null;
                    }
                    len = b.getInt(pos + 8) & 0xffffffffL;
                    header = 12;
                } else {
                    len = b.getShort(pos + 6) & 0xffff;
                }
                if (element == 0x0010) {
                    int end = (int) Math.min(head.length, pos + header + len);
                    return new String(head, pos + header, end - pos - header, StandardCharsets.US_ASCII)
                            .replace("\0", "").trim();
                }
                pos += header + (int) len;
            }
        } catch (IOException e) {
            return null;
        }
        return null;
    }

    /** Refuses a DICOM file whose pixel data are compressed in a way ImageJ cannot decode. */
    public static void requireDecodableDicom(Path f) throws InputException {
        String uid = transferSyntax(f);
        String kind = uid == null ? null : COMPRESSED.get(uid);
        if (kind != null) {
            throw new InputException("'" + f + "' holds " + kind + " DICOM pixel data (transfer syntax " + uid
                    + "), which ImageJ cannot decode: decompress it first, for example with DCMTK's dcmdjpeg, dcmdrle or "
                    + "dcmdjp2k, or gdcmconv --raw, then measure the uncompressed copy");
        }
    }

    /**
     * Refuses an opened image whose file is shorter than its header describes: the pixel data of a
     * truncated file would be read as zeros.
     */
    public static void requireWhole(Path f, ImagePlus imp) throws InputException {
        FileInfo fi = imp.getOriginalFileInfo();
        if (fi == null) {
            return;
        }
        long size;
        try {
            size = Files.size(f);
        } catch (IOException e) {
            return;
        }
        long needed;
        if (fi.stripOffsets != null && fi.stripLengths != null && fi.stripOffsets.length == fi.stripLengths.length
                && fi.stripOffsets.length > 0) {
            needed = 0;
            for (int i = 0; i < fi.stripOffsets.length; i++) {
                needed = Math.max(needed, (fi.stripOffsets[i] & 0xffffffffL) + (fi.stripLengths[i] & 0xffffffffL));
            }
        } else if (fi.compression <= FileInfo.COMPRESSION_NONE) {
            long plane = (long) fi.width * fi.height * Math.max(1, fi.getBytesPerPixel());
            int images = Math.max(1, fi.nImages);
            needed = fi.getOffset() + plane * images + (long) fi.gapBetweenImages * (images - 1);
        } else {
            return;
        }
        if (needed > size) {
            throw new InputException(String.format(java.util.Locale.ROOT, "'%s' is truncated: its header describes "
                    + "%d bytes of pixel data ending at byte %d, but the file ends at byte %d; the missing part would be "
                    + "read as zeros. Copy or export the file again", f, needed - fi.getOffset(), needed, size));
        }
    }
}
