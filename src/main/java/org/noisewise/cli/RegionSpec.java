package org.noisewise.cli;

import java.util.Locale;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import picocli.CommandLine;

/**
 * A region given on the command line: {@code x,y,w,h} (a rectangle, pixel coordinates of the
 * top-left corner as ImageJ reports them) or {@code oval:x,y,w,h} (the ellipse inscribed in it).
 */
public record RegionSpec(boolean oval, int x, int y, int w, int h) {

    /** {@code --background auto}: the air found in every slice, no rectangle. */
    public static final RegionSpec AUTO = new RegionSpec(false, Integer.MIN_VALUE, Integer.MIN_VALUE, 0, 0);

    public boolean auto() {
        return x == Integer.MIN_VALUE && y == Integer.MIN_VALUE && w == 0 && h == 0;
    }

    /** Parses the option text; a usage error (exit 2) when malformed. */
    public static RegionSpec parse(String text) {
        String t = text.trim();
        if (t.equalsIgnoreCase("auto")) {
            return AUTO;
        }
        boolean oval = false;
        String lower = t.toLowerCase(Locale.ROOT);
        if (lower.startsWith("oval:")) {
            oval = true;
            t = t.substring(5);
        } else if (lower.startsWith("rect:")) {
            t = t.substring(5);
        }
        String[] p = t.split(",");
        if (p.length != 4) {
            throw new CommandLine.TypeConversionException("'" + text
                    + "' is not a region: write x,y,w,h (e.g. 10,20,30,30) or oval:x,y,w,h");
        }
        int[] v = new int[4];
        for (int i = 0; i < 4; i++) {
            try {
                v[i] = Integer.parseInt(p[i].trim());
            } catch (NumberFormatException e) {
                throw new CommandLine.TypeConversionException("'" + text
                        + "' is not a region: x, y, w and h must be whole numbers of pixels");
            }
        }
        return new RegionSpec(oval, v[0], v[1], v[2], v[3]);
    }

    public Region toRegion(String name, int width, int height) throws InputException {
        if (auto()) {
            throw new InputException("'auto' is for --background only: give x,y,w,h for this region");
        }
        return oval ? Region.oval(name, x, y, w, h, width, height) : Region.rectangle(name, x, y, w, h, width, height);
    }

    @Override
    public String toString() {
        if (auto()) {
            return "auto";
        }
        return (oval ? "oval:" : "") + x + "," + y + "," + w + "," + h;
    }
}
