package org.noisewise.bench;

import ij.ImagePlus;
import ij.Prefs;
import ij.plugin.Duplicator;
import ij.plugin.FolderOpener;
import ij.plugin.HyperStackConverter;
import ij.plugin.ImageCalculator;
import ij.plugin.ZProjector;
import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import org.noisewise.io.DicomSeriesWriter;
import org.noisewise.io.ImageFiles;
import org.noisewise.sample.Phantoms;

/**
 * Benchmark (not a test): a weekly functional-QA export, 30 slices x 200 volumes of 64 x 64 16-bit
 * single-frame MR files (6,000 files, time-major Instance Numbers, Temporal Position Identifier),
 * read and measured as a user does, each contender a whole process from the files as stored:
 *
 * <ul>
 * <li>{@code noisewise repeat DIR --signal ...} and {@code noisewise stability DIR} (reading,
 * arrangement, every slice measured);</li>
 * <li>ImageJ's route: File > Import > Image Sequence of the folder ({@code FolderOpener}), then
 * Image > Hyperstacks > Stack to Hyperstack (30 slices, 200 frames), and, for the maps, per slice:
 * Image > Duplicate of its frames, Z Project (average, SD) and Image Calculator (divide);</li>
 * <li>one plain streaming pass: every file's bytes read once and summed;</li>
 * <li>an archive of {@value #WEEKS} such series (one folder each), where the start of the Java
 * virtual machine counts once: {@code noisewise batch ROOT --method repeat --signal ...} against
 * ImageJ's route in one session (a macro importing and arranging each folder, optionally with the
 * maps).</li>
 * <li>when a python3 with pydicom and numpy is found (Debian: {@code python3-pydicom},
 * {@code python3-numpy}), the route a Python user takes: a script that reads every file with
 * pydicom, places it by position and temporal position and makes the maps per slice with numpy
 * ({@code pydicom_route.py} beside this class).</li>
 * </ul>
 *
 * Runs interleaved (A B C ... A B C) after one warm-up round, median of the per-round ratios. Then, in
 * this process, the bytes allocated while Noisewise reads the folder and the heap it keeps, each
 * against the pixel data, and the smallest heap with which each whole command completes. Targets: at
 * least 3x faster than ImageJ's route; memory at most twice the pixel data. Argument: the application
 * jar. Run: {@code docs/run-benchmarks.sh}.
 */
public final class DicomSeriesBenchmark {

    static final int W = 64;
    static final int Z = 30;
    static final int T = 200;
    static final String SIGNAL = "22,22,20,20";
    /** Series in the archive that batch walks. */
    static final int WEEKS = 4;

    private DicomSeriesBenchmark() {
    }

    static void write(Path dir) throws IOException {
        DicomSeriesWriter.Spec s = new DicomSeriesWriter.Spec("bench", W, W, Z, T).geometry(3, 3, 3.3);
        for (int z = 0; z < Z; z++) {
            for (int t = 0; t < T; t++) {
                float[] v = Phantoms.disk(W, W, W / 2.0, W / 2.0, 22, 800 + 10 * z, 8, 1, 1000L * z + t);
                short[] p = new short[v.length];
                for (int i = 0; i < v.length; i++) {
                    p[i] = (short) Math.round(v[i]);
                }
                s.image(z, t, p, 1, 0);
            }
        }
        for (DicomSeriesWriter.File f : DicomSeriesWriter.singleFrame(s)) {
            Files.write(dir.resolve(f.name()), f.bytes());
        }
    }

