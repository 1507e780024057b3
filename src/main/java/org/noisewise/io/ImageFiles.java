package org.noisewise.io;

import ij.ImagePlus;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.noisewise.estimate.InputException;

/** Opens image files through ImageJ's readers for the command line (no display needed). */
public final class ImageFiles {

    private ImageFiles() {
    }

    /**
     * Opens an image through one interface: a folder holding one DICOM series, a NIfTI-1 file
     * ({@code .nii}, {@code .nii.gz}), or any file ImageJ reads (TIFF, DICOM including multi-frame,
     * ...); a clear error when it cannot.
     */
    public static ImagePlus open(Path file) throws InputException {
        if (!Files.exists(file)) {
            throw new InputException("file not found: '" + file + "': check the path");
        }
        if (Files.isDirectory(file)) {
            List<DicomSeries.Series> series = DicomSeries.find(file);
            if (series.isEmpty()) {
                throw new InputException("folder '" + file + "' holds no DICOM files: give an image file or a "
                        + "folder of one DICOM series");
            }
            if (series.size() > 1) {
                throw new InputException("folder '" + file + "' holds " + series.size() + " DICOM series: give a "
                        + "folder with one series, or use batch");
            }
            return DicomSeries.open(series.get(0), file.getFileName().toString());
        }
        if (NiftiReader.handles(file)) {
            if (!Files.isReadable(file)) {
                throw new InputException("cannot read '" + file + "': check its permissions");
            }
            return NiftiReader.read(file);
        }
        if (!Files.isReadable(file)) {
            throw new InputException("cannot read '" + file + "': check its permissions");
        }
        FileChecks.requireDecodableDicom(file);
        ImagePlus imp = DicomSeries.read(file.toAbsolutePath());
        if (imp == null || imp.getWidth() == 0) {
            throw new InputException("cannot read '" + file + "' as an image: ImageJ does not recognise "
                    + "its format or the file is damaged; export it as TIFF or DICOM");
        }
        FileChecks.requireWhole(file, imp);
        ImagePlanes.requireGrayscale(imp);
        return imp;
    }
}
