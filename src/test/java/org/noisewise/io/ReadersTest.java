package org.noisewise.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.io.FileInfo;
import ij.io.FileOpener;
import ij.measure.Measurements;
import ij.process.ImageStatistics;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.zip.GZIPOutputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SampleStats;
import org.noisewise.testing.DicomEdit;

/** The readers behind every command: DICOM files and series, NIfTI-1, on real open data and written files. */
class ReadersTest {

    @TempDir
    Path dir;

    private static byte[] resource(String name) throws IOException {
        try (InputStream in = ReadersTest.class.getResourceAsStream("/opendata/" + name)) {
            return in.readAllBytes();
        }
    }

    private Path copy(String name) throws IOException {
        Path p = dir.resolve(name);
        Files.write(p, resource(name));
        return p;
    }

    /**
     * MR_small.dcm (pydicom test data, Expat licence; see src/test/resources/opendata/README.md):
     * 64x64, 16-bit signed, pixel spacing 0.3125 mm, slice thickness 0.8 mm, TR 4000 ms, TE 240 ms,
     * no pixel-bandwidth tag — as its header states.
     */
    @Test
    void realDicomFile() throws Exception {
        ImagePlus imp = ImageFiles.open(copy("MR_small.dcm"));
        assertEquals(64, imp.getWidth());
        assertEquals(64, imp.getHeight());
        assertEquals(16, imp.getBitDepth());
        assertTrue(imp.getCalibration().isSigned16Bit());
        assertEquals(0.3125, imp.getCalibration().pixelWidth, 1e-9);
        assertEquals(0.3125, imp.getCalibration().pixelHeight, 1e-9);
        assertEquals(0.8, imp.getCalibration().pixelDepth, 1e-9);
        assertEquals("4000.0000", ImageMetadata.tag(imp, "0018,0080"));
        assertEquals("240.0000", ImageMetadata.tag(imp, "0018,0081"));
        assertNull(ImageMetadata.tag(imp, "0018,0095"));
        // region statistics agree with ImageJ's own ImageStatistics on calibrated values
        imp.setRoi(10, 12, 30, 20);
        ImageStatistics ij = imp.getStatistics(Measurements.MEAN | Measurements.STD_DEV);
        imp.deleteRoi();
        double[] v = Region.rectangle("r", 10, 12, 30, 20, 64, 64).values(ImagePlanes.calibratedPixels(imp, 1));
        SampleStats s = SampleStats.of(v);
        assertEquals(ij.mean, s.mean(), 1e-9);
        assertEquals(ij.stdDev, s.sd(), 1e-9);
        assertEquals(600, s.n());
    }

    /** A copy with rescale slope 2.5 and intercept -100 (tags added by the test) reads scaled values. */
    @Test
    void dicomRescaleIsApplied() throws Exception {
        byte[] original = resource("MR_small.dcm");
        byte[] edited = DicomEdit.set(DicomEdit.set(original, 0x0028, 0x1052, "DS", "-100"), 0x0028, 0x1053, "DS", "2.5");
        Path a = copy("MR_small.dcm");
        Path b = dir.resolve("scaled.dcm");
        Files.write(b, edited);
        float[] plain = ImagePlanes.calibratedPixels(ImageFiles.open(a), 1);
        float[] scaled = ImagePlanes.calibratedPixels(ImageFiles.open(b), 1);
        for (int i = 0; i < plain.length; i++) {
            assertEquals(2.5 * plain[i] - 100, scaled[i], 1e-3, "pixel " + i);
        }
    }

