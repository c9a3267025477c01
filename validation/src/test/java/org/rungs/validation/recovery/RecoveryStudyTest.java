package org.rungs.validation.recovery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.examples.CovariateDistribution;
import org.rungs.examples.Scenario;
import org.rungs.models.ModelSpec;
import org.rungs.models.StyleClasses;

/**
 * A small recovery study run end to end: its files, their independence from the thread count,
 * resumption, and the coverage of its intervals.
 */
final class RecoveryStudyTest {
    private static final int REPLICATIONS = 10;

    @TempDir
    static Path shared;
    static RecoveryConfig config;
    static RecoverySummary oneThread;

    @TempDir
    Path dir;

    /**
     * 3 invented groups of 150 on a scale 0..4, one numeric covariate, stated group intercepts and
     * drawn threshold deviations, centred so that every rating is common; the plain ordered probit
     * fitted with 2 chains of 200 + 200 iterations.
     */
    static RecoveryConfig small(long seed) {
        Scenario truth = new Scenario(new Scenario.Scale(0, 4),
                List.of(new Scenario.Group("Ashgrove", 150), new Scenario.Group("Brindlemere", 150),
                        new Scenario.Group("Corrowfen", 150)),
                List.of(new Scenario.LevelCovariate("hours", new CovariateDistribution.Uniform(0, 10), 0.08, 1)),
                new Scenario.GroupLevels.Fixed(new double[] {-0.8, -0.4, 0.0}), Scenario.centred(-1.2, -0.4, 0.4, 1.2),
                new Scenario.ThresholdDeviations.Drawn(0.15), 17L);
        return new RecoveryConfig(truth, "three invented groups of 150", ModelSpec.defaults(), 2, 200, 200, seed,
                REPLICATIONS);
    }

    @BeforeAll
    static void runOnOneThread() {
        config = small(1);
        oneThread = Recovery.run(config, shared.resolve("one"), false, 1, null, new AtomicBoolean());
    }

    @Test
    void writesTheTablesAndTheSummary() throws IOException {
        Path out = shared.resolve("one");
        assertNotNull(oneThread);
        int quantities = oneThread.quantities().size();
        assertEquals(quantities + 1, Files.readAllLines(out.resolve(RecoveryReport.RECOVERY)).size());
        assertEquals(REPLICATIONS * quantities + 1, Files.readAllLines(out.resolve(RecoveryReport.REPLICATIONS)).size());
        assertEquals(REPLICATIONS, oneThread.replications().size());
        String summary = Files.readString(out.resolve(RecoveryReport.SUMMARY));
        assertTrue(summary.contains("Coverage of the central 50% intervals"), summary);
        // the simulator's reported means have no draws: listed, never compared
        assertEquals(List.of("reported_mean.Ashgrove", "reported_mean.Brindlemere", "reported_mean.Corrowfen"),
                oneThread.unmatched());
        List<String> names = oneThread.quantities().stream().map(QuantityRecovery::quantity).toList();
        for (String expected : List.of("level.hours", "level.hours.per_unit", "group.Ashgrove", "threshold.2",
                "threshold.Corrowfen.4", "threshold_sd", "intended_mean.Brindlemere", "harmonised_mean.Corrowfen")) {
            assertTrue(names.contains(expected), expected + " is compared: " + names);
        }
        for (QuantityRecovery q : oneThread.quantities()) {
            assertEquals(REPLICATIONS, q.replications(), q.quantity());
        }
    }

    @Test
    void twoThreadsGiveTheSameFilesAsOne() throws IOException {
        Path two = dir.resolve("two");
        Recovery.run(config, two, false, 2, null, new AtomicBoolean());
        Path one = shared.resolve("one");
        for (String file : List.of(RecoveryReport.RECOVERY, RecoveryReport.REPLICATIONS, RecoveryReport.SUMMARY)) {
            assertEquals(Files.readString(one.resolve(file)), Files.readString(two.resolve(file)), file);
        }
    }

