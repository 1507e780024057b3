package org.noisewise.report;

import java.io.IOException;
import java.io.InputStream;
import java.util.Properties;

/** The version this build carries (from {@code build.properties}, written by the build), for every face. */
public final class BuildInfo {

    private BuildInfo() {
    }

    /** The project version, or "development build" when run from classes without the build's resources. */
    public static String version() {
        try (InputStream in = BuildInfo.class.getResourceAsStream("/org/noisewise/build.properties")) {
            if (in != null) {
                Properties p = new Properties();
                p.load(in);
                String v = p.getProperty("version");
                if (v != null && !v.isBlank() && !v.contains("${")) {
                    return v.trim();
                }
            }
        } catch (IOException e) {
            // fall through
        }
        return "development build";
    }

    /** How to cite Noisewise and the methods behind a figure. */
    public static String citation() {
        return "Noisewise " + version() + ", open-source software for corrected noise and SNR measurement in MR "
                + "magnitude images (MIT licence). Cite it with its version, and cite the methods behind the figures "
                + "you report: Gudbjartsson & Patz 1995 (MRM 34:910) and Constantinides et al. 1997 (MRM 38:852) for "
                + "the noise models, Koay & Basser 2006 (J Magn Reson 179:317) for the bias correction, NEMA MS 1 for "
                + "the difference method, Friedman & Glover 2006 (JMRI 23:827) for stability, Pruessmann et al. 1999 "
                + "(MRM 42:952) for the g-factor.";
    }
}
