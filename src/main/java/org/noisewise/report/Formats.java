package org.noisewise.report;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonNull;
import com.google.gson.JsonObject;
import com.google.gson.JsonPrimitive;
import java.util.List;
import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Collectors;
import org.noisewise.estimate.Warning;

/** Writes {@link ResultRow}s as JSON, aligned text, CSV cells. */
public final class Formats {

    private static final Pattern INDEXED = Pattern.compile("(.+)\\[(\\d+)]");

    private Formats() {
    }

    /** The row as one JSON object. NaN and infinite numbers become {@code null}. */
    public static JsonObject toJson(ResultRow row) {
        JsonObject root = new JsonObject();
        for (ResultRow.Cell c : row.cells()) {
            put(root, c.key(), json(c.value()));
        }
        return root;
    }

    public static String toJsonString(JsonElement e) {
        return new GsonBuilder().serializeNulls().setPrettyPrinting().disableHtmlEscaping().create().toJson(e);
    }

    private static void put(JsonObject root, String key, JsonElement value) {
        String[] parts = key.split("\\.");
        JsonObject obj = root;
        for (int i = 0; i < parts.length - 1; i++) {
            JsonElement child = obj.get(parts[i]);
            if (child == null) {
                child = new JsonObject();
                obj.add(parts[i], child);
            }
            obj = child.getAsJsonObject();
        }
        String last = parts[parts.length - 1];
        Matcher m = INDEXED.matcher(last);
        if (m.matches()) {
            JsonElement arr = obj.get(m.group(1));
            if (arr == null) {
                arr = new JsonArray();
                obj.add(m.group(1), arr);
            }
            JsonArray a = arr.getAsJsonArray();
            int index = Integer.parseInt(m.group(2));
            while (a.size() <= index) {
                a.add(JsonNull.INSTANCE);
            }
            a.set(index, value);
        } else {
            obj.add(last, value);
        }
    }

    private static JsonElement json(Object v) {
        if (v == null) {
            return JsonNull.INSTANCE;
        }
        if (v instanceof JsonElement e) {
            return e.deepCopy();
        }
        if (v instanceof Double d) {
            return Double.isFinite(d) ? new JsonPrimitive(d) : JsonNull.INSTANCE;
        }
        if (v instanceof Number n) {
            return new JsonPrimitive(n);
        }
        if (v instanceof double[] arr) {
            JsonArray a = new JsonArray();
            for (double d : arr) {
                a.add(json(d));
            }
            return a;
        }
        if (v instanceof Boolean b) {
            return new JsonPrimitive(b);
        }
        if (v instanceof List<?> list) {
            JsonArray a = new JsonArray();
            for (Object o : list) {
                if (o instanceof Warning w) {
                    JsonObject wo = new JsonObject();
                    wo.addProperty("code", w.code());
                    wo.addProperty("message", w.message());
                    a.add(wo);
                } else {
                    a.add(json(o));
                }
            }
            return a;
        }
        return new JsonPrimitive(v.toString());
    }

    /** A cell's value as table text: numbers to 6 significant digits, blanks for missing values. */
    public static String text(Object v) {
        if (v == null) {
            return "";
        }
        if (v instanceof Double d) {
            if (!Double.isFinite(d)) {
                return "";
            }
            return sig(d, 6);
        }
        if (v instanceof List<?> list) {
            return list.stream().map(o -> o instanceof Warning w ? w.message() : String.valueOf(o))
                    .collect(Collectors.joining("; "));
        }
        if (v instanceof Boolean b) {
            return b ? "yes" : "no";
        }
        return v.toString();
    }

