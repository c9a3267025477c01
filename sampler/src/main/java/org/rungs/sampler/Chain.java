package org.rungs.sampler;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicBoolean;
import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.models.ModelSpec;
import org.rungs.models.ParameterLayout;
import org.rungs.posteriors.Draws;

/**
 * One Markov chain: its state and the cycle of updates of one sweep, in the order thresholds,
 * threshold hyperparameters, latent levels, coefficients and group levels, group
 * hyperparameters.
 */
final class Chain {
    private final ChainState state;
    private final List<Update> sweep;
    private final ThresholdUpdate thresholdUpdate;

    private Chain(ChainState state, List<Update> sweep, ThresholdUpdate thresholdUpdate) {
        this.state = state;
        this.sweep = sweep;
        this.thresholdUpdate = thresholdUpdate;
    }

    static Chain of(SurveyOrder order, ModelSpec spec, DesignSums sums, boolean byGroup, UniformRandomProvider rng) {
        ChainState state = new ChainState(order, byGroup);
        InitialValues.apply(state, rng);
        ThresholdUpdate thresholds = ThresholdUpdate.of(state, order.start(), spec.priors(), rng);
        List<Update> sweep = new ArrayList<>();
        sweep.add(thresholds);
        if (state.byGroup) {
            sweep.add(CommonThresholdUpdate.of(state, spec.priors(), rng));
            sweep.add(ThresholdSpreadUpdate.of(state, spec.priors(), rng));
        }
        sweep.add(LatentLevelUpdate.of(state, rng));
        sweep.add(LevelCoefficientUpdate.of(state, sums, spec.priors(), rng));
        if (state.groups > 1) {
            sweep.add(GroupLevelUpdate.of(state, spec.priors(), rng));
        }
        return new Chain(state, List.copyOf(sweep), thresholds);
    }

    /** Runs warm-up then sampling; returns the number of kept draws written. */
    int run(int chain, SamplerSettings settings, ParameterLayout layout, Draws draws,
            ProgressListener progress, AtomicBoolean stop) {
        int total = settings.warmup() + settings.draws();
        double[] row = new double[layout.size()];
        int kept = 0;
        for (int it = 0; it < total; it++) {
            if (stop.get()) {
                break;
            }
            boolean warmingUp = it < settings.warmup();
            for (Update u : sweep) {
                u.update(warmingUp);
            }
            if (!warmingUp) {
                state.writeRow(layout, row);
                draws.putRow(chain, kept++, row);
            }
            progress.iterationDone(chain, it + 1, total, warmingUp);
        }
        return kept;
    }

    double thresholdAcceptance() {
        return thresholdUpdate.acceptanceRate();
    }

    /** For tests: the chain's state. */
    ChainState state() {
        return state;
    }
}
