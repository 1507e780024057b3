package org.noisewise.io;

import ij.ImagePlus;
import ij.ImageStack;
import ij.measure.Calibration;
import ij.process.FloatProcessor;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.zip.GZIPInputStream;
import org.noisewise.estimate.InputException;

/**
 * Reads single-file NIfTI-1 images ({@code .nii}, {@code .nii.gz}; magic {@code n+1}), 3-D and 4-D,
 * datatypes int8, uint8, int16, uint16, int32, float32 and float64, either byte order.
 *
 * <p>Values are returned as 32-bit calibrated data: {@code value = raw * scl_slope + scl_inter} when
 * {@code scl_slope} is non-zero (NIfTI-1 standard), else raw. Voxel sizes ({@code pixdim[1..3]}, in
 * mm, micrometres or metres by {@code xyzt_units}) become the spatial calibration and
 * {@code pixdim[4]} the frame interval. The result is a hyperstack: z slices and time frames.
 *
 * <p><b>Row order.</b> NIfTI stores the second index {@code j} increasing upwards as NIfTI viewers
 * display it; ImageJ draws row 0 at the top. Row {@code r} of the returned image is therefore
 * {@code j = ny - 1 - r}, so the image looks the same as in a NIfTI viewer, and region coordinates
 * ({@code x, y} of the top-left corner) are ImageJ pixel coordinates of that displayed image.
 * For integer data the image property {@value #STEP_PROPERTY} holds the quantisation step
 * ({@code |scl_slope|}, or 1).
 */
public final class NiftiReader {

    /** Image property holding the quantisation step of integer NIfTI data, in calibrated units. */
    public static final String STEP_PROPERTY = "noisewise.step";
    private static final int HEADER = 348;

    private NiftiReader() {
    }

    public static boolean handles(Path file) {
        String n = file.getFileName().toString().toLowerCase(Locale.ROOT);
        return n.endsWith(".nii") || n.endsWith(".nii.gz");
    }

