package org.noisewise.estimate;

/**
 * The user's input cannot be measured: an empty or out-of-bounds region, NaN pixels, mismatched
 * sizes, an unsupported image. The message says what is wrong and what to do; the faces show it
 * as one line (a dialog in ImageJ, stderr and exit status 3 on the command line).
 */
public class InputException extends Exception {

    private static final long serialVersionUID = 1L;

    public InputException(String message) {
        super(message);
    }
}
