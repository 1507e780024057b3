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

    /** One cell; a {@code null} heading marks a JSON-only cell that tables and CSV leave out. */
    public record Cell(String key, String heading, Object value) {
        public boolean inTable() {
            return heading != null;
        }
    }

    private final List<Cell> cells = new ArrayList<>();

    public ResultRow add(String key, String heading, Object value) {
        cells.add(new Cell(key, heading, value));
        return this;
    }

    /** Inserts a cell right after the cell with key {@code after} (at the end when there is none). */
    public ResultRow addAfter(String after, String key, String heading, Object value) {
        for (int i = 0; i < cells.size(); i++) {
            if (cells.get(i).key().equals(after)) {
                cells.add(i + 1, new Cell(key, heading, value));
                return this;
            }
        }
        return add(key, heading, value);
    }

    public List<Cell> cells() {
        return Collections.unmodifiableList(cells);
    }

    /** The headings of the table cells. */
    public List<String> headings() {
        return tableCells().stream().map(Cell::heading).toList();
    }

    /** The cells that appear in tables and CSV. */
    public List<Cell> tableCells() {
        return cells.stream().filter(Cell::inTable).toList();
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
