package org.noisewise.phantom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.File;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.estimate.InputException;
import org.noisewise.io.QaLogFile;
import org.noisewise.testing.LogWriterMain;

class QaLogTest {

    @TempDir
    Path dir;

    private static QaLog.Entry entry(String image, double snr, double piu) {
        Map<String, String> v = new LinkedHashMap<>(LogWriterMain.entry(image, 0).values());
        v.put("image", image);
        v.put("snr", Double.toString(snr));
        v.put("uniformity_piu", Double.toString(piu));
        return new QaLog.Entry(v);
    }

    @Test
    void appendKeepsHistoryAndQuotesFields() throws Exception {
        Path log = dir.resolve("qa.csv");
        assertTrue(QaLogFile.read(log).isEmpty());
        QaLogFile.append(log, entry("w1", 24, 97));
        String first = Files.readString(log);
        List<QaLog.Entry> before = QaLogFile.append(log, entry("w2", 25, 96));
        assertEquals(1, before.size());
        String second = Files.readString(log);
        assertTrue(second.startsWith(first), "an append changed earlier rows");
        List<QaLog.Entry> rows = QaLogFile.read(log);
        assertEquals(2, rows.size());
        assertEquals("head, 1 channel", rows.get(1).get("coil"));
        assertEquals("weekly \"uniformity\"", rows.get(1).get("protocol"));
        assertEquals(25.0, rows.get(1).number("snr"));
        Path other = dir.resolve("other.csv");
        Files.writeString(other, "name,value\nx,1\n");
        InputException e = assertThrows(InputException.class, () -> QaLogFile.append(other, entry("w", 1, 1)));
        assertTrue(e.getMessage().contains("not a Noisewise QA log"));
        assertEquals("name,value\nx,1\n", Files.readString(other), "a foreign file was changed");
    }

    /** Baseline from the first N sessions: mean and SD (N - 1); 2 SD warning, 3 SD action. */
    @Test
    void baselineAndFlags() {
        double[] snr = {24, 25, 23, 24, 24};
        List<QaLog.Entry> history = new ArrayList<>();
        for (int i = 0; i < snr.length; i++) {
            history.add(entry("w" + i, snr[i], 97));
        }
        history.add(entry("late", 40, 97)); // not part of a 5-session baseline
        String key = history.get(0).key();
        QaLog.Baseline b = QaLog.baseline(history, key, "snr", 5);
        assertTrue(b.complete());
        assertEquals(24.0, b.mean(), 1e-12);
        assertEquals(Math.sqrt(2.0 / 4), b.sd(), 1e-12); // deviations 0,1,-1,0,0: sum of squares 2, N-1 = 4
        assertEquals("", QaLog.flag(b, 24.9, "SNR"));
        assertTrue(QaLog.flag(b, 25.6, "SNR").endsWith("(warning)"));
        assertTrue(QaLog.flag(b, 21.8, "SNR").endsWith("(action)")); // z = -3.1
        QaLog.Baseline forming = QaLog.baseline(history.subList(0, 3), key, "snr", 5);
        assertFalse(forming.complete());
        assertEquals("", QaLog.flag(forming, 100, "SNR"));
        QaLog.Baseline otherKey = QaLog.baseline(history, "other | x | y", "snr", 5);
        assertEquals(0, otherKey.sessions());
    }

    private Process writer(Path log, int count, String tag) throws Exception {
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        return new ProcessBuilder(java, "-cp", System.getProperty("java.class.path"), LogWriterMain.class.getName(),
                log.toString(), Integer.toString(count), tag).redirectErrorStream(true)
                .redirectOutput(dir.resolve(tag + ".out").toFile()).start();
    }

    /** Two processes and two threads appending at once: nothing is lost, every line is whole. */
    @Test
    void concurrentWritersLoseNothing() throws Exception {
        Path log = dir.resolve("shared.csv");
        Process a = writer(log, 20, "procA");
        Process b = writer(log, 20, "procB");
        Thread t1 = new Thread(() -> appendMany(log, "thread1", 15));
        Thread t2 = new Thread(() -> appendMany(log, "thread2", 15));
        t1.start();
        t2.start();
        assertTrue(a.waitFor(120, TimeUnit.SECONDS) && b.waitFor(120, TimeUnit.SECONDS), "writers did not finish");
        t1.join();
        t2.join();
        assertEquals(0, a.exitValue(), Files.readString(dir.resolve("procA.out")));
        assertEquals(0, b.exitValue(), Files.readString(dir.resolve("procB.out")));
        List<QaLog.Entry> rows = QaLogFile.read(log);
        assertEquals(70, rows.size());
        Set<String> images = new HashSet<>();
        rows.forEach(r -> images.add(r.get("image")));
        assertEquals(70, images.size(), "a row was lost or duplicated");
        assertEquals(71, Files.readAllLines(log).size(), "header plus one line per row");
    }

    private static void appendMany(Path log, String tag, int n) {
        for (int i = 0; i < n; i++) {
            try {
                QaLogFile.append(log, LogWriterMain.entry(tag, i));
            } catch (InputException e) {
                throw new IllegalStateException(e);
            }
        }
    }

    /** A writer killed at a random moment leaves a log of whole rows that the next append extends. */
    @Test
    void killedWriterLeavesTheLogIntact() throws Exception {
        Path log = dir.resolve("killed.csv");
        QaLogFile.append(log, entry("before", 24, 97));
        Process p = writer(log, 0, "victim");
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
        while (QaLogFile.read(log).size() < 10 && System.nanoTime() < deadline) {
            Thread.sleep(20);
        }
        p.destroyForcibly();
        assertTrue(p.waitFor(30, TimeUnit.SECONDS));
        List<String> lines = Files.readAllLines(log);
        List<QaLog.Entry> rows = QaLogFile.read(log);
        assertTrue(rows.size() >= 10, "the writer did not get going: " + rows.size());
        assertEquals(lines.size() - 1, rows.size(), "a partial line was left in the log");
        assertEquals("before", rows.get(0).get("image"));
        QaLogFile.append(log, entry("after", 24, 97));
        List<QaLog.Entry> again = QaLogFile.read(log);
        assertEquals(rows.size() + 1, again.size());
        assertEquals("after", again.get(again.size() - 1).get("image"));
        File[] leftovers = dir.toFile().listFiles((d, n) -> n.endsWith(".part"));
        // a killed writer may leave its temporary file; it is named as such and never read as the log
        assertTrue(leftovers == null || leftovers.length <= 1);
    }
}
