package org.noisewise.io;

import ij.gui.Roi;
import ij.io.RoiDecoder;
import java.awt.Rectangle;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.zip.ZipEntry;
import java.util.zip.ZipInputStream;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;

/** Converts ImageJ ROIs into core {@link Region}s and reads ImageJ ROI files. */
public final class RoiRegions {

    private RoiRegions() {
    }

    /** The ROI's name, or "region N" when it has none. */
    public static String nameOf(Roi roi, int index) {
        String n = roi.getName();
        return n == null || n.isBlank() ? "region " + (index + 1) : n;
    }

    /** The pixels inside {@code roi}; the whole ROI must lie inside the image. */
    public static Region toRegion(Roi roi, String name, int width, int height) throws InputException {
        if (!roi.isArea()) {
            throw new InputException("region '" + name + "' is a line or point selection: draw an area "
                    + "(rectangle, oval, polygon or freehand)");
        }
        Rectangle b = roi.getBounds();
        if (b.x < 0 || b.y < 0 || b.x + b.width > width || b.y + b.height > height) {
            throw new InputException(String.format(Locale.ROOT,
                    "region '%s' (x=%d, y=%d, w=%d, h=%d) lies partly outside the %dx%d image: move or "
                            + "shrink it so that it fits", name, b.x, b.y, b.width, b.height, width, height));
        }
        int[] idx = containedIndices(roi, b, width);
        if (idx.length == 0) {
            throw new InputException("region '" + name + "' contains no pixels: draw a larger region");
        }
        return new Region(name, idx);
    }

    /**
     * The indices of the pixels ImageJ counts as inside the ROI (those of {@link Roi#getContainedPoints}),
     * read from its mask without a point object per pixel, so a region of 10^7 pixels costs 40 MB.
     */
    static int[] containedIndices(Roi roi, Rectangle b, int width) {
        ij.process.ImageProcessor mask = roi.getMask();
        int n = 0;
        if (mask == null) {
            int[] idx = new int[b.width * b.height];
            for (int y = 0; y < b.height; y++) {
                for (int x = 0; x < b.width; x++) {
                    idx[n++] = (b.y + y) * width + b.x + x;
                }
            }
            return idx;
        }
        byte[] m = (byte[]) mask.getPixels();
        int mw = mask.getWidth();
        int count = 0;
        for (int y = 0; y < b.height && y < mask.getHeight(); y++) {
            for (int x = 0; x < b.width && x < mw; x++) {
                if (m[y * mw + x] != 0) {
                    count++;
                }
            }
        }
        int[] idx = new int[count];
        for (int y = 0; y < b.height && y < mask.getHeight(); y++) {
            for (int x = 0; x < b.width && x < mw; x++) {
                if (m[y * mw + x] != 0) {
                    idx[n++] = (b.y + y) * width + b.x + x;
                }
            }
        }
        return idx;
    }

    /** Reads an ImageJ {@code .roi} file or a ROI Manager {@code .zip} set. */
    public static List<Roi> read(Path file) throws InputException {
        if (!Files.isReadable(file)) {
            throw new InputException("cannot read ROI file '" + file + "': check the path and permissions");
        }
        String lower = file.getFileName().toString().toLowerCase(Locale.ROOT);
        List<Roi> rois = new ArrayList<>();
        try {
            if (lower.endsWith(".zip")) {
                try (ZipInputStream zin = new ZipInputStream(Files.newInputStream(file))) {
                    ZipEntry e;
                    while ((e = zin.getNextEntry()) != null) {
                        if (!e.getName().toLowerCase(Locale.ROOT).endsWith(".roi")) {
                            continue;
                        }
                        byte[] bytes = readAll(zin);
                        Roi roi = RoiDecoder.openFromByteArray(bytes);
                        if (roi == null) {
                            throw new InputException("ROI file '" + file + "' holds an entry '" + e.getName()
                                    + "' that ImageJ cannot decode: re-save the set from the ROI Manager");
                        }
                        if (roi.getName() == null) {
                            roi.setName(e.getName().replaceFirst("(?i)\\.roi$", ""));
                        }
                        rois.add(roi);
                    }
                }
            } else if (lower.endsWith(".roi")) {
                Roi roi = RoiDecoder.openFromByteArray(Files.readAllBytes(file));
                if (roi == null) {
                    throw new InputException("ROI file '" + file + "' is not an ImageJ ROI: re-save it from ImageJ");
                }
                if (roi.getName() == null) {
                    roi.setName(file.getFileName().toString().replaceFirst("(?i)\\.roi$", ""));
                }
                rois.add(roi);
            } else {
                throw new InputException("ROI file '" + file + "' must end in .roi or .zip (ImageJ ROI Manager format)");
            }
        } catch (IOException e) {
            throw new InputException("cannot read ROI file '" + file + "': " + e.getMessage());
        }
        if (rois.isEmpty()) {
            throw new InputException("ROI file '" + file + "' holds no regions");
        }
        return rois;
    }

    private static byte[] readAll(InputStream in) throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        in.transferTo(out);
        return out.toByteArray();
    }
}
