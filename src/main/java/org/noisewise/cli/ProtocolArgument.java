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
        if (text.contains("=")) {
            return Protocol.parse(text, option);
        }
        Path p = Path.of(text);
        if (!Files.exists(p)) {
            throw new InputException(option + " " + text + ": neither KEY=VALUE pairs (e.g. voxel=1x1x5,phase=256,"
                    + "averages=1,bandwidth=130,field=3) nor an existing DICOM file or folder");
        }
        ImagePlus imp = ImageFiles.open(p);
        Protocol h = ProtocolHeaders.of(imp);
        if (h.text().isEmpty()) {
            throw new InputException(option + " " + text + ": the file states no acquisition parameters (no DICOM "
                    + "header): give them as KEY=VALUE pairs instead");
        }
        return h;
    }
}
