package org.rungs.validation.calibration;

import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicBoolean;

/** What the calibration tests share: a whole run on 2 threads, and the verdicts as a failure message. */
final class SbcRuns {
    private SbcRuns() {
    }

    static CalibrationSummary run(CalibrationConfig config, Path dir) {
        return Calibration.run(config, dir, Shard.ALL, 2, null, new AtomicBoolean());
    }

    static String report(CalibrationSummary s) {
        StringBuilder sb = new StringBuilder();
        for (Verdict v : s.verdicts()) {
            sb.append(String.format(Locale.ROOT, "%n%s chi2=%.1f p=%.3g dev=%.3f band=%s %s", v.parameter(),
                    v.chiSquare().statistic(), v.chiSquare().p(), v.ecdfMaxDeviation(), v.bandExceeded(), v.word()));
        }
        return sb.toString();
    }
}
