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
 * Writes output files safely: never over an existing file unless asked, never over an input, and
 * through a temporary file in the same folder ({@code .NAME.<random>.part}) renamed into place, so an
 * interrupted run leaves no half-written file. Temporary files are removed on every normal and error
 * exit and, through a shutdown hook, when the program is interrupted; those left by a killed process
 * (which no hook survives) are removed by the next write into the same folder, whatever it writes,
 * once they are older than this run.
 */
public final class ImageWriter {

    /** Temporary files this process has open, removed by the shutdown hook if still there. */
    private static final java.util.Set<Path> OPEN = java.util.concurrent.ConcurrentHashMap.newKeySet();
    private static final long STARTED = java.lang.management.ManagementFactory.getRuntimeMXBean().getStartTime();

    static {
        Runtime.getRuntime().addShutdownHook(new Thread(() -> OPEN.forEach(ImageWriter::deleteQuietly),
                "noisewise-temporary-files"));
    }

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

    /**
     * Checks that files can be created in the folder of {@code out}, saying why not (missing folder,
     * no permission, read-only file system) before anything is measured.
     */
    public static void checkFolderWritable(Path out) throws InputException {
        Path dir = out.toAbsolutePath().getParent();
        if (dir != null && Files.exists(dir) && !Files.isDirectory(dir)) {
            throw new InputException("'" + dir + "' is a file, not a folder: give a folder to write into");
        }
        if (dir == null || !Files.isDirectory(dir)) {
            throw new InputException("folder '" + dir + "' does not exist: create it first, or write elsewhere");
        }
        if (!Files.isWritable(dir)) {
            throw new InputException("cannot write in folder '" + dir + "': permission denied or a read-only file "
                    + "system; write elsewhere");
        }
    }

    /** Whether two paths name the same file (or would, once {@code a} exists). */
    public static boolean sameFile(Path a, Path b) {
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
            throw new InputException("'" + out + "' exists: choose another name", InputException.Remedy.REPLACE);
        }
        Path dir = out.toAbsolutePath().getParent();
        if (dir != null && Files.exists(dir) && !Files.isDirectory(dir)) {
            throw new InputException("'" + dir + "' is a file, not a folder: give a folder to write into");
        }
        if (dir != null && !Files.isDirectory(dir)) {
            throw new InputException("folder '" + dir + "' does not exist: create it first");
        }
    }

    /**
     * An output folder (for plots, trend plots): used when it exists, created when only its parent does
     * (as users expect of an output folder); a file of that name, or a missing parent, is refused.
     *
     * @param what what the folder is for, for messages ("plots")
     */
    public static Path outputFolder(Path dir, String what) throws InputException {
        if (Files.isDirectory(dir)) {
            return dir;
        }
        if (Files.exists(dir)) {
            throw new InputException("'" + dir + "' is a file, not a folder: give a folder for the " + what);
        }
        Path parent = dir.toAbsolutePath().getParent();
        if (parent == null || !Files.isDirectory(parent)) {
            throw new InputException("cannot create the folder for the " + what + " '" + dir + "': its parent folder '"
                    + parent + "' does not exist; create it first or give another folder");
        }
        try {
            return Files.createDirectory(dir);
        } catch (java.nio.file.FileAlreadyExistsException e) {
            return dir;
        } catch (IOException e) {
            throw new InputException("cannot create the folder for the " + what + " '" + dir + "': " + reason(e));
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
            release(tmp);
        }
    }

    /** Writes bytes atomically (the caller has checked that {@code out} may be written). */
    public static void writeBytes(byte[] bytes, Path out) throws InputException {
        Path tmp = temporaryBeside(out);
        try {
            Files.write(tmp, bytes);
            moveIntoPlace(tmp, out);
        } catch (IOException e) {
            throw new InputException("could not write '" + out + "': " + reason(e));
        } finally {
            release(tmp);
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
            throw new InputException("could not write '" + out + "': " + reason(e));
        } finally {
            release(tmp);
        }
    }

    /** The reason an I/O operation failed, in words. */
    public static String reason(IOException e) {
        if (e instanceof java.nio.file.AccessDeniedException) {
            return "permission denied";
        }
        if (e instanceof java.nio.file.NoSuchFileException) {
            return "no such folder";
        }
        if (e instanceof java.nio.file.FileSystemException f && f.getReason() != null) {
            return f.getReason();
        }
        return e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
    }

    /**
     * A new temporary file beside {@code out}, registered for removal at exit; stale ones of the same
     * target from an earlier, killed run are removed first.
     */
    public static Path temporaryBeside(Path out) throws InputException {
        Path dir = out.toAbsolutePath().getParent();
        removeStale(out);
        try {
            Path tmp = Files.createTempFile(dir, "." + out.getFileName() + ".", ".part");
            OPEN.add(tmp);
            return tmp;
        } catch (java.nio.file.AccessDeniedException e) {
            throw new InputException("cannot write in folder '" + dir + "': permission denied; write elsewhere");
        } catch (IOException e) {
            throw new InputException("cannot write in folder '" + dir + "': " + reason(e));
        }
    }

    /** The names of this class's temporary files: {@code .NAME.<digits>.part}. */
    private static final java.util.regex.Pattern TEMPORARY = java.util.regex.Pattern.compile("^\\..+\\.\\d+\\.part$");

    /**
     * Removes the temporary files of this class ({@code .NAME.<digits>.part}) in the folder of
     * {@code out} that were last written before this process started (a killed run's leftovers).
     */
    static void removeStale(Path out) {
        Path dir = out.toAbsolutePath().getParent();
        try (var files = Files.newDirectoryStream(dir, f -> TEMPORARY.matcher(f.getFileName().toString()).matches())) {
            for (Path f : files) {
                if (!OPEN.contains(f) && Files.getLastModifiedTime(f).toMillis() < STARTED) {
                    Files.deleteIfExists(f);
                }
            }
        } catch (IOException | java.nio.file.DirectoryIteratorException ignored) {
            // cleaning up after another process is a courtesy, never a reason to fail
        }
    }

    /** Removes a temporary file (after it was renamed into place, or on failure). */
    public static void release(Path tmp) {
        deleteQuietly(tmp);
        OPEN.remove(tmp);
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
            throw new InputException("could not write '" + out + "': " + reason(e));
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
