package org.noisewise.measure;

import ij.ImagePlus;
import ij.ImageStack;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.IntStream;
import org.noisewise.diagnose.AirFinder;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.report.ResultRow;

/**
 * The background of each plane for the background and check methods: the roles' regions, or, with
 * automatic air, the pure-noise pixels {@link AirFinder} finds in that plane (the signal and contrast
 * regions never taken), with a note per plane and the air masks for the faces (an overlay in Fiji,
 * {@code --air-mask} on the command line).
 */
final class Air {

    private final Roles roles;
    private final int width;
    private final int height;
    private final List<boolean[]> masks = new ArrayList<>();
    private final List<Integer> slices = new ArrayList<>();
    private AirFinder.Result last;

    Air(Roles roles, int width, int height) {
        this.roles = roles;
        this.width = width;
        this.height = height;
    }

    /** The background regions of plane {@code slice}; automatic air adds a note. */
    List<Region> regions(float[] pixels, int slice, Integer channels, BackgroundCheck.Storage storage,
                         List<String> notes) throws InputException {
        if (!roles.autoAir()) {
            last = null;
            return roles.backgrounds();
        }
        Region exclude = excluded();
        try {
            last = AirFinder.find(pixels, width, height, channels == null ? 0 : channels, storage, exclude);
        } catch (InputException e) {
            throw new InputException("slice " + slice + ": " + e.getMessage());
        }
        masks.add(last.mask());
        slices.add(slice);
        String settled = switch (last.settling()) {
            case FIXED_POINT -> String.format(Locale.ROOT, "self-consistent after %d iteration%s", last.iterations(),
                    last.iterations() == 1 ? "" : "s");
            case CYCLE -> String.format(Locale.ROOT, "two selections alternated after %d iterations: the pixels both "
                    + "take are used", last.iterations());
            case NOT_SETTLED -> String.format(Locale.ROOT, "still changing after %d iterations: the last selection is "
                    + "used", last.iterations());
        };
        notes.add(String.format(Locale.ROOT, "slice %d: automatic air: %d pixels of pure noise (%.1f%% of the slice) "
                        + "in %d part%s, %s%s", slice, last.pixels(), 100 * last.share(),
                last.regions().size(), last.regions().size() == 1 ? "" : "s", settled, channels == null ? " (window test for 1 channel: the channel count "
                        + "is estimated afterwards)" : ""));
        return last.regions();
    }

    /**
     * With automatic air, the {@code noise_varies} reason when blocks the air left out hold pure noise
     * louder than the air's ({@link AirFinder#louderNoise}); null otherwise.
     */
    org.noisewise.estimate.Warning louderNoise(float[] pixels, int channels) {
        if (last == null) {
            return null;
        }
        AirFinder.Louder l = AirFinder.louderNoise(pixels, width, height, last.mask(), channels, excluded());
        if (l == null) {
            return null;
        }
        return AirFinder.louderWarning(l);
    }

    /** Slices larger than this (pixels) are not cross-checked against the automatic air (its cost). */
    static final long CROSS_CHECK_MAX = 2048L * 2048L;

    /**
     * With drawn background regions, their ML sigma against that of the air {@link AirFinder} finds in the
     * same slice: when the regions' sigma is more than 5% higher at 3.29 standard errors, the reason
     * {@code regions_above_air} (ghosts or structure in the regions, which the ghost test cannot see when
     * it covers them all alike, or noise that varies over the image). Null when the regions agree, when
     * too little air is found to compare, or for slices above {@link #CROSS_CHECK_MAX} pixels.
     */
    org.noisewise.estimate.Warning crossCheck(float[] pixels, int channels, BackgroundCheck.Storage storage,
                                              List<Region> drawn) throws InputException {
        if (roles.autoAir() || (long) width * height > CROSS_CHECK_MAX || drawn.isEmpty()) {
            return null;
        }
        AirFinder.Result found;
        try {
            found = AirFinder.find(pixels, width, height, channels, storage, excluded());
        } catch (InputException e) {
            return null;
        }
        double step = storage == null ? 0.0 : storage.step();
        var regions = org.noisewise.estimate.BackgroundNoise.measure(pixels, width, drawn).estimates(channels, step)
                .get(org.noisewise.estimate.SigmaEstimator.ML);
        var air = org.noisewise.estimate.BackgroundNoise.measure(pixels, width, found.regions())
                .estimates(channels, step).get(org.noisewise.estimate.SigmaEstimator.ML);
        if (!(regions.sigma() > 0 && air.sigma() > 0)) {
            return null;
        }
        org.noisewise.diagnose.NoiseScan.Ratio r = org.noisewise.diagnose.NoiseScan.ratio(regions, air);
        if (!(r.value() > 1 && r.differs(0.05, 3.29))) {
            return null;
        }
        return new org.noisewise.estimate.Warning("regions_above_air", String.format(Locale.ROOT, "the background "
                + "regions' sigma is %.2f times that of the %d pixels of pure noise found automatically in this slice "
                + "(95%% interval %.2f-%.2f): the regions hold ghosts or other structure, or noise varies over the "
                + "image; measure with the automatic air instead, or redraw the regions in clean air", r.value(),
                found.pixels(), r.ci95().low(), r.ci95().high()));
    }

    /** Adds the air share to the row of the plane just measured (automatic air only). */
    ResultRow addShare(ResultRow row) {
        return last == null ? row : row.add("background_share", "Air share [%]", 100 * last.share());
    }

    /** The air masks as one 8-bit image (255 = air), a slice per measured plane, or null without automatic air. */
    ImagePlus maskImage(String title) {
        if (masks.isEmpty()) {
            return null;
        }
        ImageStack st = new ImageStack(width, height);
        for (int k = 0; k < masks.size(); k++) {
            st.addSlice("slice " + slices.get(k), org.noisewise.io.QaImages.maskProcessor(masks.get(k), width, height));
        }
        return new ImagePlus(title + " air mask", st);
    }

    private Region excluded() {
        List<Region> all = new ArrayList<>(roles.signal());
        all.addAll(roles.contrast());
        int[] idx = all.stream().flatMapToInt(r -> IntStream.of(r.indices())).distinct().toArray();
        return idx.length == 0 ? null : new Region("signal and contrast", idx);
    }
}
