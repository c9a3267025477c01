package org.rungs.posteriors;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

/** Parameter summaries as a CSV file, a console table and a one-line verdict. */
public final class SummaryTable {
    static final String CSV_HEADER = "name,mean,sd,q5,q50,q95,rhat,ess_bulk,ess_tail,mcse_mean,flag,rhat_chance";

    private SummaryTable() {
    }

    /** One row per parameter with full-precision numbers; written atomically. */
    public static void writeCsv(List<ParameterSummary> summaries, Path file) throws IOException {
        AtomicFiles.write(file, out -> {
            out.append(CSV_HEADER).append('\n');
            StringBuilder line = new StringBuilder();
            for (ParameterSummary s : summaries) {
                line.setLength(0);
                line.append(CsvField.quote(s.name()));
                for (double v : new double[] {s.mean(), s.sd(), s.q05(), s.q50(), s.q95(), s.rhat(), s.essBulk(),
                        s.essTail(), s.mcseMean()}) {
                    line.append(',').append(v);
                }
                line.append(',').append(CsvField.quote(s.flag())).append(',').append(s.rhatChance()).append('\n');
                out.append(line);
            }
        });
    }

    /** A fixed-width table for the console, one line per parameter, ending with a line break. */
    public static String format(List<ParameterSummary> summaries) {
        int nameWidth = "parameter".length();
        for (ParameterSummary s : summaries) {
            nameWidth = Math.max(nameWidth, s.name().length());
        }
        String row = "%-" + nameWidth + "s %10s %10s %10s %10s %10s %7s %9s %9s %10s  %s%n";
        StringBuilder table = new StringBuilder(String.format(Locale.ROOT, row, "parameter", "mean", "sd", "q5",
                "q50", "q95", "rhat", "ess_bulk", "ess_tail", "mcse_mean", "flag"));
        for (ParameterSummary s : summaries) {
            table.append(String.format(Locale.ROOT, row, s.name(), significant(s.mean()), significant(s.sd()),
                    significant(s.q05()), significant(s.q50()), significant(s.q95()), fixed(s.rhat(), 3),
                    fixed(s.essBulk(), 0), fixed(s.essTail(), 0), significant(s.mcseMean()), s.flag()));
        }
        return table.toString();
    }

    /**
     * One line saying whether every parameter passed the rule of MODEL.md section 7, which did
     * not, and whether flags from R-hat alone are within chance ({@link ConvergenceVerdict}).
     */
    public static String verdict(List<ParameterSummary> summaries) {
        return ConvergenceVerdict.of(summaries).line("parameters");
    }

    private static String significant(double v) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%.4g", v) : Double.toString(v);
    }

    private static String fixed(double v, int decimals) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%." + decimals + "f", v) : Double.toString(v);
    }
}
