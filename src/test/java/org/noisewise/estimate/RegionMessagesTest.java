package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** A region that does not fit says whether it is partly or entirely outside, and what to do. */
class RegionMessagesTest {

    @Test
    void partlyAndEntirelyOutside() {
        InputException partly = assertThrows(InputException.class, () -> Region.rectangle("signal", 60, 60, 10, 10, 64, 64));
        assertTrue(partly.getMessage().contains("partly") && partly.getMessage().contains("shrink"), partly.getMessage());
        InputException entirely = assertThrows(InputException.class,
                () -> Region.rectangle("bg", 70, 10, 5, 5, 64, 64));
        assertTrue(entirely.getMessage().contains("entirely") && entirely.getMessage().contains("move it onto"),
                entirely.getMessage());
        InputException oval = assertThrows(InputException.class, () -> Region.oval("o", -20, -20, 10, 10, 64, 64));
        assertTrue(oval.getMessage().contains("entirely"), oval.getMessage());
    }
}
