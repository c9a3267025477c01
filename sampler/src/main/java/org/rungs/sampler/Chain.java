package org.rungs.sampler;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicBoolean;
import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.models.ModelSpec;
import org.rungs.models.ParameterLayout;
import org.rungs.models.RoundingChannel;
import org.rungs.models.StyleClasses;
import org.rungs.models.survey.Scale;
import org.rungs.priors.Priors;
import org.rungs.posteriors.Draws;

/**
 * One Markov chain: its state and the cycle of updates of one sweep, in the order thresholds,
 * threshold hyperparameters, style classes (when on), latent levels, level coefficients and
 * group levels, their pooling, then the coarse class's coefficients and pooling.
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

    static Chain of(SurveyOrder order, ModelSpec spec, boolean byGroup, UniformRandomProvider rng) {
        Priors priors = spec.priors();
        StyleClasses classes = spec.styleClasses();
        Scale scale = order.survey().scale();
        RoundingChannel channel = classes.coarse()
                ? RoundingChannel.of(scale, classes.coarsePoints() != null ? classes.coarsePoints() : RoundingChannel.defaultPoints(scale))
                : null;
        ChainState state = new ChainState(order, byGroup, channel);
        InitialValues.apply(state, priors.styleMean().mean(), rng);
        ThresholdUpdate thresholds = ThresholdUpdate.of(state, order.start(), priors, rng);
        List<Update> sweep = new ArrayList<>();
        sweep.add(thresholds);
        if (state.byGroup) {
            sweep.add(CommonThresholdUpdate.of(state, priors, rng));
            sweep.add(ThresholdSpreadUpdate.of(state, priors, rng));
        }
        if (channel != null) {
            sweep.add(StyleClassUpdate.of(state, priors, rng));
        }
        sweep.add(LatentLevelUpdate.of(state, rng));
        sweep.add(RegressionUpdate.of(state.level, priors.level(), priors.groupMean(), rng));
        if (state.groups > 1) {
            sweep.add(PoolingUpdate.of(state.level, priors.groupMean(), priors.groupSd(), rng));
        }
        if (channel != null) {
            sweep.add(RegressionUpdate.of(state.style, priors.style(), priors.styleMean(), rng));
            if (state.groups > 1) {
                sweep.add(PoolingUpdate.of(state.style, priors.styleMean(), priors.styleSd(), rng));
            }
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
