package org.noisewise.io;

import java.io.IOException;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.List;
import java.util.concurrent.locks.ReentrantLock;
import org.noisewise.estimate.InputException;
import org.noisewise.phantom.QaLog;

/**
 * The QA log on disk. An append takes an exclusive lock on a sidecar {@code .lock} file (shared by
 * every process and thread), re-reads the log, writes the old text plus the new line to a temporary
 * file in the same folder, forces it to disk and renames it over the log. The log is therefore
 * always either the old or the new complete file, whatever kills a writer; rows already in it are
 * copied byte for byte and never changed; two writers never lose each other's rows.
 *
 * <p>The {@code .lock} file is the lock itself and stays beside the log: removing it after each
 * append would let a second writer lock a new file while a third still holds the old one. It is empty
 * and may be deleted whenever no QA run is writing. Two copies of this class in one JVM (Fiji can
 * load a plugin twice) share no in-process lock; the operating-system lock then reports an overlap,
 * and the append waits and tries again. A log begun by an earlier version keeps its own header:
 * new rows are written in its columns (columns it lacks are left out, with a note).
 */
public final class QaLogFile {

    private static final ReentrantLock IN_PROCESS = new ReentrantLock();

    private QaLogFile() {
    }

    /** The log's columns missing from an existing log's header (written by an earlier version). */
    public static List<String> missingColumns(Path log) throws InputException {
        if (!Files.exists(log)) {
            return List.of();
        }
        try {
            List<String> have = QaLog.headerOf(Files.readString(log, StandardCharsets.UTF_8));
            return QaLog.COLUMNS.stream().filter(c -> !have.contains(c)).toList();
        } catch (IOException e) {
            throw new InputException("cannot read QA log '" + log + "': " + e.getMessage());
        }
    }

    /** The operating-system lock, waiting while another copy of this class in the same JVM holds it. */
    private static FileLock lock(FileChannel ch, Path log) throws IOException, InputException {
        long deadline = System.nanoTime() + 60_000_000_000L;
        while (true) {
            try {
                return ch.lock();
            } catch (java.nio.channels.OverlappingFileLockException e) {
                if (System.nanoTime() > deadline) {
                    throw new InputException("the QA log '" + log + "' stayed locked by another run in this program for "
                            + "a minute: let it finish, then try again");
                }
                try {
                    Thread.sleep(20);
                } catch (InterruptedException ie) {
                    Thread.currentThread().interrupt();
                    throw new InputException("interrupted while waiting for the QA log '" + log + "'");
                }
            }
        }
    }

    /** Refuses an existing file that is not a Noisewise QA log (a new file is fine). */
    public static void requireLog(Path log) throws InputException {
        if (!Files.isRegularFile(log)) {
            return;
        }
        try (var in = Files.newBufferedReader(log, StandardCharsets.UTF_8)) {
            String first = in.readLine();
            if (first != null && !first.isEmpty() && !first.startsWith(QaLog.COLUMNS.get(0))) {
                throw notALog(log);
            }
        } catch (java.nio.charset.CharacterCodingException e) {
            throw notALog(log);
        } catch (IOException e) {
            throw new InputException("cannot read QA log '" + log + "': " + ImageWriter.reason(e));
        }
    }

    private static InputException notALog(Path log) {
        return new InputException("'" + log + "' is not a Noisewise QA log (its first line is not the expected header): "
                + "give another file name");
    }

    /** The rows of the log, or none when it does not exist yet. */
    public static List<QaLog.Entry> read(Path log) throws InputException {
        if (!Files.exists(log)) {
            return List.of();
        }
        try {
            return QaLog.parse(Files.readString(log, StandardCharsets.UTF_8));
        } catch (IOException e) {
            throw new InputException("cannot read QA log '" + log + "': " + e.getMessage());
        }
    }

    /** Appends one row; returns the history as it was before this row. */
    public static List<QaLog.Entry> append(Path log, QaLog.Entry entry) throws InputException {
        return append(log, history -> entry);
    }

    /**
     * Appends the row that {@code make} builds from the history as it is under the lock (so baseline
     * flags see every earlier row); returns that history.
     */
    public static List<QaLog.Entry> append(Path log, java.util.function.Function<List<QaLog.Entry>, QaLog.Entry> make)
            throws InputException {
        Path dir = log.toAbsolutePath().getParent();
        if (dir == null || !Files.isDirectory(dir)) {
            throw new InputException("folder of the QA log '" + log + "' does not exist: create it first");
        }
        // a file that is not a QA log is refused before anything (the lock file too) is made beside it
        requireLog(log);
        Path lock = log.resolveSibling(log.getFileName() + ".lock");
        IN_PROCESS.lock();
        try (FileChannel ch = FileChannel.open(lock, StandardOpenOption.CREATE, StandardOpenOption.WRITE);
             FileLock ignored = lock(ch, log)) {
            String old = Files.exists(log) ? Files.readString(log, StandardCharsets.UTF_8) : "";
            if (!old.isEmpty() && !old.startsWith(QaLog.COLUMNS.get(0))) {
                throw notALog(log);
            }
            StringBuilder text = new StringBuilder(old);
            if (old.isEmpty()) {
                text.append(QaLog.header()).append("\r\n");
            } else if (!old.endsWith("\n")) {
                text.append("\r\n");
            }
            List<QaLog.Entry> history = QaLog.parse(old);
            List<String> columns = old.isEmpty() ? QaLog.COLUMNS : QaLog.headerOf(old);
            text.append(QaLog.line(make.apply(history), columns)).append("\r\n");
            Path tmp = ImageWriter.temporaryBeside(log);
            try {
                try (FileChannel out = FileChannel.open(tmp, StandardOpenOption.WRITE)) {
                    out.write(java.nio.ByteBuffer.wrap(text.toString().getBytes(StandardCharsets.UTF_8)));
                    out.force(true);
                }
                ImageWriter.moveIntoPlace(tmp, log);
            } finally {
                ImageWriter.release(tmp);
            }
            return history;
        } catch (IOException e) {
            throw new InputException("cannot append to QA log '" + log + "': " + e.getMessage());
        } finally {
            IN_PROCESS.unlock();
        }
    }
}
