package org.noisewise.diagnose;

import java.util.Locale;

/**
 * The in-plane phase-encoding direction (DICOM 0018,1312 In-plane Phase Encoding Direction).
 * {@code ROW}: phase encoded along the rows, so ghosts spread left and right; {@code COL}: along the
 * columns, so ghosts spread above and below.
 */
public enum PhaseDirection {
    ROW, COL, UNKNOWN;

    public static PhaseDirection parse(String text) {
        if (text == null || text.isBlank()) {
            return UNKNOWN;
        }
        String t = text.trim().toUpperCase(Locale.ROOT);
        return switch (t) {
            case "ROW", "ROWS", "X", "HORIZONTAL", "LR", "RL" -> ROW;
            case "COL", "COLUMN", "COLUMNS", "Y", "VERTICAL", "AP", "PA" -> COL;
            case "UNKNOWN", "AUTO" -> UNKNOWN;
            default -> throw new IllegalArgumentException("unknown phase-encoding direction '" + text
                    + "': use ROW (ghosts left/right), COL (ghosts above/below) or UNKNOWN");
        };
    }
}
