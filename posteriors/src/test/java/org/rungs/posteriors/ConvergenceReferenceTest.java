package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.function.ToDoubleFunction;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;

/**
 * Every diagnostic against reference values computed by the R package posterior 1.4.0 (R 4.2.2)
 * on the same draws; both are produced by src/test/resources/diagnostics/make-fixtures.R.
 *
 * <p>Tolerance: relative 1e-11 (absolute 1e-12 near zero). The two implementations compute the
 * same formulas on the same doubles; they differ only in summation order, FFT versus direct
 * autocovariances and the normal quantile routine, which moved results by at most 8e-14 here.
 */
class ConvergenceReferenceTest {
    private static final double RELATIVE_TOLERANCE = 1e-11;
    private static final double ABSOLUTE_TOLERANCE = 1e-12;

    private static final Map<String, Draws> FIXTURES = new ConcurrentHashMap<>();
    private static final Map<String, ToDoubleFunction<double[][]>> CONVERGENCE = new LinkedHashMap<>();
    private static final Map<String, ToDoubleFunction<ParameterSummary>> SUMMARY = new LinkedHashMap<>();

    static {
        CONVERGENCE.put("rhat", Convergence::rhat);
        CONVERGENCE.put("rhat_bulk", Convergence::rhatBulk);
        CONVERGENCE.put("rhat_tail", Convergence::rhatTail);
        CONVERGENCE.put("ess_bulk", Convergence::essBulk);
        CONVERGENCE.put("ess_tail", Convergence::essTail);
        CONVERGENCE.put("ess_mean", Convergence::essMean);
        CONVERGENCE.put("ess_q5", d -> Convergence.essQuantile(d, 0.05));
        CONVERGENCE.put("ess_q95", d -> Convergence.essQuantile(d, 0.95));
        CONVERGENCE.put("mcse_mean", Convergence::mcseMean);
        CONVERGENCE.put("mcse_sd", Convergence::mcseSd);
        CONVERGENCE.put("mcse_q5", d -> Convergence.mcseQuantile(d, 0.05));
        CONVERGENCE.put("mcse_q50", d -> Convergence.mcseQuantile(d, 0.5));
        CONVERGENCE.put("mcse_q95", d -> Convergence.mcseQuantile(d, 0.95));
        SUMMARY.put("mean", ParameterSummary::mean);
        SUMMARY.put("sd", ParameterSummary::sd);
        SUMMARY.put("q5", ParameterSummary::q05);
        SUMMARY.put("q50", ParameterSummary::q50);
        SUMMARY.put("q95", ParameterSummary::q95);
        SUMMARY.put("rhat", ParameterSummary::rhat);
        SUMMARY.put("ess_bulk", ParameterSummary::essBulk);
        SUMMARY.put("ess_tail", ParameterSummary::essTail);
        SUMMARY.put("mcse_mean", ParameterSummary::mcseMean);
    }

    /** One value of reference.csv: reference: R 4.2.2, package posterior 1.4.0 (function named by quantity). */
    record Reference(String fixture, String quantity, double value) {
    }

    @TestFactory
    List<DynamicTest> convergenceFunctionsMatchPosterior() throws IOException {
        List<DynamicTest> tests = new ArrayList<>();
        for (Reference reference : references()) {
            ToDoubleFunction<double[][]> function = CONVERGENCE.get(reference.quantity());
            if (function != null) {
                tests.add(DynamicTest.dynamicTest(reference.fixture() + " " + reference.quantity(),
                        () -> assertMatches(reference, function.applyAsDouble(fixture(reference.fixture())))));
            }
        }
        assertEquals(8 * CONVERGENCE.size(), tests.size(), "every fixture has every Convergence quantity");
        return tests;
    }

    @TestFactory
    List<DynamicTest> summariesMatchPosterior() throws IOException {
        List<DynamicTest> tests = new ArrayList<>();
        for (Reference reference : references()) {
            ToDoubleFunction<ParameterSummary> field = SUMMARY.get(reference.quantity());
            if (field != null) {
                tests.add(DynamicTest.dynamicTest(reference.fixture() + " summary " + reference.quantity(), () -> {
                    ParameterSummary summary = Summaries.of(drawsOf(reference.fixture())).get(0);
                    assertMatches(reference, field.applyAsDouble(summary));
                }));
            }
        }
        assertEquals(8 * SUMMARY.size(), tests.size(), "every fixture has every summary quantity");
        return tests;
    }

    @Test
    void referenceFileNamesItsSource() throws IOException {
        String firstLine = Files.readAllLines(resource("reference.csv")).get(0);
        assertTrue(firstLine.startsWith("# R version 4.2.2") && firstLine.contains("posterior 1.4.0"), firstLine);
    }

    private static void assertMatches(Reference reference, double actual) {
        double expected = reference.value();
        String what = reference.fixture() + " " + reference.quantity();
        if (Double.isNaN(expected) || Double.isInfinite(expected)) {
            assertEquals(expected, actual, what);
            return;
        }
        double tolerance = Math.max(ABSOLUTE_TOLERANCE, RELATIVE_TOLERANCE * Math.abs(expected));
        if (!(Math.abs(actual - expected) <= tolerance)) {
            fail(what + ": expected " + expected + " (posterior 1.4.0), got " + actual + ", relative error "
                    + Math.abs(actual - expected) / Math.abs(expected));
        }
    }

    static List<Reference> references() throws IOException {
        List<Reference> references = new ArrayList<>();
        for (String line : Files.readAllLines(resource("reference.csv"))) {
            if (line.startsWith("#") || line.startsWith("fixture,")) {
                continue;
            }
            String[] fields = line.split(",");
            double value = fields[2].equals("NA") ? Double.NaN : Double.parseDouble(fields[2]);
            references.add(new Reference(fields[0], fields[1], value));
        }
        return references;
    }

    static Draws drawsOf(String fixture) throws IOException {
        Draws draws = FIXTURES.get(fixture);
        if (draws == null) {
            draws = DrawsCsv.read(resource(fixture + ".csv"));
            FIXTURES.put(fixture, draws);
        }
        return draws;
    }

    static double[][] fixture(String fixture) throws IOException {
        return drawsOf(fixture).chainsOf(0);
    }

    static Path resource(String name) {
        try {
            return Path.of(ConvergenceReferenceTest.class.getResource("/diagnostics/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }
}
