package org.noisewise;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/** The core stays pure Java: no ImageJ, no printing, no dialogs (conventions.md, "The shape"). */
class ArchitectureTest {

    private static final List<String> CORE = List.of("math", "dist", "estimate", "diagnose", "phantom", "series",
            "protocol", "report", "sample");

    @Test
    void corePackagesDoNotTouchImageJOrTheConsole() throws IOException {
        for (String pkg : CORE) {
            Path dir = Path.of("src/main/java/org/noisewise", pkg);
            assertTrue(Files.isDirectory(dir), dir.toString());
            try (Stream<Path> files = Files.walk(dir)) {
                List<String> offenders = files.filter(p -> p.toString().endsWith(".java")).filter(p -> {
                    try {
                        String s = Files.readString(p);
                        return s.contains("import ij.") || s.contains("System.out") || s.contains("System.err")
                                || s.contains("java.awt");
                    } catch (IOException e) {
                        throw new IllegalStateException(e);
                    }
                }).map(Path::toString).toList();
                assertEquals(List.of(), offenders, "core code must not use ImageJ, AWT or the console");
            }
        }
    }

    @Test
    void everyPackageSaysWhatItIsFor() throws IOException {
        try (Stream<Path> dirs = Files.list(Path.of("src/main/java/org/noisewise"))) {
            for (Path d : dirs.filter(Files::isDirectory).toList()) {
                assertTrue(Files.exists(d.resolve("package-info.java")), "no package-info.java in " + d);
            }
        }
    }
}