    /** A folder of one series at one position: its images are repeats in Instance Number order, not by file name. */
    @Test
    void dicomSeriesFolderIsSortedByInstanceNumber() throws Exception {
        byte[] original = resource("MR_small.dcm");
        Path series = Files.createDirectory(dir.resolve("series"));
        String[] names = {"a.dcm", "b.dcm", "c.dcm"};
        String[] instance = {"3", "1", "2"};
        for (int i = 0; i < 3; i++) {
            byte[] e = DicomEdit.set(original, 0x0020, 0x0013, "IS", instance[i]);
            // each image of a series has its own SOP Instance UID, as a scanner writes it
            e = DicomEdit.set(e, 0x0008, 0x0018, "UI", "1.2.826.0.1.3680043.9.7890." + (i + 1));
            // make each slice distinguishable through its rescale intercept
            e = DicomEdit.set(e, 0x0028, 0x1052, "DS", String.valueOf(1000 * Integer.parseInt(instance[i])));
            e = DicomEdit.set(e, 0x0028, 0x1053, "DS", "1");
            Files.write(series.resolve(names[i]), e);
        }
        ImagePlus imp = ImageFiles.open(series);
        assertEquals(3, imp.getStackSize());
        float[] ref = ImagePlanes.calibratedPixels(ImageFiles.open(copy("MR_small.dcm")), 1);
        for (int n = 1; n <= 3; n++) {
            assertEquals(ref[100] + 1000 * n, ImagePlanes.calibratedPixels(imp, n)[100], 1e-3, "slice " + n);
        }
        Files.writeString(series.resolve("notes.txt"), "not an image");
        assertEquals(3, ImageFiles.open(series).getStackSize(), "non-DICOM files are not part of the series");
        InputException empty = assertThrows(InputException.class,
                () -> ImageFiles.open(Files.createDirectory(dir.resolve("empty"))));
        assertTrue(empty.getMessage().contains("no DICOM files"));
    }

    /** Writes a NIfTI-1 file: nx x ny x nz x nt voxels of the given datatype, value(i) = raw index pattern. */
    private Path writeNifti(String name, short datatype, int bytesPer, float slope, float inter, int nx, int ny, int nz,
                            int nt, boolean gzip, ByteOrder order) throws IOException {
        int n = nx * ny * nz * nt;
        ByteBuffer b = ByteBuffer.allocate(352 + n * bytesPer).order(order);
        b.putInt(0, 348);
        b.putShort(40, (short) 4).putShort(42, (short) nx).putShort(44, (short) ny).putShort(46, (short) nz)
                .putShort(48, (short) nt).putShort(50, (short) 1).putShort(52, (short) 1).putShort(54, (short) 1);
        b.putShort(70, datatype).putShort(72, (short) (8 * bytesPer));
        b.putFloat(76, 1f).putFloat(80, 1.5f).putFloat(84, 2f).putFloat(88, 3f).putFloat(92, 0.8f);
        b.putFloat(108, 352f).putFloat(112, slope).putFloat(116, inter);
        b.put(123, (byte) 10); // mm and seconds
        b.put(344, (byte) 'n').put(345, (byte) '+').put(346, (byte) '1');
        for (int i = 0; i < n; i++) {
            int pos = 352 + i * bytesPer;
            int raw = raw(i);
            switch (datatype) {
                case 2, 256 -> b.put(pos, (byte) raw);
                case 4, 512 -> b.putShort(pos, (short) raw);
                case 8 -> b.putInt(pos, raw);
                case 16 -> b.putFloat(pos, raw + 0.25f);
                case 64 -> b.putDouble(pos, raw + 0.25);
                default -> b.put(pos, (byte) raw); // an unsupported type: content irrelevant
            }
        }
        Path p = dir.resolve(name);
        try (OutputStream os = gzip ? new GZIPOutputStream(Files.newOutputStream(p)) : Files.newOutputStream(p)) {
            os.write(b.array());
        }
        return p;
    }

    private static int raw(int i) {
        return (i * 7) % 100 - 20;
    }

    private static double expected(short datatype, int i, float slope, float inter) {
        double v = switch (datatype) {
            case 2 -> raw(i) & 0xff;
            case 512 -> raw(i) & 0xffff;
            case 16, 64 -> raw(i) + 0.25;
            default -> raw(i);
        };
        return slope != 0 ? v * slope + inter : v;
    }

