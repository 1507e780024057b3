package org.noisewise.series;

/**
 * The per-voxel maps of one slice of a stability series (calibrated values, 32-bit): signal (temporal
 * mean), fluctuation noise (SD of the residuals after a second-order fit in time), SFNR (signal over
 * fluctuation noise) and static spatial noise (sum of the odd frames minus sum of the even frames of
 * those used). The per-voxel trend coefficients are kept for the region figures.
 */
public final class StabilityMaps {

    private final int width;
    private final int height;
    private final int frames;
    private final int skipped;
    private final int staticFrames;
    private final float[] signal;
    private final float[] fluctuation;
    private final float[] sfnr;
    private final float[] staticNoise;
    private final float[] linear;
    private final float[] quadratic;

    StabilityMaps(int width, int height, int frames, int skipped, int staticFrames, float[] signal, float[] fluctuation,
                  float[] sfnr, float[] staticNoise, float[] linear, float[] quadratic) {
        this.width = width;
        this.height = height;
        this.frames = frames;
        this.skipped = skipped;
        this.staticFrames = staticFrames;
        this.signal = signal;
        this.fluctuation = fluctuation;
        this.sfnr = sfnr;
        this.staticNoise = staticNoise;
        this.linear = linear;
        this.quadratic = quadratic;
    }

    public int width() {
        return width;
    }

    public int height() {
        return height;
    }

    /** Frames used (after the skipped ones). */
    public int framesUsed() {
        return frames;
    }

    public int skipped() {
        return skipped;
    }

    /** Frames in the odd-minus-even sum (the frames used, less the last when their number is odd). */
    public int staticFrames() {
        return staticFrames;
    }

    public float[] signal() {
        return signal;
    }

    public float[] fluctuation() {
        return fluctuation;
    }

    public float[] sfnr() {
        return sfnr;
    }

    public float[] staticNoise() {
        return staticNoise;
    }

    /** Per-voxel coefficient of the linear basis term (calibrated units per frame). */
    float[] linear() {
        return linear;
    }

    /** Per-voxel coefficient of the quadratic basis term. */
    float[] quadratic() {
        return quadratic;
    }
}
