package org.noisewise.estimate;

/**
 * A caution attached to a result: a stable machine-readable {@code code} and a sentence for a
 * physicist.
 */
public record Warning(String code, String message) {

    public Warning {
        if (code == null || code.isBlank() || message == null || message.isBlank()) {
            throw new IllegalArgumentException("a warning needs a code and a message");
        }
    }
}
