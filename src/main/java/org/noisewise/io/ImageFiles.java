package org.noisewise.io;

import ij.ImagePlus;
import java.nio.file.Files;
import java.nio.file.Path;
import org.noisewise.estimate.InputException;

/** Opens image files through ImageJ's readers for the command line (no display needed). */
public final class ImageFiles {

    /** How a command-line user chooses one echo of a multi-echo series. */
    public static final String ECHO_HINT = "choose one with --echo N";

    /** File endings that are never images (ImageJ would open some of them as a text image). */
    private static final java.util.Set<String> NOT_IMAGES = java.util.Set.of("txt", "csv", "tsv", "json", "md", "html",
            "htm", "xml", "pdf", "log", "lock", "part", "py", "sh", "ijm", "doc", "docx", "xls", "xlsx", "ods", "odt");

    private ImageFiles() {
    }

    /** True for a file whose ending says it is text, a table or a document rather than an image. */
    public static boolean notAnImage(Path file) {
        String n = file.getFileName().toString().toLowerCase(java.util.Locale.ROOT);
        int dot = n.lastIndexOf('.');
        return dot >= 0 && NOT_IMAGES.contains(n.substring(dot + 1));
    }

    /**
     * Opens an image through one interface: a folder holding one DICOM series, a NIfTI-1 file
     * ({@code .nii}, {@code .nii.gz}), or any file ImageJ reads (TIFF, DICOM including multi-frame,
     * ...); a clear error when it cannot.
     */
    public static ImagePlus open(Path file) throws InputException {
        return open(file, null);
    }

    /**
     * Opens an image as {@link #open(Path)} does, keeping echo {@code echo} (1-based) of a DICOM series
     * that holds several (null: refuse such a series, naming its echoes).
     */
    public static ImagePlus open(Path file, Integer echo) throws InputException {
        if (!Files.exists(file)) {
            throw new InputException("file not found: '" + file + "': check the path");
        }
        if (Files.isDirectory(file)) {
            return DicomSeries.openFolder(file, file.getFileName().toString(), echo, ECHO_HINT);
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
        if (notAnImage(file)) {
            throw new InputException("'" + file + "' is not an image (its ending says text, a table or a document): "
                    + "give an image file (TIFF, DICOM, NIfTI) or a folder of one DICOM series");
        }
        FileChecks.requireDecodableDicom(file);
        if (DicomSeries.isDicom(file)) {
            ImagePlus dicom = DicomSeries.openFile(file, echo, ECHO_HINT);
            if (dicom != null) {
                return dicom;
            }
        }
        ImagePlus imp = DicomSeries.read(file.toAbsolutePath());
        if (imp == null || imp.getWidth() == 0 || imp.getHeight() == 0) {
            throw new InputException("cannot read '" + file + "' as an image: ImageJ does not recognise "
                    + "its format or the file is damaged; export it as TIFF or DICOM");
        }
        FileChecks.requireWhole(file, imp);
        ImagePlanes.requireGrayscale(imp);
        return imp;
    }
}
