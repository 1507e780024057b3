package org.noisewise.testing;

import ij.IJ;
import ij.ImageJ;
import ij.Menus;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Hashtable;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Starts ImageJ without showing its window and installs the commands of the repository's
 * {@code plugins.config} into ImageJ's command table, as ImageJ does for an installed plugin jar,
 * so tests can call {@code IJ.run(imp, "Command...", "key=value")} the way a macro does.
 */
public final class ImageJHarness {

    private static final Pattern ENTRY = Pattern.compile("^([^,#]+),\\s*\"([^\"]+)\",\\s*([\\w.]+)");

    private ImageJHarness() {
    }

    /** Menu label to class, in file order. */
    public static Map<String, String> pluginsConfig() {
        try {
            Map<String, String> out = new LinkedHashMap<>();
            for (String line : Files.readAllLines(Path.of("plugins.config"))) {
                Matcher m = ENTRY.matcher(line.strip());
                if (m.find()) {
                    out.put(m.group(2), m.group(3));
                }
            }
            return out;
        } catch (IOException e) {
            throw new IllegalStateException("cannot read plugins.config", e);
        }
    }

    public static synchronized void start() {
        Display.require();
        if (IJ.getInstance() == null) {
            new ImageJ(ImageJ.NO_SHOW);
        }
        @SuppressWarnings("unchecked")
        Hashtable<String, String> commands = Menus.getCommands();
        commands.putAll(pluginsConfig());
        IJ.redirectErrorMessages();
    }

    /** An empty ROI Manager and a clear Log, for a test's start. */
    public static ij.plugin.frame.RoiManager freshRoiManager() {
        ij.plugin.frame.RoiManager rm = ij.plugin.frame.RoiManager.getRoiManager();
        rm.reset();
        IJ.log("\\Clear");
        return rm;
    }

    /** Closes every image and every window but the ROI Manager and ImageJ's own, for a test's end. */
    public static void closeAllBut(ij.plugin.frame.RoiManager rm) {
        for (java.awt.Frame f : ij.WindowManager.getNonImageWindows()) {
            if (f != rm && f != IJ.getInstance()) {
                f.dispose();
            }
        }
        ij.WindowManager.closeAllWindows();
    }
}
