package org.noisewise.cli;

import java.nio.file.Path;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageWriter;
import org.noisewise.measure.Measurement;

/** {@code --air-mask OUT.tif}: the automatic air as an 8-bit TIFF, for the background and check commands. */
final class AirMask {

    private AirMask() {
    }

    /** Before reading: the option needs {@code --background auto} and a writable path. */
    static void check(Path out, RegionOptions regions, boolean force, Path image) throws InputException {
        check(out, regions.background.stream().anyMatch(RegionSpec::auto), force, image);
    }

    /** As above, {@code auto} saying whether automatic air was asked for. */
    static void check(Path out, boolean auto, boolean force, Path... inputs) throws InputException {
        if (out == null) {
            return;
        }
        if (!auto) {
            throw new InputException("--air-mask writes the air that --background auto finds: add --background auto, "
                    + "or leave --air-mask out");
        }
        ImageWriter.checkWritable(out, force, inputs);
    }

    /** Writes a mask image made by the measurement. */
    static void write(ij.ImagePlus mask, Path out, boolean force, Path... inputs) throws InputException {
        ImageWriter.saveTiff(mask, out, force, inputs);
    }

    /** After measuring: writes the mask image the measurement returned. */
    static void write(Measurement m, Path out, boolean force, Path image) throws InputException {
        if (out == null) {
            return;
        }
        ImageWriter.saveTiff(m.images().stream().filter(i -> i.getTitle().endsWith(" air mask")).findFirst()
                .orElseThrow(() -> new InputException("no air mask was made")), out, force, image);
    }
}
