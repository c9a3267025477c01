package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
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

    /** Small values keep three significant digits, so a value outside its interval shows why. */
    @Test
    void aRowOfSmallValuesShowsThreeSignificantDigits() {
        String age = Demo.row("level.age.per_unit", -0.004, -0.002539, -0.003414, -0.001669, false);
        assertEquals(String.format("%-34s  -0.00400  -0.00254 [-0.00341, -0.00167]  outside%n", "level.age.per_unit"), age);
        String mean = Demo.row("intended_mean.Eastmarch", 7.259, 7.301, 7.223, 7.374, true);
        assertEquals(String.format("%-34s     7.259     7.301 [   7.223,    7.374]%n", "intended_mean.Eastmarch"), mean);
        // the columns line up with the header's: name, true, mean and a 20-character interval
        String header = String.format("%-34s %9s %9s %20s%n", "parameter", "true", "mean", "90% interval");
        assertEquals(header.length(), mean.length());
        assertEquals(header.length(), age.length() - "  outside".length());
    }
}
