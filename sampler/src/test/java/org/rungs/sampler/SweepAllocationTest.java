package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.lang.management.ManagementFactory;
import java.util.List;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Survey;
import org.rungs.priors.Priors;

/**
 * The project's rule that hot loops allocate nothing, checked where it matters: a sampling sweep
 * of every model the sampler runs (warm-up, which builds and refits the joint step's metric, may
 * allocate). The count is the heap this thread allocated
 * ({@code com.sun.management.ThreadMXBean}), so the test reads no clock.
 *
 * <p>Tolerance: 64 bytes per sweep on average over 100 sweeps, after 300 sampling sweeps for the
 * compiler. Measured: 0 bytes in every case but the categorical style covariate's (2 bytes on
 * average); before {@code Chain.sweepOnce} and {@code BoundedRedrawSteps} iterated by index, their
 * list iterators cost 32 and 64 bytes a sweep. Any array per respondent of the 2,000-respondent
 * survey would be at least 2,000 bytes a sweep: with a {@code double[]} of the survey's length
 * allocated in {@code LatentLevelUpdate.update}, every case failed (16,016 bytes).
 */
class SweepAllocationTest {
    private static final int PER_GROUP = 500;
    private static final int WARMUP = 200;
    private static final int SETTLE = 300;
    private static final int MEASURED = 100;
    private static final long BYTES_PER_SWEEP = 64;

    enum Model {
        PLAIN, SHARED_THRESHOLDS, COARSE, COARSE_NUMERIC_STYLE, ATTRACTION, COMPLETE, COMPLETE_CATEGORICAL_STYLE
    }

    @ParameterizedTest
    @EnumSource(Model.class)
    void samplingSweepsAllocateNothing(Model model) {
        Chain chain = chain(model);
        for (int t = 0; t < WARMUP; t++) {
            chain.sweepOnce(true);
        }
        for (int t = 0; t < SETTLE; t++) {
            chain.sweepOnce(false);
        }
        com.sun.management.ThreadMXBean threads = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
        long before = threads.getCurrentThreadAllocatedBytes();
        for (int t = 0; t < MEASURED; t++) {
            chain.sweepOnce(false);
        }
        long perSweep = (threads.getCurrentThreadAllocatedBytes() - before) / MEASURED;
        assertTrue(perSweep <= BYTES_PER_SWEEP, model + ": a sampling sweep allocated " + perSweep + " bytes");
    }

    private static Chain chain(Model model) {
        Survey survey = switch (model) {
            case COARSE_NUMERIC_STYLE -> FitterTest.styledSurvey(3L, PER_GROUP);
            case COMPLETE_CATEGORICAL_STYLE -> withThreeLevelStyle(FitterTest.smallSurvey(3L, PER_GROUP));
            default -> FitterTest.smallSurvey(3L, PER_GROUP);
        };
        StyleClasses classes = switch (model) {
            case PLAIN, SHARED_THRESHOLDS, ATTRACTION -> StyleClasses.none();
            default -> StyleClasses.coarse(new int[] {1, 3, 5});
        };
        ModelSpec spec = new ModelSpec(model == Model.SHARED_THRESHOLDS ? ThresholdMode.SHARED : ThresholdMode.BY_GROUP,
                Priors.defaults(), classes);
        if (model == Model.ATTRACTION || model == Model.COMPLETE || model == Model.COMPLETE_CATEGORICAL_STYLE) {
            spec = spec.withAttraction(NumberAttraction.of(2, 4));
        }
        return Chain.of(SurveyOrder.of(survey), spec, model != Model.SHARED_THRESHOLDS, WARMUP,
                RandomSource.XO_RO_SHI_RO_128_PP.create(17L));
    }

    /** The survey with a style covariate of three levels (0, 1, 2, as education might be coded). */
    private static Survey withThreeLevelStyle(Survey plain) {
        int n = plain.size();
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            w[i] = i % 3;
        }
        return Survey.of(plain.scale(), plain.category(), plain.group(), List.of("north", "south", "east", "west"),
                plain.level(), Covariates.fromNumeric(List.of("w"), List.of(w)), null);
    }
}
