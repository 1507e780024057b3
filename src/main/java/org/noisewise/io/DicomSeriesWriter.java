package org.noisewise.io;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Writes a series of Z slices x T repeats as a scanner exports it, for the bundled DICOM sample
 * and the reader tests: either one MR Image Storage file per image (Image Position and Orientation
 * (Patient), Instance Number in a time-major or slice-major order, Temporal Position Identifier or
 * only an Acquisition Number per repeat, or neither), or one Enhanced MR Image Storage file whose
 * per-frame functional groups give each frame's plane position, temporal position index, dimension
 * index values and rescale (DICOM PS3.3 C.7.6.16).
 */
public final class DicomSeriesWriter {

    /** How Instance Numbers run through the images. */
    public enum Numbering {
        /** All slices of repeat 1, then all slices of repeat 2, ... (most functional series). */
        TIME_MAJOR,
        /** All repeats of slice 1, then of slice 2, ... */
        SLICE_MAJOR
    }

    /** What the single-frame files say of the repeat they belong to. */
    public enum TimeTags {
        /** Temporal Position Identifier (0020,0100) and Number of Temporal Positions (0020,0105). */
        TEMPORAL_POSITION,
        /** Only Acquisition Number (0020,0012), one per repeat. */
        ACQUISITION_NUMBER,
        /** Neither: the repeat is known only from the order of Instance Numbers. */
        NONE
    }

    /** One image to write: its slice and repeat (0-based) and its stored values. */
    public record Image(int z, int t, short[] stored, double slope, double intercept) {
    }

    /** A series to write; set what differs from the defaults, then call a writer. */
    public static final class Spec {
        String seriesName = "series";
        String seriesUidName;
        int rows;
        int columns;
        int slices;
        int repeats;
        final List<Image> images = new ArrayList<>();
        double pixelMm = 2.0;
        double thicknessMm = 5.0;
        double stepMm = 6.0;
        double[] origin = {-64, -64, 0};
        double[] cosines = {1, 0, 0, 0, 1, 0};
        boolean signed;
        Numbering numbering = Numbering.TIME_MAJOR;
        TimeTags timeTags = TimeTags.TEMPORAL_POSITION;
        int echo;
        double echoTimeMs = 30;
        int instanceOffset;
        String transferSyntax = DicomWriter.EXPLICIT_LE;
        boolean undefinedLengths;
        DicomWriter.Dataset common = new DicomWriter.Dataset();

        /** A series of {@code slices} x {@code repeats} images of {@code columns} x {@code rows} pixels. */
        public Spec(String seriesName, int columns, int rows, int slices, int repeats) {
            this.seriesName = seriesName;
            this.columns = columns;
            this.rows = rows;
            this.slices = slices;
            this.repeats = repeats;
        }

        /** Writes the images into the series of that name (its Series Instance UID) rather than their own. */
        public Spec series(String uidName) {
            this.seriesUidName = uidName;
            return this;
        }

        /** Adds an image (0-based slice and repeat) with its stored values and rescale. */
        public Spec image(int z, int t, short[] stored, double slope, double intercept) {
            images.add(new Image(z, t, stored, slope, intercept));
            return this;
        }

        /** Removes the image of slice {@code z}, repeat {@code t} (0-based): an incomplete export. */
        public Spec drop(int z, int t) {
            images.removeIf(i -> i.z() == z && i.t() == t);
            return this;
        }

        /** Pixel size, slice thickness and the signed step between slices along the normal, in mm. */
        public Spec geometry(double pixelMm, double thicknessMm, double stepMm) {
            this.pixelMm = pixelMm;
            this.thicknessMm = thicknessMm;
            this.stepMm = stepMm;
            return this;
        }

        /** Image Orientation (Patient): row then column direction cosines. */
        public Spec orientation(double... cosines) {
            this.cosines = cosines.clone();
            return this;
        }

        /** Position of slice 0's first pixel. */
        public Spec origin(double x, double y, double z) {
            this.origin = new double[] {x, y, z};
            return this;
        }

        public Spec signed(boolean signed) {
            this.signed = signed;
            return this;
        }

        public Spec numbering(Numbering numbering) {
            this.numbering = numbering;
            return this;
        }

        public Spec timeTags(TimeTags timeTags) {
            this.timeTags = timeTags;
            return this;
        }

        /**
         * Echo Numbers (0018,0086) and echo time of every image (0: no echo number written); the
         * Instance Numbers of echo {@code e} start after those of the echoes before it, as in a
         * multi-echo series written one echo at a time.
         */
        public Spec echo(int echo, double echoTimeMs) {
            this.echo = echo;
            this.echoTimeMs = echoTimeMs;
            this.instanceOffset = Math.max(0, echo - 1) * slices * repeats;
            return this;
        }

        public Spec transferSyntax(String uid, boolean undefinedLengths) {
            this.transferSyntax = uid;
            this.undefinedLengths = undefinedLengths;
            return this;
        }