    @Test
    void aRerunResumesAndAnotherStudyIsRefused() throws IOException {
        Path out = dir.resolve("resumed");
        Recovery.run(config, out, false, 2, null, new AtomicBoolean());
        Path record = out.resolve(RecoveryFolder.REPLICATIONS).resolve(RecoveryFolder.fileName(3));
        Files.delete(record); // as if killed before replication 3 was written
        Recovery.run(config, out, false, 2, null, new AtomicBoolean());
        assertTrue(Files.exists(record));
        assertEquals(Files.readString(shared.resolve("one").resolve(RecoveryReport.RECOVERY)),
                Files.readString(out.resolve(RecoveryReport.RECOVERY)));
        assertThrows(IllegalArgumentException.class,
                () -> Recovery.run(small(2), out, false, 1, null, new AtomicBoolean()));
    }

    /**
     * The 90% intervals over the whole run, N = 10 replications x 30 quantities = 300 pairs,
     * should cover about 0.9. The pairs of one replication are not independent (a group's
     * thresholds share its data and are covered together): runs with base seeds 1..6 gave
     * MCSEs of the overall coverage (from the spread of the replications' shares) of 0.020 to
     * 0.039, against sqrt(0.09 / 300) = 0.017 for independent pairs, a variance factor of up to
     * about 5. The band is 3 sd (common practice, no source) with that factor:
     * 0.9 +- 3 sqrt(5 x 0.09 / 300) = 0.9 +- 0.116; likewise 0.5 +- 3 sqrt(5 x 0.25 / 300) =
     * 0.5 +- 0.194 for the 50% intervals. Those six runs gave 0.873 to 0.920 (90%) and 0.460 to
     * 0.523 (50%). The seed is fixed, so the outcome is deterministic. Exact coverage is not
     * expected of every quantity with a fixed truth (e.g. threshold.2: the common thresholds are
     * those of the population of groups, not of these three), only near-nominal coverage overall.
     */
    @Test
    void intervalsCoverNearTheirNominalRate() {
        int pairs = oneThread.replications().stream().mapToInt(r -> r.estimates().size()).sum();
        assertEquals(REPLICATIONS * 30, pairs);
        double half90 = 3 * Math.sqrt(5 * 0.09 / pairs);
        double half50 = 3 * Math.sqrt(5 * 0.25 / pairs);
        String report = String.format(Locale.ROOT, "coverage 90%%: %.3f (band 0.9 +- %.3f), 50%%: %.3f (band 0.5 +- %.3f)",
                oneThread.coverage90(), half90, oneThread.coverage50(), half50);
        assertTrue(Math.abs(oneThread.coverage90() - 0.9) <= half90, report);
        assertTrue(Math.abs(oneThread.coverage50() - 0.5) <= half50, report);
    }

    /**
     * The demo's own truth, shrunk: the coarse class's parameters, with the categorical style
     * covariate against the simulator's reference level, and the coarse shares are compared, so
     * the names of truth and draws agree (one replication of a tiny fit: names only).
     */
    @Test
    void theShrunkDemoMatchesTheCoarseClassNames() {
        DemoTruth truth = new DemoTruth(DemoTruth.Variant.NO_ATTRACTION, 2, 150);
        assertEquals(2, truth.scenario().groupCount());
        RecoveryConfig demo = RecoveryConfig.of(truth, ModelSpec.defaults().withStyleClasses(StyleClasses.coarse(null)),
                1, 20, 20, 3, 1);
        RecoverySummary s = Recovery.run(demo, dir.resolve("demo"), false, 1, null, new AtomicBoolean());
        List<String> names = s.quantities().stream().map(QuantityRecovery::quantity).toList();
        for (String expected : List.of("style.education=basic", "style.education=tertiary", "style_mean", "style_sd",
                "style_group.Eastmarch", "coarse_share.Brackenreach", "level.income", "level.age.per_unit")) {
            assertTrue(names.contains(expected), expected + " is compared: " + names);
        }
        assertEquals(List.of("reported_mean.Eastmarch", "reported_mean.Brackenreach"), s.unmatched());
    }
}