    /** ImageJ's route as a user takes it (in a process of its own): import, hyperstack, and optionally the maps. */
    public static final class ImageJRoute {
        public static void main(String[] args) {
            Prefs.fixedDicomScaling = true;
            ImagePlus imp = FolderOpener.open(args[0]);
            ImagePlus hyper = HyperStackConverter.toHyperStack(imp, 1, Z, T, "xyczt", "grayscale");
            double sum = 0;
            if (args.length > 1 && args[1].equals("maps")) {
                for (int z = 1; z <= Z; z++) {
                    ImagePlus frames = new Duplicator().run(hyper, 1, 1, z, z, 1, T);
                    ImagePlus mean = ZProjector.run(frames, "avg");
                    ImagePlus sd = ZProjector.run(frames, "sd");
                    ImagePlus snr = ImageCalculator.run(mean, sd, "divide create 32-bit");
                    sum += snr.getProcessor().getf(W / 2 * W + W / 2);
                }
            }
            System.out.println(hyper.getNSlices() + " " + hyper.getNFrames() + " " + sum);
        }
    }

    /**
     * ImageJ's route over an archive of series in one session (a macro looping over the folders): each
     * imported and arranged as a hyperstack, optionally with its maps per slice; arguments: "maps" or
     * "import", then the folders.
     */
    public static final class ImageJArchiveRoute {
        public static void main(String[] args) {
            for (int i = 1; i < args.length; i++) {
                ImageJRoute.main(args[0].equals("maps") ? new String[] {args[i], "maps"} : new String[] {args[i]});
            }
        }
    }

    /** One plain streaming pass over the files (in a process of its own). */
    public static final class StreamingPass {
        public static void main(String[] args) throws IOException {
            long sum = 0;
            try (Stream<Path> s = Files.list(Path.of(args[0]))) {
                for (Path p : s.sorted().toList()) {
                    for (byte b : Files.readAllBytes(p)) {
                        sum += b;
                    }
                }
            }
            System.out.println(sum);
        }
    }

    static double run(List<String> cmd) throws IOException, InterruptedException {
        ProcessBuilder pb = new ProcessBuilder(cmd);
        pb.redirectOutput(ProcessBuilder.Redirect.DISCARD);
        pb.redirectError(ProcessBuilder.Redirect.DISCARD);
        long t0 = System.nanoTime();
        int status = pb.start().waitFor();
        double s = (System.nanoTime() - t0) / 1e9;
        if (status != 0) {
            throw new IllegalStateException("exit " + status + ": " + cmd);
        }
        return s;
    }

    static double median(double[] v) {
        double[] c = v.clone();
        Arrays.sort(c);
        return c[c.length / 2];
    }