        /** Elements every file carries (study, equipment and protocol facts). */
        public DicomWriter.Dataset common() {
            return common;
        }

        double[] normal() {
            double[] r = {cosines[0], cosines[1], cosines[2]};
            double[] c = {cosines[3], cosines[4], cosines[5]};
            return new double[] {r[1] * c[2] - r[2] * c[1], r[2] * c[0] - r[0] * c[2], r[0] * c[1] - r[1] * c[0]};
        }

        double[] position(int z) {
            double[] n = normal();
            return new double[] {origin[0] + z * stepMm * n[0], origin[1] + z * stepMm * n[1],
                    origin[2] + z * stepMm * n[2]};
        }

        int instance(Image im) {
            return instanceOffset + (numbering == Numbering.TIME_MAJOR ? im.t() * slices + im.z() + 1
                    : im.z() * repeats + im.t() + 1);
        }
    }

    /** One file to write: its name in the folder and its bytes. */
    public record File(String name, byte[] bytes) {
    }

    private DicomSeriesWriter() {
    }

    /** One MR Image Storage file per image, named by Instance Number ({@code IM0001.dcm}, ...). */
    public static List<File> singleFrame(Spec s) {
        List<File> out = new ArrayList<>();
        List<Image> sorted = new ArrayList<>(s.images);
        sorted.sort((a, b) -> Integer.compare(s.instance(a), s.instance(b)));
        for (Image im : sorted) {
            int instance = s.instance(im);
            DicomWriter.Dataset d = base(s, DicomWriter.MR_IMAGE, s.seriesName + " image " + instance + " "
                    + s.images.indexOf(im));
            d.integer(0x00200013, instance);
            d.decimals(0x00200032, s.position(im.z()));
            d.decimals(0x00200037, s.cosines);
            d.decimals(0x00201041, s.position(im.z())[2]);
            if (s.timeTags == TimeTags.TEMPORAL_POSITION) {
                d.integer(0x00200100, im.t() + 1);
                d.integer(0x00200105, s.repeats);
            }
            d.integer(0x00200012, s.timeTags == TimeTags.NONE ? 1 : im.t() + 1);
            if (s.echo > 0) {
                d.integer(0x00180086, s.echo);
            }
            acquisitionFacts(d, s, im);
            d.pixels(im.stored());
            out.add(new File(String.format(Locale.ROOT, "IM%04d.dcm", instance),
                    DicomWriter.encode(d, s.transferSyntax, s.undefinedLengths)));
        }
        return out;
    }

    /**
     * One file per repeat in the mosaic form of single-frame MR Image Storage that Siemens scanners write
     * for functional and diffusion series: the repeat's slices tiled row by row, in slice order, in a
     * square grid of {@code ceil(sqrt(slices))} tiles a side (unused tiles zero); Image Type ending in
     * MOSAIC; the number of slices in the private element (0019,100A) of the block "SIEMENS MR HEADER"
     * (0019,0010), as unsigned short; Image Position (Patient) that of the mosaic's first pixel, as if the
     * mosaic were one image centred on the slices; Acquisition and Instance Number the repeat's (1-based)
     * and no temporal position tags. Named {@code MOSAIC0001.dcm}, ...
     */
    public static List<File> mosaic(Spec s) {
        int grid = (int) Math.ceil(Math.sqrt(s.slices));
        int mw = grid * s.columns;
        int mh = grid * s.rows;
        List<File> out = new ArrayList<>();
        for (int t = 0; t < s.repeats; t++) {
            short[] tiles = new short[mw * mh];
            Image first = null;
            for (Image im : s.images) {
                if (im.t() != t) {
                    continue;
                }
                first = first == null ? im : first;
                int tx = im.z() % grid * s.columns;
                int ty = im.z() / grid * s.rows;
                for (int y = 0; y < s.rows; y++) {
                    System.arraycopy(im.stored(), y * s.columns, tiles, (ty + y) * mw + tx, s.columns);
                }
            }
            if (first == null) {
                continue;
            }
            DicomWriter.Dataset d = base(s, DicomWriter.MR_IMAGE, s.seriesName + " mosaic " + t);
            d.us(0x00280010, mh);
            d.us(0x00280011, mw);
            d.text(0x00080008, "CS", "ORIGINAL\\PRIMARY\\M\\ND\\MOSAIC");
            d.text(0x00190010, "LO", "SIEMENS MR HEADER");
            d.us(0x0019100A, s.slices);
            d.integer(0x00200013, t + 1);
            d.integer(0x00200012, t + 1);
            double[] p0 = s.position(0);
            double half = (grid - 1) / 2.0;
            double[] corner = new double[3];
            for (int i = 0; i < 3; i++) {
                corner[i] = p0[i] - half * s.columns * s.pixelMm * s.cosines[i] - half * s.rows * s.pixelMm
                        * s.cosines[3 + i];
            }
            d.decimals(0x00200032, corner);
            d.decimals(0x00200037, s.cosines);
            acquisitionFacts(d, s, first);
            d.pixels(tiles);
            out.add(new File(String.format(Locale.ROOT, "MOSAIC%04d.dcm", t + 1),
                    DicomWriter.encode(d, s.transferSyntax, s.undefinedLengths)));
        }
        return out;
    }

