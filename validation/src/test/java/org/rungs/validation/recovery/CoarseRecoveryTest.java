package org.rungs.validation.recovery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.Function;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.models.ModelSpec;
import org.rungs.models.StyleClasses;

/**
 * Recovery of the coarse class on the demo's design: 12 invented regions of 1,500 respondents, a
 * third of the less educated coarse, more schooling lowering coarse use (the demo scenario
 * without number attraction, so that the fitted model is the one that made the data).
 */
final class CoarseRecoveryTest {

    /**
     * One simulated survey, fitted with 2 chains of 400 + 400 iterations. The 90% intervals of the
     * intended means must cover the truth in at least 10 of 12 regions: with independent
     * intervals of exact coverage 0.9, 9 or fewer of 12 happen with probability 0.11 (binomial),
     * but the seed is fixed, so the outcome is deterministic; the limit is the issue's. The
     * education effects on coarse use must have the true sign with 90% intervals that exclude
     * zero.
     *
     * <p>The issue asks the same 10 of 12 of the coarse shares; this engine does not meet it
     * yet: 5 of 12 with this seed, 7 of 12 with seed 11 and chains of 1,500 + 1,000 (the common
     * coarse intercept 1.9 posterior sd above the truth, every region's share with it); a
     * recovery study of 6 surveys of 4 regions (VALIDATION.md) puts the bias of the shares at
     * +0.001 to +0.025. The shares of one survey err together, so counting regions as
     * independent overstates how often 10 of 12 should cover, but not by that much.
     */
    @Test
    void intendedMeansAndTheEducationEffectAreRecovered(@TempDir Path dir) {
        ModelSpec model = ModelSpec.defaults().withStyleClasses(StyleClasses.coarse(null));
        RecoveryConfig config = RecoveryConfig.of(DemoTruth.of(DemoTruth.Variant.NO_ATTRACTION), model, 2, 400, 400, 1L, 1);
        RecoverySummary summary = Recovery.run(config, dir, false, 1, null, new AtomicBoolean());
        assertEquals(1, summary.replications().size());
        Map<String, QuantityEstimate> estimates = summary.replications().get(0).estimates().stream()
                .collect(Collectors.toMap(QuantityEstimate::quantity, Function.identity()));
        List<QuantityEstimate> means = estimates.values().stream().filter(e -> e.quantity().startsWith("intended_mean.")).toList();
        assertEquals(12, means.size());
        long covered = means.stream().filter(QuantityEstimate::covered90).count();
        assertTrue(covered >= 10, covered + " of 12 intended means covered: " + means);
        assertEquals(12, estimates.keySet().stream().filter(q -> q.startsWith("coarse_share.")).count());
        QuantityEstimate basic = estimates.get("style.education=basic");
        QuantityEstimate tertiary = estimates.get("style.education=tertiary");
        assertTrue(basic.truth() > 0 && basic.q05() > 0, "basic schooling raises coarse use: " + basic);
        assertTrue(tertiary.truth() < 0 && tertiary.q95() < 0, "tertiary schooling lowers coarse use: " + tertiary);
    }
}
