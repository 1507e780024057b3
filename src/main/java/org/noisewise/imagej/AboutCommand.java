package org.noisewise.imagej;

import ij.IJ;
import ij.plugin.PlugIn;
import org.noisewise.report.BuildInfo;

/** {@code Help>About Plugins>Noisewise...}: what the suite does, its version, licence, cautions and how to cite. */
public class AboutCommand implements PlugIn {

    /** The About text. */
    static String text() {
        return "Noisewise " + BuildInfo.version() + ": corrected noise and SNR measurement for MR magnitude images.\n"
                + "Sigma and signal are corrected for Rayleigh / Rice / chi(2L) magnitude noise, every figure has a\n"
                + "95% interval, and warnings say when a method's assumptions fail and which method to use instead.\n"
                + "Each dialog's Help button shows the command's own section of the README.\n\n"
                + "For image-quality QA and research only; not a diagnostic device. Where results feed\n"
                + "acceptance or safety decisions, defer to your site's qualified medical physicist and\n"
                + "local regulations.\n\nLicence: MIT.\n\nHow to cite: " + wrap(BuildInfo.citation(), 96);
    }

    static String wrap(String s, int width) {
        StringBuilder out = new StringBuilder();
        int col = 0;
        for (String w : s.split(" ")) {
            if (col > 0 && col + w.length() + 1 > width) {
                out.append('\n');
                col = 0;
            } else if (col > 0) {
                out.append(' ');
                col++;
            }
            out.append(w);
            col += w.length();
        }
        return out.toString();
    }

    @Override
    public void run(String arg) {
        IJ.showMessage("About Noisewise", text());
    }
}
