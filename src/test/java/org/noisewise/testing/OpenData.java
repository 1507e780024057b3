package org.noisewise.testing;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.zip.GZIPInputStream;

/**
 * The open-data files of the tests ({@code src/test/resources/opendata}, where their README says which
 * package each comes from and under which licence).
 */
public final class OpenData {

    private OpenData() {
    }

    /** The bytes of open-data file {@code name}; a {@code .gz} file is given uncompressed. */
    public static byte[] bytes(String name) {
        try (InputStream in = OpenData.class.getResourceAsStream("/opendata/" + name)) {
            if (in == null) {
                throw new IllegalStateException("no open-data file " + name);
            }
            return (name.endsWith(".gz") ? new GZIPInputStream(in) : in).readAllBytes();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Writes open-data file {@code name} (uncompressed) to {@code to}; returns {@code to}. */
    public static Path copy(String name, Path to) {
        try {
            return Files.write(to, bytes(name));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
