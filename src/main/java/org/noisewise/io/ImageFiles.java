package org.noisewise.io;

import ij.ImagePlus;
import ij.Prefs;
import ij.io.Opener;
import java.nio.file.Files;
import java.nio.file.Path;
import org.noisewise.estimate.InputException;

/** Opens image files through ImageJ's readers for the command line (no display needed). */
public final class ImageFiles {

    private ImageFiles() {
    }

    /** Opens a TIFF, DICOM or other ImageJ-readable file; a clear error when it cannot. */
    public static ImagePlus open(Path file) throws InputException {
        if (!Files.exists(file)) {
            throw new InputException("file not found: '" + file + "': check the path");
        }
        if (Files.isDirectory(file)) {
            throw new InputException("'" + file + "' is a folder: give an image file");
        }
        if (!Files.isReadable(file)) {
            throw new InputException("cannot read '" + file + "': check its permissions");
        }
        Prefs.fixedDicomScaling = true;
        Opener opener = new Opener();
        opener.setSilentMode(true);
        ImagePlus imp;
        try {
            imp = opener.openImage(file.toAbsolutePath().toString());
        } catch (RuntimeException e) {
            imp = null;
        }
        if (imp == null || imp.getWidth() == 0) {
            throw new InputException("cannot read '" + file + "' as an image: ImageJ does not recognise "
                    + "its format or the file is damaged; export it as TIFF or DICOM");
        }
        ImagePlanes.requireGrayscale(imp);
        return imp;
    }
}
