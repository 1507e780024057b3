package org.noisewise.bench;

import ij.ImagePlus;
import ij.io.FileSaver;
import ij.process.FloatProcessor;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.stream.Stream;

/**
 * Benchmark (not a test): {@code background}, {@code check} and {@code qa} on an 8000 x 8000 32-bit
 * image (a generated disc phantom, A = 500, sigma = 20, 256 MB), each as a whole process with
 * {@code -Xmx2g} and {@code --progress}, as a user runs them. Printed: the time of each against the
 * 10 s target (as a ratio), the longest silence between two progress lines on stderr, and the
 * report's size (its slice is embedded downsampled). Argument: the application jar. The image is
 * written to a temporary folder that is removed afterwards. Run: {@code docs/run-benchmarks.sh}.
 */
public final class LargeImageBenchmark {

    static final int N = 8000;

    private LargeImageBenchmark() {
    }

    static void write(Path file) {
        float[] p = new float[N * N];
        SplittableRandom r = new SplittableRandom(5);
        double radius = 0.35 * N;
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double dx = x - N / 2.0;
                double dy = y - N / 2.0;
                double a = dx * dx + dy * dy < radius * radius ? 500 : 0;
                double re = a + 20 * r.nextGaussian();
                double im = 20 * r.nextGaussian();
                p[y * N + x] = (float) Math.sqrt(re * re + im * im);
            }
        }
        if (!new FileSaver(new ImagePlus("large", new FloatProcessor(N, N, p))).saveAsTiff(file.toString())) {
            throw new IllegalStateException("could not write " + file);
        }
    }

    /** Runs one command; returns {seconds, longest silence in seconds, exit status}. */
    static double[] run(List<String> command) throws IOException, InterruptedException {
        ProcessBuilder pb = new ProcessBuilder(command);
        pb.redirectOutput(ProcessBuilder.Redirect.DISCARD);
        long start = System.nanoTime();
        Process p = pb.start();
        long last = start;
        long longest = 0;
        try (BufferedReader err = new BufferedReader(new InputStreamReader(p.getErrorStream(), StandardCharsets.UTF_8))) {
            String line;
            while ((line = err.readLine()) != null) {
                long now = System.nanoTime();
                longest = Math.max(longest, now - last);
                last = now;
                if (line.contains("error")) {
                    System.out.println("    " + line);
                }
            }
        }
        int status = p.waitFor();
        long end = System.nanoTime();
        longest = Math.max(longest, end - last);
        return new double[] {(end - start) / 1e9, longest / 1e9, status};
    }

    public static void main(String[] args) throws Exception {
        if (args.length != 1) {
            throw new IllegalArgumentException("usage: LargeImageBenchmark target/noisewise.jar");
        }
        String jar = args[0];
        Path dir = Files.createTempDirectory("noisewise-large-");
        try {
            Path image = dir.resolve("large.tif");
            write(image);
            Path report = dir.resolve("report.html");
            String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
            List<String> bg = List.of("--background", "0,0,1000,1000", "--background", "7000,0,1000,1000",
                    "--background", "0,7000,1000,1000", "--background", "7000,7000,1000,1000");
            List<List<String>> commands = new ArrayList<>();
            List<String> background = new ArrayList<>(List.of("background", image.toString(), "--signal",
                    "3000,3000,2000,2000"));
            background.addAll(bg);
            commands.add(background);
            List<String> check = new ArrayList<>(List.of("check", image.toString()));
            check.addAll(bg);
            commands.add(check);
            commands.add(List.of("qa", image.toString(), "--report", report.toString()));
            System.out.printf(Locale.ROOT, "large image: %d x %d 32-bit (%.0f MB), each command a process with -Xmx2g, "
                    + "%d cores:%n", N, N, Files.size(image) / 1e6, Runtime.getRuntime().availableProcessors());
            for (List<String> c : commands) {
                List<String> cmd = new ArrayList<>(List.of(java, "-Xmx2g", "-jar", jar));
                cmd.addAll(c);
                cmd.add("--progress");
                double[] r = run(cmd);
                System.out.printf(Locale.ROOT, "  %-10s %6.1f s = %.2f of the 10 s target; longest silence %.1f s; exit %d%n",
                        c.get(0), r[0], r[0] / 10.0, r[1], (int) r[2]);
            }
            if (Files.exists(report)) {
                System.out.printf(Locale.ROOT, "  qa report: %.2f MB (slice embedded at most 1024 pixels on the long side)%n",
                        Files.size(report) / 1e6);
            }
        } finally {
            try (Stream<Path> s = Files.walk(dir)) {
                for (Path p : s.sorted(Comparator.reverseOrder()).toList()) {
                    Files.deleteIfExists(p);
                }
            }
        }
    }
}
