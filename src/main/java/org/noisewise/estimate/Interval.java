package org.noisewise.estimate;

/** A two-sided confidence interval {@code [low, high]}. */
public record Interval(double low, double high) {

    public boolean contains(double value) {
        return value >= low && value <= high;
    }

    public double width() {
        return high - low;
    }
}
