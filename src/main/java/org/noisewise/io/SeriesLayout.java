package org.noisewise.io;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;
import org.noisewise.estimate.InputException;

/**
 * The one arrangement step of every reader: the images of a series become Z slices x T repeats from
 * what their headers say (DICOM PS3.3 C.7.6.2, C.7.6.16), never from the order of the files.
 *
 * <ul>
 * <li>Echoes (Echo Numbers 0018,0086, or Effective Echo Time 0018,9082 of enhanced files) are never
 * mixed: one is chosen, or the series is refused naming them. Orientations (Image Orientation
 * (Patient) 0020,0037) are never mixed either.</li>
 * <li>Z: the position along the slice normal, {@code d = p . (r x c)} with {@code p} the Image
 * Position (Patient) and {@code r}, {@code c} the row and column direction cosines; slices are
 * numbered by increasing {@code d} (for axial images in the usual orientation, feet to head).</li>
 * <li>T: Temporal Position Identifier (0020,0100) or an enhanced frame's Temporal Position Index
 * (0020,9128), else Acquisition Number (0020,0012), else the order of Instance Number
 * (0020,0013) at each position; a tag is used when it tells the images of a position apart.</li>
 * <li>Complete or refused: every position must hold every repeat exactly once; a missing or
 * duplicated image is an input error naming the slice and the repeat.</li>
 * </ul>
 */
public final class SeriesLayout {

    private SeriesLayout() {
    }

    /**
     * What one image's header says of where it belongs.
     *
     * @param name         for messages: the file name, with the frame for multi-frame files
     * @param key          identifies the image (SOP Instance UID and frame), to find copies; may be null
     * @param temporal     Temporal Position Identifier or Index, or null
     * @param temporalTag  the tag {@code temporal} came from, for notes
     * @param echo         Echo Number, or the effective echo time, or null
     * @param echoTag      the tag {@code echo} came from
     */
    /** How the notes say the slices were placed from their positions. */
    static final String BY_POSITION = "DICOM positions (along the slice normal, increasing)";

    public record Item(String name, String key, double[] position, double[] orientation, Integer temporal,
                       String temporalTag, Integer acquisition, Double instance, Double echo, String echoTag) {
    }

    /**
     * The arrangement: {@code order[t * slices + z]} (0-based z and t) is the index of the image in
     * the list given, which is also ImageJ's hyperstack order (c = 1, then z, then t).
     *
     * @param spacing mean distance between neighbouring slices along the normal in mm (NaN for one slice)
     */
    public record Layout(int slices, int repeats, int[] order, double spacing, String note) {
        public Layout {
            order = order.clone();
        }

        @Override
        public int[] order() {
            return order.clone();
        }
    }

    /**
     * Arranges {@code items}.
     *
     * @param echo        the echo to keep (1-based, in increasing order of echo number or time), or null
     * @param echoHint    what the user does to choose an echo, in the face's words
     * @param sliceGapMm  the smaller of the slice thickness and spacing when known (positions closer than
     *                    0.4 of it are one slice), else null (0.4 mm)
     * @param statedRepeats Number of Temporal Positions (0020,0105) when stated, else null
     */
    public static Layout arrange(List<Item> items, Integer echo, String echoHint, Double sliceGapMm,
                                 Integer statedRepeats) throws InputException {
        if (items.isEmpty()) {
            throw new InputException("the series holds no images");
        }
        requireDistinct(items);
        List<Integer> kept = chooseEcho(items, echo, echoHint);
        double[] normal = normal(items, kept);
        List<List<Integer>> positions = new ArrayList<>();
        double[] d = new double[items.size()];
        String placed;
        if (normal == null) {
            positions.add(new ArrayList<>(kept));
            placed = "no positions in the headers: every image is taken as a repeat of one slice";
        } else {
            for (int i : kept) {
                d[i] = dot(items.get(i).position(), normal);
            }
            positions = cluster(kept, d, 0.4 * (sliceGapMm != null && sliceGapMm > 0 ? sliceGapMm : 1.0));
            placed = BY_POSITION;
        }
        int z = positions.size();
        TimeKey key = timeKey(items, positions);
        int[][] byTime = new int[z][];
        List<Double> values = null;
        if (key != TimeKey.ORDER) {
            TreeSet<Double> all = new TreeSet<>();
            for (List<Integer> p : positions) {
                for (int i : p) {
                    all.add(key.value(items.get(i)));
                }
            }
            values = new ArrayList<>(all);
            for (int s = 0; s < z; s++) {
                byTime[s] = keyed(items, positions.get(s), key, values, s, z, d, normal != null);
            }
        } else {
            for (int s = 0; s < z; s++) {
                List<Integer> p = new ArrayList<>(positions.get(s));
                p.sort(Comparator.comparingDouble((Integer i) -> instanceOrMax(items.get(i)))
                        .thenComparing(i -> items.get(i).name()));
                requireDistinctInstances(items, p, s, z, d, normal != null);
                byTime[s] = p.stream().mapToInt(Integer::intValue).toArray();
            }
            requireSameCounts(items, byTime, d, normal != null);
        }
        int t = byTime[0].length;
        if (statedRepeats != null && statedRepeats > t && key != TimeKey.ORDER && t > 1) {
            throw new InputException(String.format(Locale.ROOT, "the series is incomplete: its headers state %d "
                    + "temporal positions (0020,0105) but every slice holds %d; export the whole series again",
                    statedRepeats, t));
        }
        int[] order = new int[z * t];
        for (int s = 0; s < z; s++) {
            for (int r = 0; r < t; r++) {
                order[r * z + s] = byTime[s][r];
            }
        }
        double spacing = Double.NaN;
        if (normal != null && z > 1) {
            spacing = Math.abs(mean(d, positions.get(z - 1)) - mean(d, positions.get(0))) / (z - 1);
        }
        String note = String.format(Locale.ROOT, "%d slice%s x %d repeat%s from %s%s", z, z == 1 ? "" : "s", t,
                t == 1 ? "" : "s", placed, t == 1 ? "" : " and " + key.describe(items));
        if (echo != null) {
            note += "; echo " + echo + " of the series";
        }
        return new Layout(z, t, order, spacing, note);
    }

