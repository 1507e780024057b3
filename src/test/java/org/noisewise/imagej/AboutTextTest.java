package org.noisewise.imagej;

import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.noisewise.cli.CliRunnerAccess;

/** About shows the version, licence, cautions and how to cite; the command line's --version says the same. */
class AboutTextTest {

    @Test
    void aboutHasVersionLicenceAndCitation() {
        String t = AboutCommand.text();
        String version = org.noisewise.report.BuildInfo.version();
        assertTrue(version.matches("\\d+\\.\\d+\\.\\d+.*"), "no version from the build: " + version);
        assertTrue(t.contains(version), t);
        assertTrue(t.contains("Licence: MIT"), t);
        assertTrue(t.contains("How to cite") && t.contains("Koay & Basser 2006"), t);
        assertTrue(t.contains("medical physicist"), t);
        String v = CliRunnerAccess.version();
        assertTrue(v.contains(version) && v.contains("How to cite"), v);
    }
}
