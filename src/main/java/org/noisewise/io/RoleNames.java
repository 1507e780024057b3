package org.noisewise.io;

import java.util.Locale;

/**
 * The naming convention that gives a region its role. A region whose name starts with
 * {@code signal} or {@code sig} is a signal region; one whose name starts with {@code background},
 * {@code bg}, {@code air} or {@code noise} is a background region; one whose name starts with
 * {@code contrast} is the contrast region of a contrast-to-noise ratio (the second tissue); anything
 * else has no role until the user gives one (case is ignored; e.g. "Signal", "bg-left", "air 2",
 * "contrast grey matter").
 */
public enum RoleNames {
    SIGNAL("signal"),
    BACKGROUND("background"),
    CONTRAST("contrast"),
    IGNORE("ignore");

    private final String label;

    RoleNames(String label) {
        this.label = label;
    }

    public String label() {
        return label;
    }

    /** The role implied by a region name, or {@link #IGNORE} when the name says nothing. */
    public static RoleNames fromName(String name) {
        if (name == null) {
            return IGNORE;
        }
        String n = name.trim().toLowerCase(Locale.ROOT);
        if (n.startsWith("sig")) {
            return SIGNAL;
        }
        if (n.startsWith("background") || n.startsWith("bg") || n.startsWith("air") || n.startsWith("noise")) {
            return BACKGROUND;
        }
        if (n.startsWith("contrast")) {
            return CONTRAST;
        }
        return IGNORE;
    }

    public static RoleNames fromLabel(String label) {
        for (RoleNames r : values()) {
            if (r.label.equalsIgnoreCase(label.trim())) {
                return r;
            }
        }
        throw new IllegalArgumentException("unknown role '" + label + "': use signal, background, contrast or ignore");
    }

    public static String[] labels() {
        return new String[] {SIGNAL.label, BACKGROUND.label, CONTRAST.label, IGNORE.label};
    }
}
