package org.noisewise.measure;

import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;

/**
 * The regions of a measurement by role, already checked against the image size: signal regions,
 * background (air) regions, or automatic air (found per slice), and the contrast region of a
 * contrast-to-noise ratio (none, or one). The faces build it from ROI Manager regions or
 * command-line rectangles.
 */
public record Roles(List<Region> signal, List<Region> background, List<Region> contrast, boolean autoAir) {

    public Roles {
        signal = List.copyOf(signal);
        background = List.copyOf(background);
        contrast = List.copyOf(contrast);
        if (autoAir && !background.isEmpty()) {
            throw new IllegalArgumentException("automatic air replaces background regions");
        }
    }

    public Roles(List<Region> signal, List<Region> background) {
        this(signal, background, List.of(), false);
    }

    public Roles(List<Region> signal, List<Region> background, List<Region> contrast) {
        this(signal, background, contrast, false);
    }

    /** These roles with a contrast region (or none). */
    public Roles withContrast(List<Region> regions) {
        return new Roles(signal, background, regions, autoAir);
    }

    /** These roles with the background found automatically in every slice ({@code AirFinder}), no regions drawn. */
    public Roles withAutoAir() {
        return new Roles(signal, List.of(), contrast, true);
    }

    /** The contrast region, or {@code null} when none is given. */
    public Region oneContrast() throws InputException {
        if (contrast.size() > 1) {
            throw new InputException(contrast.size() + " regions have the contrast role: keep one contrast region "
                    + "(the second tissue of the contrast-to-noise ratio)");
        }
        return contrast.isEmpty() ? null : contrast.get(0);
    }

    public static Roles of(Region signal, List<Region> background) {
        return new Roles(signal == null ? List.of() : List.of(signal), background);
    }

    /** The one signal region a method needs. */
    public Region oneSignal() throws InputException {
        if (signal.isEmpty()) {
            throw new InputException("no signal region: mark one region as signal");
        }
        if (signal.size() > 1) {
            throw new InputException(signal.size() + " regions have the signal role: keep one signal region");
        }
        return signal.get(0);
    }

    /** At least one signal region. */
    public List<Region> signals() throws InputException {
        if (signal.isEmpty()) {
            throw new InputException("no signal region: mark at least one region as signal");
        }
        return signal;
    }

    /** At least one background region. */
    public List<Region> backgrounds() throws InputException {
        if (background.isEmpty()) {
            throw new InputException("no background region: mark at least one region in air, clear of the object "
                    + "and of ghosts, as background");
        }
        return background;
    }
}
