package org.noisewise.imagej;

import ij.IJ;
import ij.plugin.PlugIn;

/** {@code Help>About Plugins>Noisewise...}: what the suite does and its cautions. */
public class AboutCommand implements PlugIn {

    static final String TEXT = "Noisewise: corrected noise and SNR measurement for MR magnitude images.\n"
            + "Background sigma is corrected for Rayleigh / chi(2L) magnitude noise; warnings say when a\n"
            + "method's assumptions fail and which method to use instead.\n\n"
            + "For image-quality QA and research only; not a diagnostic device. Where results feed\n"
            + "acceptance or safety decisions, defer to your site's qualified medical physicist and\n"
            + "local regulations.\n\nLicence: MIT.";

    @Override
    public void run(String arg) {
        IJ.showMessage("About Noisewise", TEXT);
    }
}
