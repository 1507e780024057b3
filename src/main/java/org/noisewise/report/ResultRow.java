package org.noisewise.report;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;

/**
 * One result described once, as an ordered list of cells. Each cell has a JSON key (dotted for a
 * nested object, {@code name[i]} for an array element), a table heading with its unit, and a value
 * ({@link Number}, {@link String}, {@code null}, or a list of
 * {@link org.noisewise.estimate.Warning}). The ImageJ table, the command-line table, CSV and JSON
 * are all written from this one description, so the faces never disagree.
 */
public final class ResultRow {

    /** One cell. */
    public record Cell(String key, String heading, Object value) {
    }

    private final List<Cell> cells = new ArrayList<>();

    public ResultRow add(String key, String heading, Object value) {
        cells.add(new Cell(key, heading, value));
        return this;
    }

    public List<Cell> cells() {
        return Collections.unmodifiableList(cells);
    }

    public List<String> headings() {
        return cells.stream().map(Cell::heading).toList();
    }

    /** The value of the cell with this JSON key, or {@code null}. */
    public Object get(String key) {
        for (Cell c : cells) {
            if (c.key().equals(key)) {
                return c.value();
            }
        }
        return null;
    }
}