    public static void main(String[] args) throws Exception {
        if (args.length != 1) {
            throw new IllegalArgumentException("usage: DicomSeriesBenchmark target/noisewise.jar");
        }
        String jar = args[0];
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        String cp = jar + System.getProperty("path.separator") + System.getProperty("java.class.path");
        Path dir = Files.createTempDirectory("noisewise-dicom-bench-");
        Path archive = null;
        try {
            write(dir);
            long bytes = 0;
            try (Stream<Path> s = Files.list(dir)) {
                for (Path p : s.toList()) {
                    bytes += Files.size(p);
                }
            }
            // an archive of four weekly exports of the same protocol, each folder a copy of the series
            archive = Files.createTempDirectory("noisewise-dicom-archive-");
            List<String> weeks = new ArrayList<>();
            for (int k = 1; k <= WEEKS; k++) {
                Path week = Files.createDirectory(archive.resolve("week" + k));
                try (Stream<Path> s = Files.list(dir)) {
                    for (Path p : s.toList()) {
                        Files.copy(p, week.resolve(p.getFileName()));
                    }
                }
                weeks.add(week.toString());
            }
            double pixelBytes = 2.0 * W * W * Z * T;
            System.out.printf(Locale.ROOT, "DICOM folder: %d files of %dx%d (%d slices x %d repeats), %.1f MB on disk, "
                    + "%.1f MB of pixel data; %d cores%n", Z * T, W, W, Z, T, bytes / 1e6, pixelBytes / 1e6,
                    Runtime.getRuntime().availableProcessors());
            List<List<String>> contenders = new ArrayList<>(List.of(
                    List.of(java, "-jar", jar, "repeat", dir.toString(), "--signal", SIGNAL),
                    List.of(java, "-jar", jar, "stability", dir.toString()),
                    List.of(java, "-Djava.awt.headless=true", "-cp", cp, ImageJRoute.class.getName(), dir.toString()),
                    List.of(java, "-Djava.awt.headless=true", "-cp", cp, ImageJRoute.class.getName(), dir.toString(),
                            "maps"),
                    List.of(java, "-cp", cp, StreamingPass.class.getName(), dir.toString()),
                    List.of(java, "-jar", jar, "batch", archive.toString(), "--method", "repeat", "--signal", SIGNAL),
                    concat(List.of(java, "-Djava.awt.headless=true", "-cp", cp, ImageJArchiveRoute.class.getName(),
                            "import"), weeks),
                    concat(List.of(java, "-Djava.awt.headless=true", "-cp", cp, ImageJArchiveRoute.class.getName(),
                            "maps"), weeks)));
            List<String> names = new ArrayList<>(List.of("noisewise repeat", "noisewise stability",
                    "ImageJ: import + hyperstack", "ImageJ: import + hyperstack + maps per slice", "plain streaming pass",
                    "noisewise batch --method repeat, " + WEEKS + " series",
                    "ImageJ: " + WEEKS + " series imported in one session",
                    "ImageJ: " + WEEKS + " series imported + maps, one session"));
            List<int[]> pairs = new ArrayList<>(List.of(new int[] {2, 0}, new int[] {3, 0}, new int[] {2, 1},
                    new int[] {0, 4}, new int[] {1, 4}, new int[] {6, 5}, new int[] {7, 5}));
            List<String> labels = new ArrayList<>(List.of("ImageJ import / noisewise repeat",
                    "ImageJ import + maps / noisewise repeat", "ImageJ import / noisewise stability",
                    "noisewise repeat / streaming pass", "noisewise stability / streaming pass",
                    WEEKS + " series: ImageJ import / noisewise batch",
                    WEEKS + " series: ImageJ import + maps / noisewise batch"));
            String python = pythonWithPydicom();
            if (python != null) {
                contenders.add(List.of(python, pydicomScript().toString(), dir.toString(), "maps"));
                names.add("pydicom + numpy script: read, arrange, maps");
                pairs.add(new int[] {contenders.size() - 1, 0});
                labels.add("pydicom + numpy script / noisewise repeat");
            } else {
                System.out.println("  (the pydicom + numpy contender is left out: no python3 with pydicom and numpy; "
                        + "on Debian: apt-get install python3-pydicom python3-numpy)");
            }
            int rounds = 5;
            double[][] t = new double[contenders.size()][rounds];
            for (List<String> c : contenders) {
                run(c); // warm-up: file cache, class data
            }
            for (int r = 0; r < rounds; r++) {
                for (int c = 0; c < contenders.size(); c++) {
                    t[c][r] = run(contenders.get(c));
                }
            }
            for (int c = 0; c < contenders.size(); c++) {
                System.out.printf(Locale.ROOT, "  %-50s median %.2f s (whole process)%n", names.get(c), median(t[c]));
            }
            for (int i = 0; i < pairs.size(); i++) {
                int a = pairs.get(i)[0];
                int b = pairs.get(i)[1];
                double[] ratio = new double[rounds];
                for (int r = 0; r < rounds; r++) {
                    ratio[r] = t[a][r] / t[b][r];
                }
                System.out.printf(Locale.ROOT, "  %-50s %.2fx (median of %d interleaved rounds)%n", labels.get(i),
                        median(ratio), rounds);
            }
            memory(dir, pixelBytes);
            for (int c = 0; c < 2; c++) {
                List<String> cmd = contenders.get(c);
                int mb = smallestHeap(cmd, pixelBytes);
                System.out.printf(Locale.ROOT, "  %-50s %s%n", names.get(c) + ": smallest heap that completes",
                        mb < 0 ? "more than twice the pixel data" : String.format(Locale.ROOT, "%d MB, %.2fx the pixel "
                                + "data (target at most 2x; steps of 5 MB)", mb, mb * 1e6 / pixelBytes));
            }
        } finally {
            delete(dir);
            delete(archive);
        }
    }