    // ---- echoes, orientation, positions -------------------------------------------------------------------------

    private static void requireDistinct(List<Item> items) throws InputException {
        Map<String, String> seen = new HashMap<>();
        for (Item it : items) {
            if (it.key() == null) {
                continue;
            }
            String before = seen.putIfAbsent(it.key(), it.name());
            if (before != null) {
                throw new InputException("'" + before + "' and '" + it.name() + "' are the same image (the same SOP "
                        + "Instance UID): remove the copy from the folder");
            }
        }
    }

    private static List<Integer> chooseEcho(List<Item> items, Integer echo, String hint) throws InputException {
        TreeMap<Double, List<Integer>> echoes = new TreeMap<>();
        boolean unstated = false;
        for (int i = 0; i < items.size(); i++) {
            Double e = items.get(i).echo();
            if (e == null) {
                unstated = true;
            } else {
                echoes.computeIfAbsent(e, k -> new ArrayList<>()).add(i);
            }
        }
        List<Integer> all = new ArrayList<>();
        for (int i = 0; i < items.size(); i++) {
            all.add(i);
        }
        if (echoes.size() > 1 && unstated) {
            throw new InputException("some images of the series state an echo (" + echoTag(items) + ") and others do "
                    + "not: export each echo as its own series");
        }
        if (echoes.size() <= 1) {
            if (echo != null && echo != 1) {
                throw new InputException("echo " + echo + " was asked for, but the series holds images of one echo");
            }
            return all;
        }
        List<String> names = new ArrayList<>();
        for (Map.Entry<Double, List<Integer>> e : echoes.entrySet()) {
            names.add(number(e.getKey()) + " (" + e.getValue().size() + " images)");
        }
        if (echo == null) {
            throw new InputException("the series holds images of " + echoes.size() + " echoes (" + echoTag(items) + " "
                    + String.join(", ", names) + "), which are never mixed: " + hint);
        }
        if (echo < 1 || echo > echoes.size()) {
            throw new InputException("echo " + echo + " does not exist: the series holds " + echoes.size()
                    + " echoes (" + echoTag(items) + " " + String.join(", ", names) + "), numbered 1 to " + echoes.size());
        }
        return new ArrayList<>(new ArrayList<>(echoes.values()).get(echo - 1));
    }

    private static String echoTag(List<Item> items) {
        for (Item it : items) {
            if (it.echoTag() != null) {
                return it.echoTag();
            }
        }
        return "Echo Numbers (0018,0086)";
    }

