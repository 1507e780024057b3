package org.noisewise.report;

import java.util.ArrayList;
import java.util.Base64;
import java.util.List;

/**
 * A self-contained HTML report: headings, key-value and result tables, and PNG images embedded as
 * data URIs, so the single file can be filed or mailed as it is.
 */
public final class HtmlReport {

    private final StringBuilder body = new StringBuilder();
    private final String title;

    public HtmlReport(String title) {
        this.title = title;
    }

    public static String escape(String s) {
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
    }

    public HtmlReport heading(String text) {
        body.append("<h2>").append(escape(text)).append("</h2>\n");
        return this;
    }

    public HtmlReport paragraph(String text, String cssClass) {
        body.append("<p").append(cssClass == null ? "" : " class=\"" + cssClass + "\"").append(">")
                .append(escape(text)).append("</p>\n");
        return this;
    }

    /**
     * A two-column table of a result row's table cells (heading, value); warnings as a list. Numbers are
     * shown to meaningful digits ({@link Formats#meaningful}); the full value is kept in the cell's
     * {@code data-value} attribute.
     */
    public HtmlReport resultTable(ResultRow row, String id) {
        body.append("<table class=\"kv\" id=\"").append(escape(id)).append("\">\n");
        for (ResultRow.Cell c : row.tableCells()) {
            body.append("<tr><th>").append(escape(c.heading())).append("</th><td data-key=\"").append(escape(c.key()))
                    .append("\"");
            if (c.value() instanceof Double d && Double.isFinite(d)) {
                body.append(" data-value=\"").append(Formats.csvValue(d)).append("\"");
            }
            body.append(">");
            if (c.value() instanceof List<?> list) {
                body.append(list.isEmpty() ? "none" : "<ul>");
                for (Object o : list) {
                    body.append("<li>").append(escape(Formats.text(List.of(o)))).append("</li>");
                }
                body.append(list.isEmpty() ? "" : "</ul>");
            } else if (c.value() instanceof Double d) {
                body.append(escape(Formats.meaningful(row, c.key(), d)));
            } else {
                body.append(escape(Formats.text(c.value())));
            }
            body.append("</td></tr>\n");
        }
        body.append("</table>\n");
        return this;
    }

    /** A table with a header row. */
    public HtmlReport table(List<String> header, List<List<String>> rows) {
        body.append("<table class=\"grid\">\n<tr>");
        for (String h : header) {
            body.append("<th>").append(escape(h)).append("</th>");
        }
        body.append("</tr>\n");
        for (List<String> r : rows) {
            body.append("<tr>");
            for (String v : r) {
                body.append("<td>").append(escape(v)).append("</td>");
            }
            body.append("</tr>\n");
        }
        body.append("</table>\n");
        return this;
    }

    /** An embedded PNG with a caption. */
    public HtmlReport image(String caption, byte[] png) {
        body.append("<figure><img alt=\"").append(escape(caption)).append("\" src=\"data:image/png;base64,")
                .append(Base64.getEncoder().encodeToString(png)).append("\"><figcaption>").append(escape(caption))
                .append("</figcaption></figure>\n");
        return this;
    }

    public String html() {
        List<String> css = new ArrayList<>();
        css.add("body{font-family:sans-serif;max-width:60em;margin:2em auto;color:#222}");
        css.add("table{border-collapse:collapse;margin:1em 0}th,td{border:1px solid #bbb;padding:.25em .6em;"
                + "text-align:left;vertical-align:top}th{background:#eee}");
        css.add("figure{display:inline-block;margin:.5em}img{max-width:100%;border:1px solid #ccc}");
        css.add(".caution{background:#fff6dc;border:1px solid #e0c060;padding:.6em}");
        css.add(".flag{color:#a00;font-weight:bold}");
        return "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>" + escape(title)
                + "</title>\n<style>" + String.join("\n", css) + "</style></head>\n<body>\n<h1>" + escape(title)
                + "</h1>\n" + body + "</body></html>\n";
    }
}
