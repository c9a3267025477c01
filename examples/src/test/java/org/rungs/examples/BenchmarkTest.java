package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.EnumSet;
import org.junit.jupiter.api.Test;

/** The benchmark times the models it is asked for, and only those. */
class BenchmarkTest {
    @Test
    void timesOnlyTheModelsAskedFor() {
        ByteArrayOutputStream log = new ByteArrayOutputStream();
        Benchmark.Settings settings = new Benchmark.Settings(new int[] {500}, 8, 3, new int[0], 0, 10,
                EnumSet.of(Benchmark.Model.COARSE));
        String report = Benchmark.run(settings, new PrintStream(log, true, StandardCharsets.UTF_8));
        assertTrue(report.contains("Speed with the coarse class on"), report);
        assertFalse(report.contains("Speed of the plain ordered probit"), report);
        assertFalse(report.contains("Speed of the complete model"), report);
        // the coarse model runs half the sweeps: 8 / 2 = 4 at the largest (and only) size
        assertTrue(report.contains("| 500 | 4 |"), report);
        String row = report.lines().filter(l -> l.startsWith("| 500 | 4 |")).findFirst().orElseThrow();
        assertTrue(report.contains("| its leapfrog steps | its walls |"), report);
        assertEquals(10, row.chars().filter(c -> c == '|').count(), "nine cells: " + row);
        String text = log.toString(StandardCharsets.UTF_8);
        assertEquals(1, text.lines().filter(l -> l.contains("respondents,") && l.contains("sweeps")).count(), text);
    }
}