    @Test
    void niftiEveryDatatypeScalingAndByteOrder() throws Exception {
        short[] types = {256, 2, 4, 512, 8, 16, 64};
        int[] sizes = {1, 1, 2, 2, 4, 4, 8};
        int nx = 5;
        int ny = 4;
        int nz = 3;
        int nt = 2;
        for (int k = 0; k < types.length; k++) {
            for (float slope : new float[] {0f, 1f, 2.5f}) {
                ByteOrder order = k % 2 == 0 ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN;
                boolean gz = slope == 2.5f;
                Path p = writeNifti("t" + types[k] + "_" + slope + (gz ? ".nii.gz" : ".nii"), types[k], sizes[k], slope,
                        slope == 2.5f ? -7f : 0f, nx, ny, nz, nt, gz, order);
                ImagePlus imp = ImageFiles.open(p);
                assertEquals(nz, imp.getNSlices());
                assertEquals(nt, imp.getNFrames());
                assertEquals(1.5, imp.getCalibration().pixelWidth, 1e-6);
                assertEquals(3.0, imp.getCalibration().pixelDepth, 1e-6);
                assertEquals("mm", imp.getCalibration().getUnit());
                for (int t = 0; t < nt; t++) {
                    for (int z = 0; z < nz; z++) {
                        float[] px = ImagePlanes.calibratedPixels(imp, imp.getStackIndex(1, z + 1, t + 1));
                        for (int j = 0; j < ny; j++) {
                            for (int i = 0; i < nx; i++) {
                                int idx = ((t * nz + z) * ny + j) * nx + i;
                                // NIfTI row j is displayed at ImageJ row ny-1-j
                                assertEquals(expected(types[k], idx, slope, slope == 2.5f ? -7f : 0f),
                                        px[(ny - 1 - j) * nx + i], 1e-4, "type " + types[k] + " slope " + slope);
                            }
                        }
                    }
                }
            }
        }
    }

    @Test
    void niftiErrors() throws IOException {
        Path bad = dir.resolve("bad.nii");
        Files.write(bad, new byte[400]);
        InputException e = assertThrows(InputException.class, () -> ImageFiles.open(bad));
        assertTrue(e.getMessage().contains("NIfTI"), e.getMessage());
        Path unsupported = writeNifti("rgb.nii", (short) 128, 3, 0, 0, 2, 2, 1, 1, false, ByteOrder.LITTLE_ENDIAN);
        InputException u = assertThrows(InputException.class, () -> ImageFiles.open(unsupported));
        assertTrue(u.getMessage().contains("datatype code 128"), u.getMessage());
        byte[] truncated = Files.readAllBytes(writeNifti("full.nii", (short) 4, 2, 0, 0, 8, 8, 2, 1, false,
                ByteOrder.LITTLE_ENDIAN));
        Path cut = dir.resolve("cut.nii");
        Files.write(cut, java.util.Arrays.copyOf(truncated, 400));
        assertTrue(assertThrows(InputException.class, () -> ImageFiles.open(cut)).getMessage().contains("truncated"));
    }

    /**
     * functional.nii (nibabel test data, Expat licence): its header says 17 x 21 x 3 x 20, int16, voxels
     * 4 x 4 x 8 mm, TR 2 s, scl_slope 0.0754..., scl_inter 3100.76... The same voxels read through
     * ImageJ's raw reader (FileOpener with the header's offset and type) and scaled by hand agree.
     */
    @Test
    void realNiftiFile() throws Exception {
        Path p = copy("functional.nii");
        ImagePlus imp = ImageFiles.open(p);
        assertEquals(17, imp.getWidth());
        assertEquals(21, imp.getHeight());
        assertEquals(3, imp.getNSlices());
        assertEquals(20, imp.getNFrames());
        assertEquals(4.0, imp.getCalibration().pixelWidth, 1e-6);
        assertEquals(8.0, imp.getCalibration().pixelDepth, 1e-6);
        assertEquals(2.0, imp.getCalibration().frameInterval, 1e-6);
        ByteBuffer h = ByteBuffer.wrap(Files.readAllBytes(p)).order(ByteOrder.LITTLE_ENDIAN);
        float slope = h.getFloat(112);
        float inter = h.getFloat(116);
        FileInfo fi = new FileInfo();
        fi.fileType = FileInfo.GRAY16_SIGNED;
        fi.width = 17;
        fi.height = 21;
        fi.nImages = 60;
        fi.offset = 352;
        fi.intelByteOrder = true;
        fi.directory = dir.toString() + java.io.File.separator;
        fi.fileName = "functional.nii";
        ImagePlus raw = new FileOpener(fi).openImage();
        for (int s = 1; s <= 60; s++) {
            float[] ours = ImagePlanes.calibratedPixels(imp, s);
            float[] other = new float[17 * 21];
            for (int y = 0; y < 21; y++) {
                for (int x = 0; x < 17; x++) {
                    // GRAY16_SIGNED is stored by ImageJ with a +32768 offset
                    double v = raw.getStack().getProcessor(s).get(x, 20 - y) - 32768;
                    other[y * 17 + x] = (float) (v * slope + inter);
                }
            }
            assertArrayEquals(other, ours, 1e-3f, "slice " + s);
        }
        assertEquals(Math.abs(slope), (double) imp.getProperty(NiftiReader.STEP_PROPERTY), 1e-9);
    }

