package org.noisewise.testing;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.plugin.frame.RoiManager;
import java.io.PrintWriter;
import java.io.StringWriter;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.noisewise.cli.NoisewiseCli;

/**
 * The session every Fiji acceptance test runs in: ImageJ started once without a window, an empty ROI
 * Manager before each test and every image but it closed after; {@link #cli} runs the command line
 * in-process, for the figures a Fiji run must equal.
 */
public abstract class FijiSession {

    protected RoiManager rm;

    @BeforeAll
    static void startImageJ() {
        ImageJHarness.start();
    }

    @BeforeEach
    void freshRoiManager() {
        rm = ImageJHarness.freshRoiManager();
    }

    @AfterEach
    void closeImages() {
        ImageJHarness.closeAllBut(rm);
    }

    /** The command line's JSON output; fails the test unless the command succeeds. */
    protected static JsonObject cli(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int status = NoisewiseCli.execute(args, new PrintWriter(out), new PrintWriter(err));
        if (status != 0) {
            throw new AssertionError("exit " + status + ": " + err);
        }
        return JsonParser.parseString(out.toString()).getAsJsonObject();
    }
}
