package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The line under the demo's table of true values: what to expect depends on whether attraction was fitted. */
class DemoCoverageTest {

    @Test
    void saysTheFitLeavesAttractionOutOnlyWhenItDoes() {
        String without = Demo.coverage(150, 170, false);
        String with = Demo.coverage(150, 170, true);
        assertTrue(without.startsWith("150 of 170 true values"), without);
        assertTrue(with.startsWith("150 of 170 true values"), with);
        assertTrue(without.contains("leaves out"), without);
        assertFalse(with.contains("leaves out"), with);
        assertTrue(with.contains("number attraction included"), with);
    }
}
