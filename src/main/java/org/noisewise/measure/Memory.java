package org.noisewise.measure;

import java.util.Locale;

/** The Java heap, in the words both faces use when it runs out. */
public final class Memory {

    private Memory() {
    }

    /** "the Java heap is at most 2048 MB". */
    public static String heapText() {
        return String.format(Locale.ROOT, "the Java heap is at most %d MB", Runtime.getRuntime().maxMemory() >> 20);
    }
}
