package org.noisewise.diagnose;

/** Whether a measurement's assumptions hold. */
public enum Verdict {
    /** Nothing in the data contradicts the method. */
    VALID("valid"),
    /** Something is off; the number is reported with reasons and should be confirmed another way. */
    QUESTIONABLE("questionable"),
    /** The method cannot give a trustworthy number here; none is reported. */
    INVALID("invalid");

    private final String key;

    Verdict(String key) {
        this.key = key;
    }

    public String key() {
        return key;
    }

    /** The worse of two verdicts. */
    public Verdict worst(Verdict other) {
        return other.ordinal() > ordinal() ? other : this;
    }
}
