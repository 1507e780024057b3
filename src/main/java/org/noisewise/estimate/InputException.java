package org.noisewise.estimate;

/**
 * The user's input cannot be measured: an empty or out-of-bounds region, NaN pixels, mismatched
 * sizes, an unsupported image. The message says what is wrong and what to do; the faces show it
 * as one line (a dialog in ImageJ, stderr and exit status 3 on the command line). A remedy that is
 * an option of the face (replacing an existing file) is named by each face in its own words.
 */
public class InputException extends Exception {

    private static final long serialVersionUID = 1L;

    /** A remedy that each face words itself. */
    public enum Remedy {
        /** None beyond the message. */
        NONE,
        /** Allow an existing output file to be replaced. */
        REPLACE
    }

    private final Remedy remedy;

    public InputException(String message) {
        this(message, Remedy.NONE);
    }

    public InputException(String message, Remedy remedy) {
        super(message);
        this.remedy = remedy;
    }

    public Remedy remedy() {
        return remedy;
    }
}
