package org.noisewise.phantom;

import org.noisewise.estimate.Region;

/**
 * A region placed by the QA: its name, shape and bounding box in pixel coordinates (top-left corner,
 * width, height; doubles for sub-pixel ovals) and the pixels it holds.
 */
public record PlacedRegion(String name, Kind kind, double x, double y, double w, double h, Region region) {

    /** Region shapes. */
    public enum Kind { RECTANGLE, OVAL }
}
