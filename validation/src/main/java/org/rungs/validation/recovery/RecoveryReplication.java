package org.rungs.validation.recovery;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.examples.SimulatedSurvey;
import org.rungs.examples.Simulator;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.Summaries;
import org.rungs.sampler.ChainSeeds;
import org.rungs.sampler.FitResult;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.ProgressListener;
import org.rungs.sampler.SamplerSettings;
import org.rungs.sampler.derived.DerivedQuantities;
import org.rungs.sampler.derived.DerivedResult;

/**
 * One replication of a recovery study: draw a survey from the fixed truth, fit it on one thread,
 * and set the posterior summary of every quantity the fit and the truth both name (parameters,
 * and the derived quantities of MODEL.md section 6) beside its true value.
 */
final class RecoveryReplication {
    /** Most posterior draws the derived quantities are computed from (spread over the chains). */
    static final int DERIVED_DRAWS = 1000;

    private RecoveryReplication() {
    }

    /**
     * @param threads threads of the fit's chains (the draws do not depend on it)
     * @param stop    set it to abandon the fit
     * @return the estimates, or null when the fit was stopped before all its iterations
     */
    static ReplicationEstimates run(RecoveryConfig config, int index, int threads, AtomicBoolean stop) {
        // a stream of (base seed, index) alone, seeded through SplitMix64 as the chains' are
        UniformRandomProvider rng = ChainSeeds.stream(config.seed(), index);
        long dataSeed = rng.nextLong();
        long fitSeed = rng.nextLong() >>> 1;
        SimulatedSurvey data = Simulator.simulate(config.truth(), dataSeed);
        Survey survey = EngineSurvey.of(data);
        FitResult fit = Fitter.fit(survey, config.fit(),
                new SamplerSettings(config.chains(), config.warmup(), config.draws(), fitSeed, threads), ProgressListener.NONE, stop);
        if (fit.interrupted()) {
            return null;
        }
        DerivedResult derived = DerivedQuantities.compute(survey, fit.draws(), fit.layout(), config.fit(), DERIVED_DRAWS,
                fitSeed, 1);
        List<QuantityEstimate> estimates = new ArrayList<>();
        List<String> unmatched = new ArrayList<>();
        for (Map.Entry<String, Double> truth : data.truth().entrySet()) {
            QuantityEstimate e = estimate(truth.getKey(), truth.getValue(), fit.draws());
            if (e == null) {
                e = estimate(truth.getKey(), truth.getValue(), derived.draws());
            }
            if (e == null) {
                unmatched.add(truth.getKey());
            } else {
                estimates.add(e);
            }
        }
        return new ReplicationEstimates(index, estimates, unmatched);
    }

    /** The summary of {@code name} in {@code draws}, or null when it has no such column. */
    private static QuantityEstimate estimate(String name, double truth, Draws draws) {
        int column = draws.indexOf(name);
        if (column < 0) {
            return null;
        }
        double[][] chains = draws.chainsOf(column);
        ParameterSummary summary = Summaries.of(name, chains);
        double[] pooled = Arrays.stream(chains).flatMapToDouble(Arrays::stream).sorted().toArray();
        return new QuantityEstimate(name, truth, summary.mean(), quantile(pooled, 0.05), quantile(pooled, 0.25),
                quantile(pooled, 0.75), quantile(pooled, 0.95), summary.flagged());
    }

    /** Quantile of type 7 (R's default) of sorted values: linear between order statistics at (n-1)p. */
    static double quantile(double[] sorted, double p) {
        double h = (sorted.length - 1) * p;
        int below = (int) Math.floor(h);
        int above = Math.min(below + 1, sorted.length - 1);
        return sorted[below] + (h - below) * (sorted[above] - sorted[below]);
    }
}
