package org.noisewise.cli;

import java.nio.file.Path;

/** Output file names per z slice: {@code OUT.tif} for one slice, {@code OUT_zN.tif} for several. */
final class OutputPaths {

    private OutputPaths() {
    }

    static Path perZ(Path out, int z, int count) {
        if (count == 1) {
            return out;
        }
        String name = out.getFileName().toString();
        int dot = name.lastIndexOf('.');
        String stem = dot > 0 ? name.substring(0, dot) : name;
        String ext = dot > 0 ? name.substring(dot) : ".tif";
        return out.resolveSibling(stem + "_z" + z + ext);
    }
}
