package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import org.junit.jupiter.api.Test;

/** Rows of style covariates numbered in order of first appearance, compared bit for bit, with a limit. */
class StyleRowsTest {
    @Test
    void numbersRowsInOrderOfFirstAppearance() {
        double[][] columns = {{1, 0, 1, 0, 1, -0.0}, {0, 0, 0, 1, 0, 0}};
        StyleRows rows = StyleRows.of(columns, 6, 8);
        // (1,0) (0,0) (1,0) (0,1) (1,0) (-0,0): -0 differs from 0 bit for bit, so it is a row of its own
        assertArrayEquals(new int[] {0, 1, 0, 2, 0, 3}, rows.number());
        assertEquals(4, rows.count());
        assertArrayEquals(new double[] {0, 1}, rows.values()[2], 0.0);
        assertEquals(4, StyleRows.of(columns, 6, 4).count(), "exactly at the limit");
        assertNull(StyleRows.of(columns, 6, 3), "one row more than the limit");
    }
}
