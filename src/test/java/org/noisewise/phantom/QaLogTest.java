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

    /**
     * Issue 15.10: two copies of the log class in one JVM (as two class loaders in Fiji) share no
     * in-process lock; their appends overlap in the operating-system lock and wait instead of failing.
     */
    @Test
    void twoClassLoadersInOneJvmLoseNothing() throws Exception {
        Path log = dir.resolve("loaders.csv");
        java.net.URL classes = Path.of("target/classes").toUri().toURL();
        java.net.URL tests = Path.of("target/test-classes").toUri().toURL();
        List<Thread> threads = new ArrayList<>();
        List<Throwable> errors = java.util.Collections.synchronizedList(new ArrayList<>());
        for (int k = 0; k < 2; k++) {
            ClassLoader loader = new java.net.URLClassLoader(new java.net.URL[] {classes, tests},
                    ClassLoader.getPlatformClassLoader());
            Class<?> main = Class.forName(LogWriterMain.class.getName(), true, loader);
            String tag = "loader" + k;
            threads.add(new Thread(() -> {
                try {
                    main.getMethod("main", String[].class).invoke(null, (Object) new String[] {log.toString(), "25", tag});
                } catch (ReflectiveOperationException e) {
                    errors.add(e.getCause() == null ? e : e.getCause());
                }
            }));
        }
        threads.forEach(Thread::start);
        for (Thread t : threads) {
            t.join(120_000);
        }
        assertTrue(errors.isEmpty(), errors.toString());
        assertEquals(50, QaLogFile.read(log).size());
    }

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

    private static QaLog.Entry session(String image, String verdict, Double snr) {
        Map<String, String> v = new LinkedHashMap<>(entry(image, 0, 97).values());
        v.put("verdict", verdict);
        v.put("snr", snr == null ? "" : Double.toString(snr));
        v.put("data_id", image);
        return new QaLog.Entry(v);
    }

    /**
     * Robust baseline (median, 1.4826 x MAD with a 1% floor; common practice for control limits):
     * SNR 24, 25, 23, 24, 24 give centre 24 and spread max(1.4826 x 0, 0.24) = 0.24 (median of the
     * absolute deviations 0, 1, 1, 0, 0 is 0), so 2 and 3 spreads are 0.48 and 0.72 (closed form).
     */
    @Test
    void robustBaselineAndFlags() {
        double[] snr = {24, 25, 23, 24, 24};
        List<QaLog.Entry> history = new ArrayList<>();
        for (int i = 0; i < snr.length; i++) {
            history.add(session("w" + i, "valid", snr[i]));
        }
        String key = history.get(0).key();
        QaLog.Baseline b = QaLog.baseline(history, key, "snr", 5);
        assertTrue(b.complete());
        assertEquals(24.0, b.center(), 1e-12);
        assertEquals(0.24, b.spread(), 1e-12);
        assertEquals(24 - 0.48, b.warningLow(), 1e-12);
        assertEquals(24 + 0.72, b.actionHigh(), 1e-12);
        assertEquals("", QaLog.flag(b, 24.3, "SNR"));
        assertTrue(QaLog.flag(b, 24.6, "SNR").endsWith("(warning)"));
        assertTrue(QaLog.flag(b, 23.1, "SNR").endsWith("(action)"));
        QaLog.Baseline forming = QaLog.baseline(history.subList(0, 2), key, "snr", 5);
        assertFalse(forming.usable());
        assertEquals("", QaLog.flag(forming, 100, "SNR"));
        assertEquals(0, QaLog.baseline(history, "other | x | y", "snr", 5).sessions());
    }

    /**
     * Issue 15.2: SNR 100, 101, an invalid session (blank), 99, 100, then 50. Only valid sessions join;
     * from the third member on each candidate is judged first, so 50 is an action and never enters the
     * baseline, and a later halved SNR is still an action.
     */
    @Test
    void anOutOfControlSessionNeverEntersTheBaseline() {
        List<QaLog.Entry> history = new ArrayList<>(List.of(session("a", "valid", 100.0),
                session("b", "valid", 101.0), session("c", "invalid", null), session("d", "questionable", 60.0),
                session("e", "valid", 99.0), session("f", "valid", 100.0)));
        String key = history.get(0).key();
        QaLog.Baseline before = QaLog.baseline(history, key, "snr", 5);
        assertEquals(4, before.sessions(), "the invalid and questionable sessions stay out");
        assertTrue(QaLog.flag(before, 50, "SNR").endsWith("(action)"));
        history.add(session("g", "valid", 50.0));
        QaLog.Baseline after = QaLog.baseline(history, key, "snr", 5);
        assertEquals(4, after.sessions(), "the SNR of 50 must not join the baseline");
        assertEquals(100.0, after.center(), 1e-12);
        history.add(session("h", "valid", 100.5));
        assertEquals(5, QaLog.baseline(history, key, "snr", 5).sessions());
        assertTrue(QaLog.flag(QaLog.baseline(history, key, "snr", 5), 50, "SNR").endsWith("(action)"));
    }

    /** Limits stay within the metric's physical range; duplicates are found by their pixels and kept out. */
    @Test
    void physicalBoundsAndDuplicates() {
        List<QaLog.Entry> history = new ArrayList<>();
        for (double g : new double[] {0.1, 0.5, 0.05, 0.9, 0.2}) {
            Map<String, String> v = new LinkedHashMap<>(session("s" + g, "valid", 24.0).values());
            v.put("ghosting_percent", Double.toString(g));
            history.add(new QaLog.Entry(v));
        }
        QaLog.Baseline g = QaLog.baseline(history, history.get(0).key(), "ghosting_percent", 5);
        assertEquals(0.0, g.actionLow(), 0.0, "ghosting cannot be negative");
        Map<String, String> piu = new LinkedHashMap<>(session("p", "valid", 24.0).values());
        List<QaLog.Entry> high = new ArrayList<>();
        for (double p : new double[] {99.9, 99.0, 99.8, 99.95, 98.5}) {
            piu.put("uniformity_piu", Double.toString(p));
            piu.put("data_id", "p" + p);
            high.add(new QaLog.Entry(piu));
        }
        assertEquals(100.0, QaLog.baseline(high, high.get(0).key(), "uniformity_piu", 5).actionHigh(), 0.0);
        assertEquals("s0.5", QaLog.duplicateOf(history, "s0.5").get("data_id"));
        assertEquals(null, QaLog.duplicateOf(history, "never"));
        Map<String, String> dup = new LinkedHashMap<>(history.get(0).values());
        dup.put("flags", "duplicate: the same pixels as ...");
        assertFalse(QaLog.eligible(new QaLog.Entry(dup)));
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
        // a killed writer may leave its temporary file; the next run that writes the log removes it
        Process cleaner = writer(log, 1, "cleaner");
        assertTrue(cleaner.waitFor(60, TimeUnit.SECONDS));
        File[] leftovers = dir.toFile().listFiles((d, n) -> n.endsWith(".part"));
        assertTrue(leftovers == null || leftovers.length == 0, java.util.Arrays.toString(leftovers));
    }
}