    /** The slice normal of the kept images, or null when none states a position. */
    private static double[] normal(List<Item> items, List<Integer> kept) throws InputException {
        int withPosition = 0;
        String lacking = null;
        for (int i : kept) {
            if (items.get(i).position() != null) {
                withPosition++;
            } else if (lacking == null) {
                lacking = items.get(i).name();
            }
        }
        if (withPosition == 0) {
            return null;
        }
        if (lacking != null) {
            throw new InputException("'" + lacking + "' states no Image Position (Patient) (0020,0032) while other images "
                    + "of the series do: it cannot be placed; remove it or export the series again");
        }
        double[] first = null;
        String firstName = null;
        for (int i : kept) {
            double[] o = items.get(i).orientation();
            if (o == null) {
                continue;
            }
            if (first == null) {
                first = o;
                firstName = items.get(i).name();
            } else {
                for (int k = 0; k < 6; k++) {
                    if (Math.abs(o[k] - first[k]) > 1e-3) {
                        throw new InputException("the series holds images in more than one orientation ('" + firstName
                                + "' " + cosines(first) + ", '" + items.get(i).name() + "' " + cosines(o)
                                + ", Image Orientation (Patient) 0020,0037), which are never mixed: export each "
                                + "orientation as its own series");
                    }
                }
            }
        }
        if (first != null) {
            double[] n = {first[1] * first[5] - first[2] * first[4], first[2] * first[3] - first[0] * first[5],
                    first[0] * first[4] - first[1] * first[3]};
            double len = Math.sqrt(dot(n, n));
            if (len > 1e-6) {
                return new double[] {n[0] / len, n[1] / len, n[2] / len};
            }
        }
        // no orientation stated: the line through the two most distant positions
        double[] a = items.get(kept.get(0)).position();
        double[] far = a;
        double best = 0;
        for (int i : kept) {
            double[] p = items.get(i).position();
            double dd = (p[0] - a[0]) * (p[0] - a[0]) + (p[1] - a[1]) * (p[1] - a[1]) + (p[2] - a[2]) * (p[2] - a[2]);
            if (dd > best) {
                best = dd;
                far = p;
            }
        }
        if (best == 0) {
            return new double[] {0, 0, 1};
        }
        double len = Math.sqrt(best);
        return new double[] {(far[0] - a[0]) / len, (far[1] - a[1]) / len, (far[2] - a[2]) / len};
    }

    private static String cosines(double[] o) {
        return "(" + number(o[0]) + "," + number(o[1]) + "," + number(o[2]) + ")/(" + number(o[3]) + ","
                + number(o[4]) + "," + number(o[5]) + ")";
    }

    private static List<List<Integer>> cluster(List<Integer> kept, double[] d, double tol) {
        List<Integer> sorted = new ArrayList<>(kept);
        sorted.sort(Comparator.comparingDouble(i -> d[i]));
        List<List<Integer>> out = new ArrayList<>();
        List<Integer> cur = new ArrayList<>();
        double last = Double.NaN;
        for (int i : sorted) {
            if (!cur.isEmpty() && d[i] - last > tol) {
                out.add(cur);
                cur = new ArrayList<>();
            }
            cur.add(i);
            last = d[i];
        }
        out.add(cur);
        return out;
    }

    // ---- time ---------------------------------------------------------------------------------------------------

    private enum TimeKey {
        TEMPORAL, ACQUISITION, ORDER;

        Double value(Item it) {
            return switch (this) {
                case TEMPORAL -> it.temporal() == null ? null : it.temporal().doubleValue();
                case ACQUISITION -> it.acquisition() == null ? null : it.acquisition().doubleValue();
                case ORDER -> it.instance();
            };
        }

        String describe(List<Item> items) {
            return switch (this) {
                case TEMPORAL -> {
                    String tag = items.get(0).temporalTag();
                    yield tag == null ? "Temporal Position Identifier (0020,0100)" : tag;
                }
                case ACQUISITION -> "Acquisition Number (0020,0012)";
                case ORDER -> "the order of Instance Number (0020,0013) at each position (no temporal tags)";
            };
        }

        String repeatName(double v) {
            return switch (this) {
                case TEMPORAL -> "temporal position " + number(v);
                case ACQUISITION -> "Acquisition Number " + number(v);
                case ORDER -> "Instance Number " + number(v);
            };
        }
    }

    private static TimeKey timeKey(List<Item> items, List<List<Integer>> positions) {
        for (TimeKey k : new TimeKey[] {TimeKey.TEMPORAL, TimeKey.ACQUISITION}) {
            boolean everyImage = true;
            boolean tellsApart = false;
            for (List<Integer> p : positions) {
                TreeSet<Double> seen = new TreeSet<>();
                for (int i : p) {
                    Double v = k.value(items.get(i));
                    if (v == null) {
                        everyImage = false;
                    } else {
                        seen.add(v);
                    }
                }
                tellsApart |= seen.size() > 1;
            }
            if (everyImage && tellsApart) {
                return k;
            }
        }
        return TimeKey.ORDER;
    }