    /**
     * Issue 12.1: a truncated DICOM is refused, never measured. pydicom's own MR_truncated.dcm (its
     * pixel data cut short), and MR_small.dcm cut to 5,734 of its 9,830 bytes, both give a message
     * that says so; the whole file still opens.
     */
    @Test
    void truncatedDicomIsRefused() throws Exception {
        InputException real = assertThrows(InputException.class, () -> ImageFiles.open(copy("MR_truncated.dcm")));
        assertTrue(real.getMessage().contains("truncated"), real.getMessage());
        Path cut = dir.resolve("cut.dcm");
        Files.write(cut, java.util.Arrays.copyOf(resource("MR_small.dcm"), 5734));
        InputException e = assertThrows(InputException.class, () -> ImageFiles.open(cut));
        assertTrue(e.getMessage().contains("truncated") && e.getMessage().contains("5734"), e.getMessage());
        Path series = Files.createDirectory(dir.resolve("series"));
        Files.write(series.resolve("a.dcm"), resource("MR_small.dcm"));
        Files.write(series.resolve("b.dcm"), java.util.Arrays.copyOf(resource("MR_small.dcm"), 5734));
        assertTrue(assertThrows(InputException.class, () -> ImageFiles.open(series)).getMessage().contains("truncated"));
        assertEquals(64, ImageFiles.open(copy("MR_small.dcm")).getWidth());
    }

    /**
     * Issue 12.1: compressed DICOM (pydicom's RLE, JPEG 2000 and JPEG-LS copies of MR_small) is refused by
     * name, saying how to decompress it, instead of ImageJ's stack trace.
     */
    @Test
    void compressedDicomIsRefusedByName() throws Exception {
        String[][] cases = {{"MR_small_RLE.dcm", "RLE"}, {"MR_small_jp2klossless.dcm", "JPEG 2000"},
            {"MR_small_jpeg_ls_lossless.dcm", "JPEG-LS"}};
        for (String[] c : cases) {
            Path p = copy(c[0]);
            InputException e = assertThrows(InputException.class, () -> ImageFiles.open(p));
            assertTrue(e.getMessage().contains(c[1]) && e.getMessage().contains("decompress"), e.getMessage());
        }
    }

    /** A TIFF cut short is refused; an empty or damaged gzip NIfTI says why (never "null"). */
    @Test
    void truncatedTiffAndEmptyGzipNifti() throws Exception {
        ImagePlus imp = new ImagePlus("t", new ij.process.ShortProcessor(64, 64));
        Path tif = dir.resolve("whole.tif");
        new ij.io.FileSaver(imp).saveAsTiff(tif.toString());
        byte[] whole = Files.readAllBytes(tif);
        Path cut = dir.resolve("cut.tif");
        Files.write(cut, java.util.Arrays.copyOf(whole, whole.length / 2));
        InputException e = assertThrows(InputException.class, () -> ImageFiles.open(cut));
        assertTrue(e.getMessage().contains("truncated"), e.getMessage());
        Path gz = dir.resolve("empty.nii.gz");
        Files.write(gz, new byte[0]);
        InputException g = assertThrows(InputException.class, () -> ImageFiles.open(gz));
        assertTrue(!g.getMessage().contains("null") && g.getMessage().contains("NIfTI"), g.getMessage());
    }
}
