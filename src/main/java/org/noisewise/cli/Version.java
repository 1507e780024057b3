package org.noisewise.cli;

import org.noisewise.report.BuildInfo;
import picocli.CommandLine.IVersionProvider;

/** The build's version, licence and how to cite. */
public class Version implements IVersionProvider {
    @Override
    public String[] getVersion() {
        return new String[] {"noisewise " + BuildInfo.version() + " (MIT licence)", "How to cite: " + BuildInfo.citation()};
    }
}