    private static int[] keyed(List<Item> items, List<Integer> p, TimeKey key, List<Double> values, int s, int z,
                               double[] d, boolean placed) throws InputException {
        int[] out = new int[values.size()];
        Arrays.fill(out, -1);
        Map<Double, Integer> rank = new LinkedHashMap<>();
        for (int r = 0; r < values.size(); r++) {
            rank.put(values.get(r), r);
        }
        for (int i : p) {
            int r = rank.get(key.value(items.get(i)));
            if (out[r] >= 0) {
                throw new InputException("the series holds two images of " + slice(s, z, d, p, placed) + " and repeat "
                        + (r + 1) + " (" + key.repeatName(values.get(r)) + "): '" + items.get(out[r]).name() + "' and '"
                        + items.get(i).name() + "'; remove the duplicate or export the series again");
            }
            out[r] = i;
        }
        int missing = 0;
        int first = -1;
        for (int r = 0; r < out.length; r++) {
            if (out[r] < 0) {
                missing++;
                if (first < 0) {
                    first = r;
                }
            }
        }
        if (missing > 0) {
            throw new InputException("the series is incomplete: " + slice(s, z, d, p, placed) + " has no image for repeat "
                    + (first + 1) + " of " + values.size() + " (" + key.repeatName(values.get(first)) + ")"
                    + (missing > 1 ? " and lacks " + (missing - 1) + " more" : "") + "; every slice needs every "
                    + "repeat: export the series again");
        }
        return out;
    }

    private static void requireDistinctInstances(List<Item> items, List<Integer> p, int s, int z, double[] d,
                                                 boolean placed) throws InputException {
        for (int k = 1; k < p.size(); k++) {
            Double a = items.get(p.get(k - 1)).instance();
            Double b = items.get(p.get(k)).instance();
            if (a != null && a.equals(b)) {
                throw new InputException("the series holds two images of " + slice(s, z, d, p, placed) + " with "
                        + "Instance Number " + number(a) + ": '" + items.get(p.get(k - 1)).name() + "' and '"
                        + items.get(p.get(k)).name() + "'; remove the duplicate or export the series again");
            }
        }
    }

    private static void requireSameCounts(List<Item> items, int[][] byTime, double[] d, boolean placed)
            throws InputException {
        int z = byTime.length;
        int most = 0;
        int full = 0;
        for (int s = 0; s < z; s++) {
            if (byTime[s].length > most) {
                most = byTime[s].length;
                full = s;
            }
        }
        for (int s = 0; s < z; s++) {
            if (byTime[s].length == most) {
                continue;
            }
            List<Integer> p = Arrays.stream(byTime[s]).boxed().toList();
            String where = missingByInstance(items, byTime[s], byTime[full]);
            throw new InputException("the series is incomplete: " + slice(s, z, d, p, placed) + " has " + byTime[s].length
                    + " image" + (byTime[s].length == 1 ? "" : "s") + " where other slices have " + most + where
                    + "; every slice needs every repeat: export the series again");
        }
    }

    /** Where a gap in the Instance Numbers of a slice shows the missing repeat, judged against a full slice. */
    private static String missingByInstance(List<Item> items, int[] have, int[] full) {
        double[] f = instances(items, full);
        double[] h = instances(items, have);
        if (f == null || h == null || f.length < 2 || h.length == 0) {
            return " (no temporal tags to tell which repeat is missing)";
        }
        double step = (f[f.length - 1] - f[0]) / (f.length - 1);
        for (int k = 1; k < h.length; k++) {
            if (h[k] - h[k - 1] > 1.5 * step) {
                return " (by its Instance Numbers, repeat " + (k + 1) + " is missing)";
            }
        }
        return " (by its Instance Numbers, its first or last repeat is missing)";
    }

    private static double[] instances(List<Item> items, int[] idx) {
        double[] out = new double[idx.length];
        for (int k = 0; k < idx.length; k++) {
            Double v = items.get(idx[k]).instance();
            if (v == null) {
                return null;
            }
            out[k] = v;
        }
        return out;
    }

    private static String slice(int s, int z, double[] d, List<Integer> p, boolean placed) {
        String at = placed ? String.format(Locale.ROOT, " (position %s mm along the slice normal)", number(mean(d, p)))
                : "";
        return "slice " + (s + 1) + " of " + z + at;
    }

    // ---- small helpers ------------------------------------------------------------------------------------------

    private static double instanceOrMax(Item it) {
        return it.instance() == null ? Double.MAX_VALUE : it.instance();
    }

    private static double dot(double[] a, double[] b) {
        return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
    }

    private static double mean(double[] d, List<Integer> p) {
        double s = 0;
        for (int i : p) {
            s += d[i];
        }
        return s / p.size();
    }

    private static String number(double v) {
        if (v == Math.rint(v) && Math.abs(v) < 1e12) {
            return Long.toString((long) v);
        }
        return String.format(Locale.ROOT, "%.3f", v).replaceAll("0+$", "").replaceAll("\\.$", "");
    }
}