    /**
     * Rows as an aligned text table: one line of headings and one line per row, or, for a single
     * row, one "heading: value" line per cell, which reads better in a terminal.
     */
    public static String alignedText(List<ResultRow> rows) {
        if (rows.isEmpty()) {
            return "";
        }
        StringBuilder sb = new StringBuilder();
        if (rows.size() == 1) {
            List<ResultRow.Cell> cells = rows.get(0).tableCells();
            int w = cells.stream().mapToInt(c -> c.heading().length()).max().orElse(0);
            for (ResultRow.Cell c : cells) {
                String t = c.value() instanceof Double d ? meaningful(rows.get(0), c.key(), d) : text(c.value());
                if (c.value() instanceof List<?> list) {
                    if (list.isEmpty()) {
                        t = "none";
                    } else {
                        t = list.stream().map(o -> o instanceof Warning wr ? wr.message() : String.valueOf(o))
                                .collect(Collectors.joining("\n" + " ".repeat(w + 2)));
                    }
                }
                sb.append(String.format(Locale.ROOT, "%-" + w + "s  %s%n", c.heading(), t));
            }
            return sb.toString();
        }
        List<ResultRow.Cell> columns = columns(rows);
        List<String> heads = columns.stream().map(ResultRow.Cell::heading).toList();
        List<List<String>> lines = new java.util.ArrayList<>(rows.size());
        for (ResultRow r : rows) {
            java.util.Map<String, String> byKey = new java.util.HashMap<>();
            for (ResultRow.Cell c : r.tableCells()) {
                byKey.put(c.key(), shown(r, c));
            }
            List<String> line = new java.util.ArrayList<>(heads.size());
            for (ResultRow.Cell col : columns) {
                line.add(byKey.getOrDefault(col.key(), ""));
            }
            lines.add(line);
        }
        int[] widths = new int[heads.size()];
        for (int i = 0; i < heads.size(); i++) {
            widths[i] = heads.get(i).length();
            for (List<String> line : lines) {
                widths[i] = Math.max(widths[i], line.get(i).length());
            }
        }
        appendLine(sb, heads, widths);
        for (List<String> line : lines) {
            appendLine(sb, line, widths);
        }
        return sb.toString();
    }

    /** A cell as a table shows it: numbers to meaningful digits. */
    static String shown(ResultRow row, ResultRow.Cell c) {
        return c.value() instanceof Double d ? meaningful(row, c.key(), d) : text(c.value());
    }

    private static void appendLine(StringBuilder sb, List<String> values, int[] widths) {
        for (int i = 0; i < values.size(); i++) {
            if (i > 0) {
                sb.append("  ");
            }
            String v = values.get(i);
            sb.append(v);
            for (int pad = v.length(); pad < widths[i]; pad++) {
                sb.append(' ');
            }
        }
        sb.append(System.lineSeparator());
    }

    /** Rows as CSV (RFC 4180): the headings of the first row, then one line per row, full precision. */
    public static String toCsv(List<ResultRow> rows) {
        StringBuilder sb = new StringBuilder();
        if (rows.isEmpty()) {
            return "";
        }
        List<ResultRow.Cell> columns = columns(rows);
        sb.append(columns.stream().map(c -> csvField(c.heading())).collect(Collectors.joining(","))).append("\r\n");
        for (ResultRow r : rows) {
            java.util.Map<String, Object> byKey = new java.util.HashMap<>();
            for (ResultRow.Cell c : r.tableCells()) {
                byKey.put(c.key(), c.value());
            }
            sb.append(columns.stream().map(c -> csvField(byKey.containsKey(c.key()) ? csvValue(byKey.get(c.key())) : ""))
                    .collect(Collectors.joining(","))).append("\r\n");
        }
        return sb.toString();
    }