    public static ImagePlus read(Path file) throws InputException {
        byte[] bytes;
        try (InputStream raw = Files.newInputStream(file);
             InputStream in = file.getFileName().toString().toLowerCase(Locale.ROOT).endsWith(".gz")
                     ? new GZIPInputStream(raw) : raw) {
            bytes = in.readAllBytes();
        } catch (java.util.zip.ZipException e) {
            throw bad(file, "its name ends in .gz but it is not gzip-compressed data (or the compressed data are "
                    + "damaged): rename it to .nii if it is uncompressed, or check the transfer and copy it again");
        } catch (java.io.EOFException e) {
            throw bad(file, "the compressed data end early: the file is empty or was cut short in a transfer; copy or "
                    + "export it again");
        } catch (IOException e) {
            throw bad(file, "it cannot be read (" + ImageWriter.reason(e) + "): check that it exists and can be read");
        }
        if (bytes.length < HEADER + 4) {
            throw bad(file, "it is shorter than a NIfTI-1 header (" + bytes.length + " bytes, a header alone has "
                    + HEADER + "): it is empty or cut short; copy or export it again");
        }
        ByteBuffer b = ByteBuffer.wrap(bytes).order(ByteOrder.LITTLE_ENDIAN);
        if (b.getInt(0) != HEADER) {
            b.order(ByteOrder.BIG_ENDIAN);
            if (b.getInt(0) != HEADER) {
                throw bad(file, "its header size is not 348: it is not a NIfTI-1 file (NIfTI-2 is not supported) or its "
                        + "header is damaged; export it again as NIfTI-1 (or TIFF)");
            }
        }
        String magic = new String(bytes, 344, 3, java.nio.charset.StandardCharsets.US_ASCII);
        if (!magic.equals("n+1")) {
            throw bad(file, magic.equals("ni1") ? "it is a two-file (.hdr/.img) NIfTI: convert it to a single .nii"
                    : "its magic string is not n+1 (a damaged header, or not NIfTI-1): export it again as NIfTI-1");
        }
        int ndim = b.getShort(40);
        if (ndim < 2 || ndim > 4) {
            throw bad(file, "it has " + ndim + " dimensions; 2, 3 or 4 are supported: export the volume or time series "
                    + "on its own");
        }
        int nx = b.getShort(42);
        int ny = b.getShort(44);
        int nz = ndim >= 3 ? Math.max(1, b.getShort(46)) : 1;
        int nt = ndim >= 4 ? Math.max(1, b.getShort(48)) : 1;
        int datatype = b.getShort(70);
        float[] pixdim = new float[8];
        for (int i = 0; i < 8; i++) {
            pixdim[i] = b.getFloat(76 + 4 * i);
        }
        long offset = (long) b.getFloat(108);
        float slope = b.getFloat(112);
        float inter = b.getFloat(116);
        int units = bytes[123] & 0x07;
        int bytesPer = switch (datatype) {
            case 2, 256 -> 1;
            case 4, 512 -> 2;
            case 8, 16 -> 4;
            case 64 -> 8;
            default -> throw bad(file, "its datatype code " + datatype
                    + " is not supported (int8, uint8, int16, uint16, int32, float32, float64 are)");
        };
        long voxels = (long) nx * ny * nz * nt;
        if (nx < 1 || ny < 1 || offset < HEADER || offset + voxels * bytesPer > bytes.length) {
            throw bad(file, "its header describes " + nx + "x" + ny + "x" + nz + "x" + nt + " voxels (" + voxels * bytesPer
                    + " bytes from byte " + offset + ") but the file holds " + bytes.length + " bytes: it is truncated "
                    + "(cut short in a transfer) or its header is damaged; copy or export it again");
        }
        boolean scaled = slope != 0 && Float.isFinite(slope) && !(slope == 1 && inter == 0);
        ImageStack stack = new ImageStack(nx, ny);
        int plane = nx * ny;
        for (int s = 0; s < nz * nt; s++) {
            float[] px = new float[plane];
            long base = offset + (long) s * plane * bytesPer;
            for (int j = 0; j < ny; j++) {
                int row = ny - 1 - j;
                for (int i = 0; i < nx; i++) {
                    int pos = (int) (base + ((long) j * nx + i) * bytesPer);
                    double v = switch (datatype) {
                        case 2 -> bytes[pos] & 0xff;
                        case 256 -> bytes[pos];
                        case 4 -> b.getShort(pos);
                        case 512 -> b.getShort(pos) & 0xffff;
                        case 8 -> b.getInt(pos);
                        case 16 -> b.getFloat(pos);
                        default -> b.getDouble(pos);
                    };
                    px[row * nx + i] = (float) (scaled ? v * slope + inter : v);
                }
            }
            stack.addSlice(new FloatProcessor(nx, ny, px));
        }
        ImagePlus imp = new ImagePlus(file.getFileName().toString(), stack);
        imp.setDimensions(1, nz, nt);
        if (nz * nt > 1) {
            imp.setOpenAsHyperStack(true);
        }
        Arrangement.mark(imp, String.format(java.util.Locale.ROOT, "'%s': %d slice%s x %d repeat%s from its NIfTI header "
                + "(dim[3], dim[4])", file.getFileName(), nz, nz == 1 ? "" : "s", nt, nt == 1 ? "" : "s"));
        Calibration cal = imp.getCalibration();
        double toUnit = 1.0;
        String unit = "mm";
        if (units == 1) {
            toUnit = 1000.0;
        } else if (units == 3) {
            toUnit = 1e-3;
        } else if (units == 0) {
            unit = "pixel";
        }
        cal.pixelWidth = pixdim[1] > 0 ? pixdim[1] * toUnit : 1;
        cal.pixelHeight = pixdim[2] > 0 ? pixdim[2] * toUnit : 1;
        cal.pixelDepth = pixdim[3] > 0 ? pixdim[3] * toUnit : 1;
        cal.setUnit(unit);
        cal.frameInterval = nt > 1 ? pixdim[4] : 0;
        boolean integer = datatype != 16 && datatype != 64;
        if (integer) {
            imp.setProperty(STEP_PROPERTY, scaled ? Math.abs(slope) : 1.0);
            double rawMax = switch (datatype) {
                case 2 -> 255;
                case 256 -> 127;
                case 4 -> 32767;
                case 512 -> 65535;
                default -> Integer.MAX_VALUE;
            };
            double top = scaled ? rawMax * slope + inter : rawMax;
            double zero = scaled ? inter : 0.0;
            imp.setProperty(BackgroundValues.OFFSET_PROPERTY, zero);
            imp.setProperty(BackgroundValues.MAXIMUM_PROPERTY, Math.max(top, zero));
        }
        return imp;
    }

    private static InputException bad(Path file, String why) {
        return new InputException("cannot read '" + file + "' as NIfTI: " + why);
    }
}
