package org.noisewise.imagej;

import ij.IJ;
import org.noisewise.measure.Progress;

/** Progress in ImageJ's progress bar and status line. */
final class ImageJProgress implements Progress {

    static final ImageJProgress INSTANCE = new ImageJProgress();

    private ImageJProgress() {
    }

    @Override
    public void report(double fraction, String status) {
        IJ.showProgress(fraction);
        if (status != null) {
            IJ.showStatus(status);
        }
    }
}
