package org.noisewise.cli;

import picocli.CommandLine.IVersionProvider;

/** Version from the jar manifest, or "development". */
public class Version implements IVersionProvider {
    @Override
    public String[] getVersion() {
        String v = Version.class.getPackage().getImplementationVersion();
        return new String[] {"noisewise " + (v == null ? "development build" : v)};
    }
}
