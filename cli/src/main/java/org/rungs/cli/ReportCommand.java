package org.rungs.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.rungs.posteriors.report.Report;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;

/** {@code rungs report DIR}: writes the self-contained HTML report of a finished fit. */
@Command(name = "report",
        mixinStandardHelpOptions = true,
        description = {"Write report.html, a self-contained page of charts, into a fit folder.",
                "The page (charts inline, no network needed) shows what was fitted, convergence, distributions, "
                        + "corrected means, coarse shares, attraction, covariate effects and cautions."})
public final class ReportCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "DIR", description = "Fit folder written by 'rungs fit' or 'rungs demo'.")
    Path dir;

    @Override
    public Integer call() {
        try {
            Path report = Report.write(dir);
            System.out.println("rungs: report written to " + report);
            return 0;
        } catch (IOException e) {
            System.err.println("rungs report: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
    }
}
