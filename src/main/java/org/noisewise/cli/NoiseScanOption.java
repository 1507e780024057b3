package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Path;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageFiles;
import picocli.CommandLine.Option;

/** {@code --noise-scan NOISE}: a noise-only scan of the same protocol (background and check). */
final class NoiseScanOption {

    @Option(names = "--noise-scan", paramLabel = "NOISE",
            description = "A noise-only scan: the same protocol acquired with the RF transmitter off, reconstructed "
                    + "as the image is (one slice, or one per slice). Sigma is measured in the signal region's own "
                    + "pixels of the scan, so noise that varies over the image (parallel imaging, filters) is "
                    + "handled; the scan is checked (no structure, not masked, not clipped).")
    Path path;

    boolean given() {
        return path != null;
    }

    /** Opens the scan (null when not given). */
    ImagePlus open(Integer echo) throws InputException {
        return path == null ? null : ImageFiles.open(path, echo);
    }

    String title() {
        return path == null ? null : path.getFileName().toString();
    }
}
