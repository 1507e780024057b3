package org.noisewise.testing;

import static org.junit.jupiter.api.Assertions.fail;
import static org.junit.jupiter.api.Assumptions.assumeFalse;

import java.awt.GraphicsEnvironment;

/**
 * ImageJ's dialogs, ROI Manager and {@code IJ.run} need a display. Tests that drive them call
 * {@link #require()}: without a display they are skipped, unless NOISEWISE_REQUIRE_DISPLAY is set
 * (as CI does, under Xvfb), in which case a missing display is a failure.
 */
public final class Display {

    private Display() {
    }

    public static void require() {
        boolean headless = GraphicsEnvironment.isHeadless();
        if (headless && System.getenv("NOISEWISE_REQUIRE_DISPLAY") != null) {
            fail("NOISEWISE_REQUIRE_DISPLAY is set but there is no display: run under xvfb-run");
        }
        assumeFalse(headless, "no display: ImageJ GUI tests skipped (run under xvfb-run to include them)");
    }
}
