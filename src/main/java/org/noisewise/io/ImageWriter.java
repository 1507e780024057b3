package org.noisewise.io;

import ij.ImagePlus;
import ij.io.FileSaver;
import java.io.IOException;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import org.noisewise.estimate.InputException;

/**
 * Writes output files safely: never over an existing file unless asked, and through a temporary
 * file in the same folder renamed into place, so an interrupted run leaves no half-written file.
 */
public final class ImageWriter {

    private ImageWriter() {
    }

    /**
     * Checks that {@code out} may be written and is none of {@code inputs}: an input is never replaced,
     * even when replacing is allowed.
     */
    public static void checkWritable(Path out, boolean force, Path... inputs) throws InputException {
        for (Path in : inputs) {
            if (in != null && sameFile(out, in)) {
                throw new InputException("'" + out + "' is an input of this run: write the result to another file "
                        + "(an input is never replaced)");
            }
        }
        checkWritable(out, force);
    }

    /** Whether two paths name the same file (or would, once {@code a} exists). */
    static boolean sameFile(Path a, Path b) {
        try {
            if (Files.exists(a) && Files.exists(b)) {
                return Files.isSameFile(a, b);
            }
        } catch (IOException e) {
            // fall back to comparing the paths
        }
        return a.toAbsolutePath().normalize().equals(b.toAbsolutePath().normalize());
    }

    /** Checks that {@code out} may be written. */
    public static void checkWritable(Path out, boolean force) throws InputException {
        if (Files.isDirectory(out)) {
            throw new InputException("'" + out + "' is a folder: give a file name for the output");
        }
        if (Files.exists(out) && !force) {
            throw new InputException("'" + out + "' exists: choose another name or add --force to replace it");
        }
        Path dir = out.toAbsolutePath().getParent();
        if (dir != null && !Files.isDirectory(dir)) {
            throw new InputException("folder '" + dir + "' does not exist: create it first");
        }
    }

    /** Saves {@code imp} as TIFF (a multi-page TIFF for stacks) at {@code out}, which is none of {@code inputs}. */
    public static void saveTiff(ImagePlus imp, Path out, boolean force, Path... inputs) throws InputException {
        save(out, force, inputs, tmp -> imp.getStackSize() > 1 ? new FileSaver(imp).saveAsTiffStack(tmp)
                : new FileSaver(imp).saveAsTiff(tmp));
    }

    /** Saves {@code imp} as PNG at {@code out}, which is none of {@code inputs}. */
    public static void savePng(ImagePlus imp, Path out, boolean force, Path... inputs) throws InputException {
        save(out, force, inputs, tmp -> new FileSaver(imp).saveAsPng(tmp));
    }

    private static void save(Path out, boolean force, Path[] inputs, java.util.function.Predicate<String> writer)
            throws InputException {
        checkWritable(out, force, inputs);
        Path tmp = temporaryBeside(out);
        try {
            if (!writer.test(tmp.toString())) {
                throw new InputException("could not write '" + out + "': check the disk and permissions");
            }
            moveIntoPlace(tmp, out);
        } finally {
            deleteQuietly(tmp);
        }
    }

    /** Writes bytes atomically (the caller has checked that {@code out} may be written). */
    public static void writeBytes(byte[] bytes, Path out) throws InputException {
        Path tmp = temporaryBeside(out);
        try {
            Files.write(tmp, bytes);
            moveIntoPlace(tmp, out);
        } catch (IOException e) {
            throw new InputException("could not write '" + out + "': " + e.getMessage());
        } finally {
            deleteQuietly(tmp);
        }
    }

    /** Writes text atomically. */
    public static void writeText(String text, Path out, boolean force) throws InputException {
        checkWritable(out, force);
        Path tmp = temporaryBeside(out);
        try {
            Files.writeString(tmp, text);
            moveIntoPlace(tmp, out);
        } catch (IOException e) {
            throw new InputException("could not write '" + out + "': " + e.getMessage());
        } finally {
            deleteQuietly(tmp);
        }
    }

    static Path temporaryBeside(Path out) throws InputException {
        Path dir = out.toAbsolutePath().getParent();
        try {
            return Files.createTempFile(dir, "." + out.getFileName() + ".", ".part");
        } catch (IOException e) {
            throw new InputException("cannot write in '" + dir + "': " + e.getMessage());
        }
    }

    public static void moveIntoPlace(Path tmp, Path out) throws InputException {
        try {
            // temporary files are created private (rw-------); the result gets ordinary permissions
            try {
                java.util.Set<java.nio.file.attribute.PosixFilePermission> perms = Files.exists(out)
                        ? Files.getPosixFilePermissions(out)
                        : java.nio.file.attribute.PosixFilePermissions.fromString("rw-r--r--");
                Files.setPosixFilePermissions(tmp, perms);
            } catch (UnsupportedOperationException ignored) {
                // not a POSIX file system: keep the default
            }
            try {
                Files.move(tmp, out, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, out, StandardCopyOption.REPLACE_EXISTING);
            }
        } catch (IOException e) {
            throw new InputException("could not write '" + out + "': " + e.getMessage());
        }
    }

    private static void deleteQuietly(Path p) {
        try {
            Files.deleteIfExists(p);
        } catch (IOException ignored) {
            // a leftover temporary file is harmless and named as such
        }
    }
}
