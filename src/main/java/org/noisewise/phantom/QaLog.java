package org.noisewise.phantom;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The QA log's rows, their CSV form, and the site's own baseline control limits.
 *
 * <p>Baseline: for each key (scanner, coil, protocol), the first N sessions in the log (default 5)
 * give each metric's mean and SD (divisor N - 1); a later value beyond mean +/- 2 SD is a warning,
 * beyond +/- 3 SD an action (Shewhart-style control limits, common practice in QA programmes).
 */
public final class QaLog {

    /** Default number of sessions that form the baseline. */
    public static final int DEFAULT_BASELINE = 5;

    /** The columns, in file order. */
    public static final List<String> COLUMNS = List.of("recorded_utc", "acquired", "scanner", "coil", "protocol",
            "image", "method", "verdict", "snr", "sigma", "signal_mean", "uniformity_piu", "nema_nonuniformity_percent",
            "ghosting_percent", "flags");

    /** The metrics tracked against the baseline, with their labels. */
    public static final Map<String, String> METRICS = metrics();

    private QaLog() {
    }

    private static Map<String, String> metrics() {
        Map<String, String> m = new LinkedHashMap<>();
        m.put("snr", "SNR");
        m.put("sigma", "Noise sigma");
        m.put("signal_mean", "Signal mean");
        m.put("uniformity_piu", "Percent integral uniformity");
        m.put("nema_nonuniformity_percent", "NEMA non-uniformity (%)");
        m.put("ghosting_percent", "Percent-signal ghosting");
        return m;
    }

    /** One row: values by column name (numbers as text, blank when missing). */
    public record Entry(Map<String, String> values) {
        public Entry {
            values = Map.copyOf(values);
        }

        public String get(String column) {
            return values.getOrDefault(column, "");
        }

        public double number(String column) {
            String v = get(column);
            try {
                return v.isBlank() ? Double.NaN : Double.parseDouble(v);
            } catch (NumberFormatException e) {
                return Double.NaN;
            }
        }

        /** The baseline key: scanner, coil and protocol. */
        public String key() {
            return get("scanner") + " | " + get("coil") + " | " + get("protocol");
        }
    }

    /** The header line. */
    public static String header() {
        return String.join(",", COLUMNS);
    }

    /** A row as one CSV line (RFC 4180 quoting). */
    public static String line(Entry e) {
        List<String> out = new ArrayList<>();
        for (String c : COLUMNS) {
            out.add(quote(e.get(c)));
        }
        return String.join(",", out);
    }

    private static String quote(String s) {
        if (s.contains(",") || s.contains("\"") || s.contains("\n") || s.contains("\r")) {
            return '"' + s.replace("\"", "\"\"") + '"';
        }
        return s;
    }

    /**
     * Parses the log's text. Lines that do not have every column (for instance a line cut short by a
     * crash of some other writer) are skipped, so one damaged line never hides the rest of the history.
     */
    public static List<Entry> parse(String text) {
        List<Entry> out = new ArrayList<>();
        List<List<String>> records = records(text);
        if (records.isEmpty()) {
            return out;
        }
        List<String> head = records.get(0);
        for (int r = 1; r < records.size(); r++) {
            List<String> f = records.get(r);
            if (f.size() != head.size()) {
                continue;
            }
            Map<String, String> m = new LinkedHashMap<>();
            for (int i = 0; i < head.size(); i++) {
                m.put(head.get(i), f.get(i));
            }
            out.add(new Entry(m));
        }
        return out;
    }

    /** RFC 4180 records; a final record without its line end is dropped as incomplete. */
    static List<List<String>> records(String text) {
        List<List<String>> out = new ArrayList<>();
        List<String> fields = new ArrayList<>();
        StringBuilder cur = new StringBuilder();
        boolean quoted = false;
        int i = 0;
        while (i < text.length()) {
            char c = text.charAt(i);
            if (quoted) {
                if (c == '"') {
                    if (i + 1 < text.length() && text.charAt(i + 1) == '"') {
                        cur.append('"');
                        i++;
                    } else {
                        quoted = false;
                    }
                } else {
                    cur.append(c);
                }
            } else if (c == '"') {
                quoted = true;
            } else if (c == ',') {
                fields.add(cur.toString());
                cur.setLength(0);
            } else if (c == '\n' || c == '\r') {
                if (c == '\r' && i + 1 < text.length() && text.charAt(i + 1) == '\n') {
                    i++;
                }
                fields.add(cur.toString());
                cur.setLength(0);
                if (!(fields.size() == 1 && fields.get(0).isEmpty())) {
                    out.add(fields);
                }
                fields = new ArrayList<>();
            } else {
                cur.append(c);
            }
            i++;
        }
        return out;
    }

    /** A metric's baseline for one key. */
    public record Baseline(String metric, int sessions, int needed, double mean, double sd) {
        public boolean complete() {
            return sessions >= needed;
        }
    }

    /** The baseline of {@code metric} from the first {@code n} entries of {@code history} with this key. */
    public static Baseline baseline(List<Entry> history, String key, String metric, int n) {
        List<Double> v = new ArrayList<>();
        for (Entry e : history) {
            if (e.key().equals(key) && v.size() < n) {
                double x = e.number(metric);
                if (Double.isFinite(x)) {
                    v.add(x);
                }
            }
        }
        double mean = v.stream().mapToDouble(Double::doubleValue).average().orElse(Double.NaN);
        double ss = 0;
        for (double x : v) {
            ss += (x - mean) * (x - mean);
        }
        double sd = v.size() > 1 ? Math.sqrt(ss / (v.size() - 1)) : Double.NaN;
        return new Baseline(metric, v.size(), n, mean, sd);
    }

    /** How a value compares with its baseline: "", or a flag with "warning" or "action". */
    public static String flag(Baseline b, double value, String label) {
        if (!b.complete() || !Double.isFinite(value) || !(b.sd() > 0)) {
            return "";
        }
        double z = (value - b.mean()) / b.sd();
        if (Math.abs(z) > 3) {
            return String.format(Locale.ROOT, "%s %.4g is %+.1f SD from baseline %.4g (action)", label, value, z, b.mean());
        }
        if (Math.abs(z) > 2) {
            return String.format(Locale.ROOT, "%s %.4g is %+.1f SD from baseline %.4g (warning)", label, value, z, b.mean());
        }
        return "";
    }
}
