package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.junit.jupiter.api.Test;

class DrawsTest {

    @Test
    void rowsAndCellsLandInTheirChainAndIteration() {
        Draws draws = new Draws(List.of("a", "b"), 2, 3);
        draws.putRow(1, 2, new double[] {1.5, -2.5});
        draws.set(0, 0, 1, 7);
        assertEquals(1.5, draws.get(0, 1, 2), 0);
        assertEquals(-2.5, draws.get(1, 1, 2), 0);
        assertArrayEquals(new double[][] {{0, 7, 0}, {0, 0, 1.5}}, draws.chainsOf(0));
        assertEquals(1, draws.indexOf("b"));
        assertEquals(-1, draws.indexOf("c"));
        assertEquals(2, draws.parameterCount());
    }

    @Test
    void chainsOfIsACopy() {
        Draws draws = new Draws(List.of("a"), 1, 2);
        draws.chainsOf(0)[0][0] = 9;
        assertEquals(0, draws.get(0, 0, 0), 0);
    }

    @Test
    void withIterationsKeepsTheFirstDrawsOfEveryChain() {
        Draws draws = new Draws(List.of("a", "b"), 3, 4);
        for (int c = 0; c < 3; c++) {
            for (int i = 0; i < 4; i++) {
                draws.putRow(c, i, new double[] {10 * c + i, -(10 * c + i)});
            }
        }
        Draws kept = draws.withIterations(2);
        assertEquals(2, kept.iterations());
        assertEquals(3, kept.chains());
        assertArrayEquals(new double[][] {{0, 1}, {10, 11}, {20, 21}}, kept.chainsOf(0));
        assertArrayEquals(new double[][] {{0, -1}, {-10, -11}, {-20, -21}}, kept.chainsOf(1));
        assertEquals(List.of("a", "b"), kept.names());
        assertThrows(IndexOutOfBoundsException.class, () -> draws.withIterations(5));
    }

    @Test
    void rejectsDuplicateNamesAndOutOfRangeIndices() {
        assertThrows(IllegalArgumentException.class, () -> new Draws(List.of("a", "b", "a"), 1, 1));
        assertThrows(IllegalArgumentException.class, () -> new Draws(List.of("a"), 0, 1));
        Draws draws = new Draws(List.of("a"), 2, 3);
        // iteration 3 of chain 0 would otherwise be iteration 0 of chain 1
        assertThrows(IndexOutOfBoundsException.class, () -> draws.get(0, 0, 3));
        assertThrows(IndexOutOfBoundsException.class, () -> draws.set(0, 2, 0, 1));
        assertThrows(IllegalArgumentException.class, () -> draws.putRow(0, 0, new double[2]));
        assertThrows(UnsupportedOperationException.class, () -> draws.names().add("b"));
    }
}
