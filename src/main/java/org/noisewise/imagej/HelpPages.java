package org.noisewise.imagej;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;

/**
 * Each dialog's Help: the command's own section of the README (bundled in the plugin jar as
 * {@code help/README.md}), as simple HTML that ImageJ shows in a scrolling window. One text serves the
 * README and the dialogs, so they never disagree.
 */
final class HelpPages {

    static final String RESOURCE = "/help/README.md";

    private HelpPages() {
    }

    /** The README section headed {@code ## heading} (with its sub-sections) as HTML, or a pointer to the README. */
    static String html(String heading) {
        String md = readme();
        String section = md == null ? null : section(md, heading);
        if (section == null) {
            return "<html><body><h2>" + escape(heading) + "</h2><p>See the section '" + escape(heading)
                    + "' of the Noisewise README.</p></body></html>";
        }
        return "<html><body>" + toHtml(section) + "<p><i>Noisewise: for image-quality QA and research; not a diagnostic "
                + "device.</i></p></body></html>";
    }

    static String readme() {
        try (InputStream in = HelpPages.class.getResourceAsStream(RESOURCE)) {
            return in == null ? null : new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            return null;
        }
    }

    /** The lines from {@code ## heading} to the next level-2 heading (code blocks skipped when looking). */
    static String section(String md, String heading) {
        String[] lines = md.split("\n", -1);
        StringBuilder sb = null;
        boolean code = false;
        for (String line : lines) {
            if (line.startsWith("```")) {
                code = !code;
            }
            if (!code && line.startsWith("## ")) {
                if (sb != null) {
                    break;
                }
                if (line.substring(3).trim().equals(heading)) {
                    sb = new StringBuilder();
                }
            }
            if (sb != null) {
                sb.append(line).append('\n');
            }
        }
        return sb == null ? null : sb.toString();
    }

    /** A small Markdown subset: headings, paragraphs, bullet lists, code blocks and tables (as preformatted text). */
    static String toHtml(String md) {
        StringBuilder out = new StringBuilder();
        List<String> para = new ArrayList<>();
        boolean code = false;
        boolean list = false;
        boolean table = false;
        for (String line : md.split("\n", -1)) {
            if (line.startsWith("```")) {
                flush(out, para);
                if (list) {
                    out.append("</ul>");
                    list = false;
                }
                out.append(code ? "</pre>" : "<pre>");
                code = !code;
                continue;
            }
            if (code) {
                out.append(escape(line)).append('\n');
                continue;
            }
            String t = line.trim();
            if (t.startsWith("|")) {
                flush(out, para);
                if (!table) {
                    out.append("<table border=\"1\" cellspacing=\"0\" cellpadding=\"3\">");
                    table = true;
                }
                if (!t.matches("\\|[-| :]+\\|")) {
                    out.append("<tr>");
                    for (String cell : t.substring(1, t.length() - 1).split("(?<!\\\\)\\|", -1)) {
                        out.append("<td>").append(inline(cell.trim().replace("\\|", "|"))).append("</td>");
                    }
                    out.append("</tr>");
                }
                continue;
            }
            if (table) {
                out.append("</table>");
                table = false;
            }
            if (t.startsWith("#")) {
                flush(out, para);
                int level = Math.min(4, t.indexOf(' ') + 1);
                out.append("<h").append(level).append('>').append(inline(t.substring(t.indexOf(' ') + 1)))
                        .append("</h").append(level).append('>');
                continue;
            }
            if (t.matches("\\d+\\. .*")) {
                flush(out, para);
                if (list) {
                    out.append("</ul>");
                    list = false;
                }
                out.append("<p>").append(inline(t));
                continue;
            }
            if (t.startsWith("- ")) {
                flush(out, para);
                if (!list) {
                    out.append("<ul>");
                    list = true;
                }
                out.append("<li>").append(inline(t.substring(2)));
                continue;
            }
            if (t.isEmpty()) {
                flush(out, para);
                if (list) {
                    out.append("</ul>");
                    list = false;
                }
                continue;
            }
            if (t.startsWith("![")) {
                continue;
            }
            para.add(t);
        }
        flush(out, para);
        if (list) {
            out.append("</ul>");
        }
        if (table) {
            out.append("</table>");
        }
        return out.toString();
    }

    private static void flush(StringBuilder out, List<String> para) {
        if (!para.isEmpty()) {
            out.append("<p>").append(inline(String.join(" ", para))).append("</p>");
            para.clear();
        }
    }

    /** Escapes HTML, then renders `code` and **bold**. */
    private static String inline(String s) {
        return escape(s).replaceAll("`([^`]+)`", "<code>$1</code>").replaceAll("\\*\\*([^*]+)\\*\\*", "<b>$1</b>");
    }

    static String escape(String s) {
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;");
    }
}