    /**
     * One Enhanced MR Image Storage file holding every image as a frame, in the order of the
     * numbering; each frame's Plane Position, Frame Content (Temporal Position Index, In-Stack
     * Position Number, Dimension Index Values: stack position then temporal position) and Pixel Value
     * Transformation (rescale) are per frame, Pixel Measures and Plane Orientation shared.
     */
    public static byte[] enhanced(Spec s) {
        List<Image> sorted = new ArrayList<>(s.images);
        sorted.sort((a, b) -> Integer.compare(s.instance(a), s.instance(b)));
        DicomWriter.Dataset d = base(s, DicomWriter.ENHANCED_MR_IMAGE, s.seriesName + " enhanced");
        d.integer(0x00200013, 1);
        d.integer(0x00280008, sorted.size());
        d.sequence(0x00209222,
                new DicomWriter.Dataset().ul(0x00209165, 0x00209057L).ul(0x00209167, 0x00209111L)
                        .text(0x00209421, "LO", "In-Stack Position Number"),
                new DicomWriter.Dataset().ul(0x00209165, 0x00209128L).ul(0x00209167, 0x00209111L)
                        .text(0x00209421, "LO", "Temporal Position Index"));
        DicomWriter.Dataset shared = new DicomWriter.Dataset()
                .sequence(0x00289110, new DicomWriter.Dataset().decimals(0x00280030, s.pixelMm, s.pixelMm)
                        .decimals(0x00180050, s.thicknessMm).decimals(0x00180088, Math.abs(s.stepMm)))
                .sequence(0x00209116, new DicomWriter.Dataset().decimals(0x00200037, s.cosines));
        if (s.echo > 0) {
            shared.sequence(0x00189114, new DicomWriter.Dataset().fd(0x00189082, s.echoTimeMs));
        }
        d.sequence(0x52009229, shared);
        DicomWriter.Dataset[] perFrame = new DicomWriter.Dataset[sorted.size()];
        short[][] pixels = new short[sorted.size()][];
        for (int i = 0; i < sorted.size(); i++) {
            Image im = sorted.get(i);
            perFrame[i] = new DicomWriter.Dataset()
                    .sequence(0x00209111, new DicomWriter.Dataset().text(0x00209056, "SH", "1")
                            .ul(0x00209057, im.z() + 1L).ul(0x00209128, im.t() + 1L)
                            .ul(0x00209157, im.z() + 1L, im.t() + 1L))
                    .sequence(0x00209113, new DicomWriter.Dataset().decimals(0x00200032, s.position(im.z())))
                    .sequence(0x00289145, new DicomWriter.Dataset().decimals(0x00281052, im.intercept())
                            .decimals(0x00281053, im.slope()).text(0x00281054, "LO", "US"));
            pixels[i] = im.stored();
        }
        d.sequence(0x52009230, perFrame);
        d.pixels(pixels);
        return DicomWriter.encode(d, s.transferSyntax, s.undefinedLengths);
    }

    /** Echo time, pixel spacing, slice thickness and spacing, and the image's rescale, as single-frame files carry them. */
    private static void acquisitionFacts(DicomWriter.Dataset d, Spec s, Image im) {
        d.decimals(0x00180081, s.echoTimeMs);
        d.decimals(0x00280030, s.pixelMm, s.pixelMm);
        d.decimals(0x00180050, s.thicknessMm);
        d.decimals(0x00180088, Math.abs(s.stepMm));
        d.decimals(0x00281052, im.intercept());
        d.decimals(0x00281053, im.slope());
        d.text(0x00281054, "LO", "US");
    }

    private static DicomWriter.Dataset base(Spec s, String sopClass, String instanceName) {
        DicomWriter.Dataset d = s.common.copy();
        d.text(0x00080016, "UI", sopClass);
        d.text(0x00080018, "UI", DicomWriter.uid(instanceName));
        d.text(0x00080060, "CS", "MR");
        String series = s.seriesUidName != null ? s.seriesUidName : s.seriesName;
        d.text(0x0020000D, "UI", DicomWriter.uid(series + " study"));
        d.text(0x0020000E, "UI", DicomWriter.uid(series));
        d.us(0x00280002, 1);
        d.text(0x00280004, "CS", "MONOCHROME2");
        d.us(0x00280010, s.rows);
        d.us(0x00280011, s.columns);
        d.us(0x00280100, 16);
        d.us(0x00280101, 16);
        d.us(0x00280102, 15);
        d.us(0x00280103, s.signed ? 1 : 0);
        return d;
    }
}
