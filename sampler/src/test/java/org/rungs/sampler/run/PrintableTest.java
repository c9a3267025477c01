package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Labels from a data file on the console: control characters become visible escapes, the rest stays. */
class PrintableTest {
    @Test
    void controlCharactersBecomeVisibleEscapes() {
        assertEquals("Vale\\u0009End", Printable.of("Vale\tEnd"));
        assertEquals("a\\u001b[31mb\\u007f", Printable.of("a\u001b[31mb\u007f"));
        assertEquals("Dunsellow \u00e9", Printable.of("Dunsellow \u00e9"));
    }
}
