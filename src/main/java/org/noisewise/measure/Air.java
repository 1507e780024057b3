package org.noisewise.measure;

import ij.ImagePlus;
import ij.ImageStack;
import ij.process.ByteProcessor;
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
            boolean[] m = masks.get(k);
            byte[] b = new byte[m.length];
            IntStream.range(0, m.length).filter(i -> m[i]).forEach(i -> b[i] = (byte) 255);
            st.addSlice("slice " + slices.get(k), new ByteProcessor(width, height, b));
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
