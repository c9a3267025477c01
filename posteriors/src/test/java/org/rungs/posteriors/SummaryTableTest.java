package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class SummaryTableTest {
    @TempDir
    Path folder;

    private static ParameterSummary summary(String name, double rhat, double essBulk, double essTail) {
        return ParameterSummary.of(name, 0.5, 1.25, -1.5, 0.5, 2.5, rhat, essBulk, essTail, 0.02, 0.5, 4);
    }

    /** MODEL.md section 7: R-hat > 1.01 or bulk/tail ESS < 100 per chain (here 4 chains: 400). */
    @Test
    void flagRuleUsesOneHundredPerChain() {
        assertEquals("ok", summary("a", 1.01, 400, 400).flag());
        assertEquals("rhat>1.01", summary("a", 1.0101, 400, 400).flag());
        assertEquals("low ess_bulk", summary("a", 1.0, 399.9, 400).flag());
        assertEquals("low ess_tail", summary("a", 1.0, 400, 399.9).flag());
        assertEquals("rhat>1.01;low ess_bulk;low ess_tail", summary("a", 1.2, 10, 20).flag());
    }

    @Test
    void undefinedDiagnosticsFlagOnlyVaryingOrNonFiniteDraws() {
        double nan = Double.NaN;
        assertEquals("ok", ParameterSummary.of("constant", 0.25, 0, 0.25, 0.25, 0.25, nan, nan, nan, nan, nan, 4).flag());
        assertEquals("too few draws", summary("short", nan, nan, nan).flag());
        assertEquals("non-finite draws",
                ParameterSummary.of("inf", Double.POSITIVE_INFINITY, nan, 0, 1, 2, nan, nan, nan, nan, nan, 4).flag());
    }

    @Test
    void csvHasTheHeaderAndOneExactRowPerParameter() throws IOException {
        Path file = folder.resolve("summary.csv");
        SummaryTable.writeCsv(List.of(summary("beta[1,2]", 1.0, 500, 450), summary("sigma", 1.05, 80, 90)), file);
        List<String> lines = Files.readAllLines(file);
        assertEquals("name,mean,sd,q5,q50,q95,rhat,ess_bulk,ess_tail,mcse_mean,flag,rhat_chance", lines.get(0));
        assertEquals("\"beta[1,2]\",0.5,1.25,-1.5,0.5,2.5,1.0,500.0,450.0,0.02,ok,0.5", lines.get(1));
        assertEquals("sigma,0.5,1.25,-1.5,0.5,2.5,1.05,80.0,90.0,0.02,rhat>1.01;low ess_bulk;low ess_tail,0.5", lines.get(2));
        assertEquals(3, lines.size());
    }

    @Test
    void consoleTableColumnsLineUp() {
        String table = SummaryTable.format(List.of(summary("a", 1.0, 500, 450),
                summary("a_much_longer_name", 1.234, 12.3, 4567.8), summary("c", Double.NaN, Double.NaN, 1e5)));
        String[] lines = table.lines().toArray(String[]::new);
        assertEquals(4, lines.length);
        String header = lines[0];
        for (String column : List.of("mean", "sd", "q5", "q50", "q95", "rhat", "ess_bulk", "ess_tail", "mcse_mean")) {
            int end = header.indexOf(" " + column + " ") + 1 + column.length();
            for (String line : lines) {
                assertTrue(line.charAt(end - 1) != ' ' && line.charAt(end) == ' ', column + " in: " + line);
            }
        }
        assertTrue(lines[2].startsWith("a_much_longer_name ") && lines[2].contains(" 1.234 ")
                && lines[2].contains(" 12 ") && lines[2].contains(" 4568 "), lines[2]);
        assertTrue(lines[2].endsWith("rhat>1.01;low ess_bulk"), lines[2]);
    }

    @Test
    void verdictSaysAllConvergedOrListsTheFlagged() {
        assertEquals("All 2 parameters converged (R-hat <= 1.01, bulk and tail ESS >= 100 per chain).",
                SummaryTable.verdict(List.of(summary("a", 1.0, 500, 500), summary("b", 1.0, 900, 800))));
        assertEquals("Not converged: 2 of 3 parameters flagged: a, c.", SummaryTable.verdict(List.of(
                summary("a", 1.1, 500, 500), summary("b", 1.0, 900, 800), summary("c", 1.0, 50, 800))));
        List<ParameterSummary> many = new ArrayList<>();
        for (int p = 1; p <= 13; p++) {
            many.add(summary("p" + p, 1.5, 500, 500));
        }
        assertEquals("Not converged: 13 of 13 parameters flagged: p1, p2, p3, p4, p5, p6, p7, p8, p9, p10 (and 3 more).",
                SummaryTable.verdict(many));
    }
}
