package org.noisewise.cli;

import ij.ImagePlus;
import java.nio.file.Files;
import java.nio.file.Path;
import org.noisewise.estimate.InputException;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ProtocolHeaders;
import org.noisewise.protocol.Protocol;

/** A protocol on the command line: a {@code KEY=VALUE} list, or a DICOM file or series folder to read it from. */
final class ProtocolArgument {

    private ProtocolArgument() {
    }

    /**
     * @param option the option's name, for messages
     */
    static Protocol resolve(String text, String option) throws InputException {
        if (text == null || text.isBlank()) {
            return Protocol.parse(text, option);
        }
        // FILE, or FILE,KEY=VALUE,...: the header's protocol completed or overridden by the pairs
        String[] parts = text.split(",", 2);
        String first = parts[0].trim();
        if (!first.contains("=") && !first.isEmpty()) {
            Path p = Path.of(first);
            if (!Files.exists(p)) {
                throw new InputException(option + " " + text + ": neither KEY=VALUE pairs (e.g. voxel=1x1x5,phase=256,"
                        + "averages=1,bandwidth=130,field=3) nor an existing DICOM file or folder ('" + first
                        + "' does not exist)");
            }
            ImagePlus imp = ImageFiles.open(p);
            Protocol h = ProtocolHeaders.of(imp);
            Protocol extra = parts.length > 1 ? Protocol.parse(parts[1], option) : null;
            if (h.text().isEmpty() && extra == null) {
                throw new InputException(option + " " + text + ": the file states no acquisition parameters (no DICOM "
                        + "header): give them as KEY=VALUE pairs, or complete the file's with FILE,KEY=VALUE,...");
            }
            return extra == null ? h : h.overriddenBy(extra);
        }
        return Protocol.parse(text, option);
    }
}