    private static void delete(Path root) throws IOException {
        if (root == null || !Files.exists(root)) {
            return;
        }
        try (Stream<Path> s = Files.walk(root)) {
            for (Path p : s.sorted(Comparator.reverseOrder()).toList()) {
                Files.deleteIfExists(p);
            }
        }
    }

    /** A python3 that imports pydicom and numpy (the system's first), or null. */
    static String pythonWithPydicom() throws InterruptedException {
        for (String python : new String[] {"/usr/bin/python3", "python3"}) {
            try {
                Process p = new ProcessBuilder(python, "-c", "import pydicom, numpy")
                        .redirectOutput(ProcessBuilder.Redirect.DISCARD)
                        .redirectError(ProcessBuilder.Redirect.DISCARD).start();
                if (p.waitFor() == 0) {
                    return python;
                }
            } catch (IOException e) {
                // not installed there
            }
        }
        return null;
    }

    /** The pydicom + numpy route's script, as built into the test classes. */
    static Path pydicomScript() throws java.net.URISyntaxException {
        return Path.of(DicomSeriesBenchmark.class.getResource("pydicom_route.py").toURI());
    }

    private static List<String> concat(List<String> a, List<String> b) {
        List<String> out = new ArrayList<>(a);
        out.addAll(b);
        return out;
    }

    /**
     * The smallest Java heap (-Xmx, in steps of 5 MB, from half the pixel data up to twice it) with which
     * the whole command completes, or -1 when even twice the pixel data is not enough.
     */
    static int smallestHeap(List<String> cmd, double pixelBytes) throws IOException, InterruptedException {
        int most = (int) Math.floor(2 * pixelBytes / 1e6);
        for (int mb = (int) Math.ceil(pixelBytes / 2e6 / 5) * 5; mb <= most; mb += 5) {
            List<String> withHeap = new ArrayList<>(cmd);
            withHeap.add(1, "-Xmx" + mb + "m");
            ProcessBuilder pb = new ProcessBuilder(withHeap);
            pb.redirectOutput(ProcessBuilder.Redirect.DISCARD);
            pb.redirectError(ProcessBuilder.Redirect.DISCARD);
            if (pb.start().waitFor() == 0) {
                return mb;
            }
        }
        return -1;
    }

    /** Bytes allocated by every thread while the folder is read, and the heap kept afterwards, per pixel byte. */
    static void memory(Path dir, double pixelBytes) throws Exception {
        com.sun.management.ThreadMXBean threads = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
        ImageFiles.open(dir); // warm the workers and classes
        System.gc();
        long before = allocated(threads);
        long heapBefore = usedAfterGc();
        ImagePlus imp = ImageFiles.open(dir);
        long after = allocated(threads);
        long heapAfter = usedAfterGc();
        System.out.printf(Locale.ROOT, "  memory while reading (%d planes): allocated %.2fx the pixel data, kept %.2fx "
                + "(target at most 2x)%n", imp.getStackSize(), (after - before) / pixelBytes,
                (heapAfter - heapBefore) / pixelBytes);
    }

    private static long allocated(com.sun.management.ThreadMXBean threads) {
        long sum = 0;
        List<Long> ids = new ArrayList<>();
        for (long id : threads.getAllThreadIds()) {
            ids.add(id);
        }
        for (long id : ids) {
            long a = threads.getThreadAllocatedBytes(id);
            if (a > 0) {
                sum += a;
            }
        }
        return sum;
    }

    private static long usedAfterGc() throws InterruptedException {
        for (int i = 0; i < 3; i++) {
            System.gc();
            Thread.sleep(50);
        }
        Runtime r = Runtime.getRuntime();
        return r.totalMemory() - r.freeMemory();
    }
}
