package org.noisewise.measure;

import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;

/**
 * The regions of a measurement by role, already checked against the image size: signal regions and
 * background (air) regions. The faces build it from ROI Manager regions or command-line rectangles.
 */
public record Roles(List<Region> signal, List<Region> background) {

    public Roles {
        signal = List.copyOf(signal);
        background = List.copyOf(background);
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