    /**
     * The table columns of several rows: the first row's, then any column a later row adds, placed after
     * the column it follows in that row (a Z x T series' z slice and repeat beside a 2-D image's rows in
     * one batch); a row without a column leaves it blank.
     */
    static List<ResultRow.Cell> columns(List<ResultRow> rows) {
        List<ResultRow.Cell> out = new java.util.ArrayList<>();
        java.util.Set<String> seen = new java.util.HashSet<>();
        for (ResultRow r : rows) {
            String previous = null;
            for (ResultRow.Cell c : r.tableCells()) {
                if (seen.add(c.key())) {
                    int at = 0;
                    if (previous != null) {
                        for (int i = 0; i < out.size(); i++) {
                            if (out.get(i).key().equals(previous)) {
                                at = i + 1;
                            }
                        }
                    }
                    out.add(at, c);
                }
                previous = c.key();
            }
        }
        return out;
    }

    /**
     * A number to the digits its 95% interval makes meaningful: two significant digits of the
     * interval's half-width decide the decimals of the value and of its bounds (keys {@code x},
     * {@code x_ci95[0]}, {@code x_ci95[1]} in the row); numbers without an interval get 4 significant digits.
     */
    public static String meaningful(ResultRow row, String key, double v) {
        if (!Double.isFinite(v)) {
            return "";
        }
        String base = intervalBase(key);
        Object lo = row.get(base + "_ci95[0]");
        Object hi = row.get(base + "_ci95[1]");
        if (lo instanceof Double l && hi instanceof Double h && Double.isFinite(l) && Double.isFinite(h) && h > l) {
            double half = 0.5 * (h - l);
            int decimals = (int) Math.max(0, Math.min(12, 1 - Math.floor(Math.log10(half))));
            return String.format(Locale.ROOT, "%." + decimals + "f", v);
        }
        return sig(v, 4);
    }

    /** The key of the value an interval bound belongs to ({@code x} for {@code x_ci95[0]}), else the key itself. */
    private static String intervalBase(String key) {
        return key.endsWith("_ci95[0]") || key.endsWith("_ci95[1]") ? key.substring(0, key.length() - 8) : key;
    }

    /** The decimals {@link #meaningful} shows for a value (at most 12). */
    public static int decimals(ResultRow row, String key, double v) {
        if (!Double.isFinite(v)) {
            return 0;
        }
        String base = intervalBase(key);
        Object lo = row.get(base + "_ci95[0]");
        Object hi = row.get(base + "_ci95[1]");
        if (lo instanceof Double l && hi instanceof Double h && Double.isFinite(l) && Double.isFinite(h) && h > l) {
            return (int) Math.max(0, Math.min(12, 1 - Math.floor(Math.log10(0.5 * (h - l)))));
        }
        return v == 0 ? 0 : (int) Math.max(0, Math.min(12, 3 - Math.floor(Math.log10(Math.abs(v)))));
    }

    /** A number to {@code digits} significant digits, without trailing zeros; "" for NaN. */
    public static String sig(double v, int digits) {
        if (!Double.isFinite(v)) {
            return "";
        }
        return trimZeros(String.format(Locale.ROOT, "%." + digits + "g", v));
    }

    /** Drops the trailing zeros of a decimal fraction (and a bare point), before any exponent: 1.2300e+05 -> 1.23e+05. */
    static String trimZeros(String s) {
        int point = s.indexOf('.');
        if (point < 0) {
            return s;
        }
        int exp = s.indexOf('e', point);
        int end = exp < 0 ? s.length() : exp;
        int cut = end;
        while (cut > point + 1 && s.charAt(cut - 1) == '0') {
            cut--;
        }
        if (cut == point + 1) {
            cut = point;
        }
        return cut == end ? s : s.substring(0, cut) + s.substring(end);
    }

    /** A value as CSV text: numbers at full precision, blanks for missing values. */
    public static String csvValue(Object v) {
        if (v instanceof Double d) {
            return Double.isFinite(d) ? Double.toString(d) : "";
        }
        return text(v);
    }

    /** A CSV field, quoted when needed (RFC 4180). */
    public static String csvField(String s) {
        if (s.contains(",") || s.contains("\"") || s.contains("\n") || s.contains("\r")) {
            return '"' + s.replace("\"", "\"\"") + '"';
        }
        return s;
    }
}
