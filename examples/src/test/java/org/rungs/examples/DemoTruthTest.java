package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** demo-truth.csv read back for a demo continued by 'rungs fit --resume'. */
class DemoTruthTest {
    @TempDir
    Path dir;

    @Test
    void theTrueValuesReadBackAreThoseWritten() throws IOException {
        SimulatedSurvey data = Simulator.simulate(DemoScenario.scenario(), DemoScenario.SEED);
        data.writeTruth(dir.resolve(Demo.TRUTH_FILE));
        // Double.toString round-trips, so the values are equal to the last bit
        assertEquals(data.truth(), Demo.readTruth(dir, dir.resolve(Demo.SURVEY_FILE)));
        assertTrue(Demo.readTruth(dir, dir.resolve("survey.csv")).isEmpty(), "another survey file is no demo");
        assertTrue(Demo.readTruth(dir.resolve("elsewhere"), dir.resolve(Demo.SURVEY_FILE)).isEmpty(),
                "a folder without demo-truth.csv is no demo");
    }

    @Test
    void aDamagedRowIsNamed() throws IOException {
        Path file = Files.writeString(dir.resolve(Demo.TRUTH_FILE), "parameter,value\nthreshold.1,0.5\nstyle_mean;-1\n");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Demo.readTruth(dir, dir.resolve(Demo.SURVEY_FILE)));
        assertTrue(e.getMessage().startsWith(file + ", row 3: expected a parameter's name and its true value"), e.getMessage());
        Files.writeString(file, "name,truth\n");
        e = assertThrows(IllegalArgumentException.class, () -> Demo.readTruth(dir, dir.resolve(Demo.SURVEY_FILE)));
        assertTrue(e.getMessage().contains("row 1: expected the header 'parameter,value'"), e.getMessage());
    }
}
