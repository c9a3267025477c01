package org.rungs.cli;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.rungs.validation.calibration.CalibrationSummary;
import org.rungs.validation.calibration.ParameterRank;
import org.rungs.validation.calibration.ReplicationResult;

/** The console's summary of a calibration: the spreads' moves are totalled where the records have them. */
class CalibrateReportTest {

    private static String printed(List<ReplicationResult> results) {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        CalibrateCommand.report(CalibrationSummary.of(results, 19, 0.01), Path.of("out"),
                new PrintStream(bytes, true, StandardCharsets.UTF_8));
        return bytes.toString(StandardCharsets.UTF_8);
    }

    private static List<ParameterRank> ranks(int replication) {
        return List.of(new ParameterRank("level.x1", 0.5, replication % 20, 19, 1.001, 500, 400, false));
    }

    @Test
    void theSpreadMovesAreTotalledOverTheRecordedChains() {
        List<ReplicationResult> results = new ArrayList<>();
        results.add(new ReplicationResult(0, ranks(0), List.of("threshold_sd, style_sd", "none")));
        results.add(new ReplicationResult(1, ranks(1), List.of("style_sd", "threshold_sd")));
        results.add(new ReplicationResult(2, ranks(2))); // an older record: not counted
        String text = printed(results);
        assertTrue(text.contains("The spreads' non-centred moves ran in 2 of 4 chains for threshold_sd and 2 for style_sd"), text);
    }

    @Test
    void withoutRecordedMovesNoSuchLine() {
        String text = printed(List.of(new ReplicationResult(0, ranks(0)), new ReplicationResult(1, ranks(1))));
        assertFalse(text.contains("non-centred moves"), text);
        assertTrue(text.contains("2 replications; 0 non-converged fits"), text);
    }
}
