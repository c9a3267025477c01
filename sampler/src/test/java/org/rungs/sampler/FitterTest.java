package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicBoolean;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.priors.Priors;

class FitterTest {
    /** A small survey drawn from MODEL.md sections 2-3 in the test itself: 4 groups, 1 covariate, scale 1..5. */
    static Survey smallSurvey(long seed, int perGroup) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        double[] alpha = {-0.3, 0.0, 0.2, 0.5};
        double[] cuts = {-1.2, -0.4, 0.4, 1.2};
        int n = alpha.length * perGroup;
        int[] group = new int[n];
        double[] x = new double[n];
        byte[] category = new byte[n];
        for (int i = 0; i < n; i++) {
            group[i] = i % alpha.length;
            x[i] = normal.sample();
        }
        Covariates level = Covariates.fromNumeric(List.of("x"), List.of(x));
        double[] z = level.column(0);
        for (int i = 0; i < n; i++) {
            double latent = alpha[group[i]] + 0.5 * z[i] + normal.sample();
            int k = 0;
            while (k < cuts.length && latent > cuts[k]) {
                k++;
            }
            category[i] = (byte) k;
        }
        return Survey.of(new Scale(1, 5), category, group, List.of("north", "south", "east", "west"), level,
                Covariates.none(), null);
    }

    /**
     * {@code groups} groups of {@code perGroup} on 0..10 drawn alike (no group differences), a
     * level covariate x: latent 6 + 0.5 x + 2 N(0, 1), rounded and cut to the scale.
     */
    static Survey manyGroups(int groups, int perGroup, long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        int n = groups * perGroup;
        int[] group = new int[n];
        byte[] category = new byte[n];
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            group[i] = i % groups;
            x[i] = random.nextGaussian();
            category[i] = (byte) Math.max(0, Math.min(10, Math.round(6 + 0.5 * x[i] + 2 * random.nextGaussian())));
        }
        return onZeroToTen(category, group, groups, x);
    }

    /**
     * {@code groups} groups of {@code perGroup} on 0..10 that use the scale differently: latent
     * levels 0.3 g / groups + 0.5 x + N(0, 1); thresholds -2.25 + 0.45 k, each group's shifted by
     * N(0, 0.3^2) draws; coarse responders (who report the coarse point 0, 5 or 10 nearest their
     * answer) a share of 0.1 + 0.4 g / groups.
     */
    static Survey distinctGroups(int groups, int perGroup, long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        double[][] cuts = new double[groups][10];
        for (int g = 0; g < groups; g++) {
            double[] own = cuts[g];
            for (int k = 0; k < 10; k++) {
                own[k] = -2.25 + 0.45 * k + 0.3 * random.nextGaussian();
            }
            java.util.Arrays.sort(own);
        }
        int n = groups * perGroup;
        int[] group = new int[n];
        byte[] category = new byte[n];
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            int g = i % groups;
            group[i] = g;
            x[i] = random.nextGaussian();
            double latent = 0.3 * g / groups + 0.5 * x[i] + random.nextGaussian();
            int k = 0;
            while (k < 10 && latent > cuts[g][k]) {
                k++;
            }
            boolean coarse = random.nextDouble() < 0.1 + 0.4 * g / groups;
            category[i] = (byte) (coarse ? 5 * Math.round(k / 5.0) : k);
        }
        return onZeroToTen(category, group, groups, x);
    }

    /** A survey on 0..10 of groups labelled g0, g1, ... with one level covariate x. */
    private static Survey onZeroToTen(byte[] category, int[] group, int groups, double[] x) {
        List<String> labels = new ArrayList<>();
        for (int g = 0; g < groups; g++) {
            labels.add("g" + g);
        }
        return Survey.of(new Scale(0, 10), category, group, labels, Covariates.fromNumeric(List.of("x"), List.of(x)),
                Covariates.none(), null);
    }

    /** {@link #smallSurvey} with its level covariate also as the coarse class's style covariate {@code w}. */
    static Survey styledSurvey(long seed, int perGroup) {
        Survey plain = smallSurvey(seed, perGroup);
        return Survey.of(plain.scale(), plain.category(), plain.group(), List.of("north", "south", "east", "west"),
                plain.level(), Covariates.fromNumeric(List.of("w"), List.of(plain.level().column(0).clone())), null);
    }

    @Test
    void sameSeedGivesSameDrawsWhateverTheThreads() {
        Survey survey = smallSurvey(1L, 150);
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults());
        Draws one = Fitter.fit(survey, spec, new SamplerSettings(3, 50, 40, 99L, 1), ProgressListener.NONE, new AtomicBoolean()).draws();
        Draws three = Fitter.fit(survey, spec, new SamplerSettings(3, 50, 40, 99L, 3), ProgressListener.NONE, new AtomicBoolean()).draws();
        assertEquals(one.names(), three.names());
        for (int p = 0; p < one.parameterCount(); p++) {
            for (int c = 0; c < 3; c++) {
                assertArrayEquals(one.chainsOf(p)[c], three.chainsOf(p)[c], one.names().get(p));
            }
        }
        Draws other = Fitter.fit(survey, spec, new SamplerSettings(3, 50, 40, 100L, 1), ProgressListener.NONE, new AtomicBoolean()).draws();
        assertFalse(java.util.Arrays.equals(one.chainsOf(0)[0], other.chainsOf(0)[0]), "another seed, other draws");
    }

    /**
     * Threads take turns on the chains: with a turn of one iteration, 3 chains on 2 threads
     * interleave at every sweep (coarse class on, so the joint step's adaptation state is handed
     * between threads), and still give exactly the draws of 1 thread running each chain through.
     */
    @Test
    void chainsTakenInTurnsGiveTheDrawsOfChainsRunThrough() {
        Survey survey = styledSurvey(6L, 80);
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), org.rungs.models.StyleClasses.coarse(null));
        SamplerSettings through = new SamplerSettings(3, 40, 20, 17L, 1);
        SamplerSettings inTurns = new SamplerSettings(3, 40, 20, 17L, 2);
        int[] switches = new int[1];
        int[] last = {-1};
        ProgressListener watch = (chain, done, total, warm) -> {
            synchronized (switches) {
                if (chain != last[0]) {
                    switches[0]++;
                    last[0] = chain;
                }
            }
        };
        Draws one = Fitter.fit(survey, spec, through, ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none(), Long.MAX_VALUE).draws();
        Draws turns = Fitter.fit(survey, spec, inTurns, watch, new AtomicBoolean(), Checkpoints.none(), 0L).draws();
        // each chain runs 80 iterations; run through, the progress would change chain about 3 times
        assertTrue(switches[0] > 100, "the chains were not interleaved: " + switches[0] + " changes of chain");
        for (int p = 0; p < one.parameterCount(); p++) {
            for (int c = 0; c < 3; c++) {
                assertArrayEquals(one.chainsOf(p)[c], turns.chainsOf(p)[c], one.names().get(p));
            }
        }
    }

    /**
     * With the coarse class on, the joint Hamiltonian step (fitted half-way through warm-up, its
     * metric refitted at three quarters) keeps the draws independent of the thread count, and its
     * acceptance, mean leapfrog steps (1 to 2 x 12 - 1 by construction) and share of trajectories
     * stopped on a wall while sampling are recorded per chain; the plain model has no such step.
     */
    @Test
    void coarseFitIsTheSameWhateverTheThreadsAndRecordsItsJointStep() {
        Survey survey = styledSurvey(2L, 80);
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), org.rungs.models.StyleClasses.coarse(null));
        FitResult one = Fitter.fit(survey, spec, new SamplerSettings(3, 40, 20, 11L, 1), ProgressListener.NONE, new AtomicBoolean());
        FitResult three = Fitter.fit(survey, spec, new SamplerSettings(3, 40, 20, 11L, 3), ProgressListener.NONE, new AtomicBoolean());
        for (int p = 0; p < one.draws().parameterCount(); p++) {
            for (int c = 0; c < 3; c++) {
                assertArrayEquals(one.draws().chainsOf(p)[c], three.draws().chainsOf(p)[c], one.draws().names().get(p));
            }
        }
        for (int c = 0; c < 3; c++) {
            double a = one.jointAcceptance()[c];
            assertTrue(a > 0 && a <= 1, "joint step acceptance " + a);
            double leaps = one.jointLeapfrogSteps()[c];
            assertTrue(leaps >= 1 && leaps <= 23, "mean leapfrog steps " + leaps);
            double walls = one.jointWallShare()[c];
            assertTrue(walls >= 0 && walls <= 1 - a, "walls " + walls + " are rejections, acceptance " + a);
        }
        FitResult ordinal = Fitter.fit(smallSurvey(2L, 80), new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults()),
                new SamplerSettings(2, 40, 20, 11L, 2), ProgressListener.NONE, new AtomicBoolean());
        for (int c = 0; c < 2; c++) {
            assertTrue(Double.isNaN(ordinal.jointAcceptance()[c]), "no joint step in the plain model");
            assertTrue(Double.isNaN(ordinal.jointLeapfrogSteps()[c]) && Double.isNaN(ordinal.jointWallShare()[c]));
        }
    }

    /**
     * The same under number attraction (MODEL.md 4b, every number but the coarse points of 1..5),
     * with a binary style covariate: the passes by style row, the attraction and trade steps and
     * the redraw steps keep the draws independent of the thread count too.
     */
    @Test
    void attractionFitIsTheSameWhateverTheThreads() {
        Survey plain = smallSurvey(5L, 80);
        // two distinct rows of style covariates, so that the passes group respondents by style row (StyleRows)
        double[] split = java.util.Arrays.stream(plain.level().column(0)).map(v -> v > 0 ? 1 : 0).toArray();
        Survey survey = Survey.of(plain.scale(), plain.category(), plain.group(), List.of("north", "south", "east", "west"),
                plain.level(), Covariates.fromNumeric(List.of("w"), List.of(split)), null);
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), org.rungs.models.StyleClasses.coarse(null),
                org.rungs.models.NumberAttraction.parse("default"));
        Draws one = Fitter.fit(survey, spec, new SamplerSettings(3, 40, 20, 13L, 1), ProgressListener.NONE, new AtomicBoolean()).draws();
        Draws three = Fitter.fit(survey, spec, new SamplerSettings(3, 40, 20, 13L, 3), ProgressListener.NONE, new AtomicBoolean()).draws();
        assertTrue(one.names().contains("attraction_sd"), one.names().toString());
        for (int p = 0; p < one.parameterCount(); p++) {
            for (int c = 0; c < 3; c++) {
                assertArrayEquals(one.chainsOf(p)[c], three.chainsOf(p)[c], one.names().get(p));
            }
        }
    }

    /**
     * Thinning keeps iterations of the same chain: after the same warm-up, draw t of a fit that
     * keeps one iteration in 3 is draw 3t + 2 of the fit that keeps them all (coarse class on, so
     * every kind of update runs between kept draws). Exact equality: same seed, same stream.
     */
    @Test
    void thinningKeepsEveryKthIterationOfTheSameChain() {
        Survey survey = styledSurvey(4L, 60);
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), org.rungs.models.StyleClasses.coarse(null));
        Draws all = Fitter.fit(survey, spec, new SamplerSettings(2, 20, 30, 7L, 2), ProgressListener.NONE, new AtomicBoolean()).draws();
        Draws thinned = Fitter.fit(survey, spec, new SamplerSettings(2, 20, 10, 7L, 2, 3), ProgressListener.NONE,
                new AtomicBoolean()).draws();
        assertEquals(10, thinned.iterations());
        for (int p = 0; p < all.parameterCount(); p++) {
            for (int c = 0; c < 2; c++) {
                double[] every = all.chainsOf(p)[c];
                double[] kept = thinned.chainsOf(p)[c];
                for (int t = 0; t < kept.length; t++) {
                    assertEquals(every[3 * t + 2], kept[t], 0.0, all.names().get(p) + ", chain " + c + ", draw " + t);
                }
            }
        }
    }

    @Test
    void thinBelowOneIsRefused() {
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> new SamplerSettings(1, 1, 1, 1L, 1, 0));
        assertTrue(e.getMessage().contains("thin"), e.getMessage());
    }

    @Test
    void parameterNamesFollowTheReadme() {
        Survey survey = smallSurvey(2L, 20);
        Draws d = Fitter.fit(survey, ModelSpec.defaults(), new SamplerSettings(1, 5, 5, 1L, 1), ProgressListener.NONE,
                new AtomicBoolean()).draws();
        List<String> names = d.names();
        assertTrue(names.containsAll(List.of("level.x", "group_mean", "group_sd", "group.north", "threshold.2",
                "threshold.5", "threshold_sd", "threshold.west.3", "level.x.per_unit")), names.toString());
        assertEquals(1 + 1 + 1 + 4 + 4 + 1 + 16 + 1, names.size());
    }

    @Test
    void stoppingEarlyKeepsTheDrawsMade() {
        Survey survey = smallSurvey(3L, 30);
        AtomicBoolean stop = new AtomicBoolean();
        ProgressListener stopAt = (chain, done, total, warm) -> {
            if (done == 30) {
                stop.set(true);
            }
        };
        FitResult r = Fitter.fit(survey, ModelSpec.defaults(), new SamplerSettings(2, 10, 100, 5L, 1), stopAt, stop);
        assertTrue(r.interrupted());
        assertTrue(r.draws().iterations() <= 20 && r.draws().iterations() >= 0, "kept " + r.draws().iterations());
    }
}
