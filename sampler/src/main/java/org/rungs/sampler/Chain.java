package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.function.ToDoubleFunction;
import org.apache.commons.rng.RestorableUniformRandomProvider;
import org.apache.commons.rng.core.RandomProviderDefaultState;
import org.rungs.models.ModelSpec;
import org.rungs.models.ParameterLayout;
import org.rungs.models.RoundingChannel;
import org.rungs.models.StyleClasses;
import org.rungs.models.survey.Scale;
import org.rungs.priors.Priors;

/**
 * One Markov chain: its state and the cycle of updates of one sweep, in the order the joint
 * Hamiltonian step, the spreads' collapsed moves (several groups, when slow or many;
 * {@link CollapsedSpreadUpdate}) and the collapsed threshold steps (coarse class or attraction
 * on; in the plain model only the moves of tau_d, when slow), threshold
 * hyperparameters, style classes (when on), number attraction and its trade step with the
 * thresholds (when on; {@link AttractionTradeUpdate}), latent levels, threshold
 * rescaling steps, level coefficients and group levels (under attraction only while the redraw
 * scheme's cost is bounded, {@link BoundedRedrawSteps}), their pooling, then the coarse class's
 * coefficients (with style covariates; {@link StyleClassUpdate}) and pooling.
 *
 * <p>The joint step, the collapsed threshold steps and the classes' intercepts are drawn with the
 * classes, the latent levels and the rejected draws of the attraction scheme integrated out;
 * then the classes, then the attraction steps given the classes (the latent levels and rejected
 * draws still integrated out), then the latent levels and rejected
 * draws given both. Each quantity integrated out is redrawn before any later step conditions on
 * it, so the cycle leaves the posterior invariant (van Dyk & Park 2008, Partially collapsed Gibbs
 * samplers, JASA 103, section 3). The rescaling steps then move every threshold with the latent
 * values (Liu & Sabatti 2000), at a cost independent of the number of respondents; in the plain
 * model they are the only threshold steps.
 *
 * <p>Its future depends only on its state, the state of its updates and its random stream, which
 * together make its checkpoint: restoring them continues the chain bit for bit.
 */
final class Chain implements Checkpointed {
    private final ChainState state;
    private final List<Update> sweep;
    private final ThresholdMoves thresholdUpdate;
    private final RestorableUniformRandomProvider rng;

    private Chain(ChainState state, List<Update> sweep, ThresholdMoves thresholdUpdate, RestorableUniformRandomProvider rng) {
        this.state = state;
        this.sweep = sweep;
        this.thresholdUpdate = thresholdUpdate;
        this.rng = rng;
    }

    static Chain of(SurveyOrder order, ModelSpec spec, boolean byGroup, int warmup, RestorableUniformRandomProvider rng) {
        return of(order, spec, byGroup, warmup, rng, BoundedRedrawSteps.MAX_RANGE);
    }

    /** For tests: maxRange is the bound of {@link BoundedRedrawSteps} under attraction. */
    static Chain of(SurveyOrder order, ModelSpec spec, boolean byGroup, int warmup, RestorableUniformRandomProvider rng,
                    double maxRange) {
        return of(order, spec, byGroup, warmup, rng, maxRange, AttractionTradeUpdate.RIDGES);
    }

    /** Whether the sweep starts with the joint step: with the coarse class or numbers of attraction. */
    static boolean hasJointStep(ModelSpec spec, Scale scale) {
        return spec.styleClasses().coarse() || spec.attraction().resolve(scale, spec.styleClasses()).length > 0;
    }

    /** For tests: ridges is the number of ridge moves per sweep of {@link AttractionTradeUpdate}. */
    static Chain of(SurveyOrder order, ModelSpec spec, boolean byGroup, int warmup, RestorableUniformRandomProvider rng,
                    double maxRange, double ridges) {
        Priors priors = spec.priors();
        StyleClasses classes = spec.styleClasses();
        Scale scale = order.survey().scale();
        RoundingChannel channel = classes.coarse()
                ? RoundingChannel.of(scale, classes.points(scale))
                : null;
        int lowest = scale.lowest();
        int[] attracted = java.util.Arrays.stream(spec.attraction().resolve(scale, classes)).map(r -> r - lowest).toArray();
        ChainState state = new ChainState(order, byGroup, channel, attracted);
        InitialValues.apply(state, priors.styleMean().mean(), rng);
        List<Update> sweep = new ArrayList<>();
        if (hasJointStep(spec, scale)) {
            JointHamiltonianUpdate joint = JointHamiltonianUpdate.of(state, priors, warmup, rng);
            sweep.add(joint);
            CollapsedSpreadUpdate spreads = joint.sparseMetric() ? CollapsedSpreadUpdate.of(state, priors, rng)
                    : CollapsedSpreadUpdate.ifSlow(state, priors, rng, warmup);
            if (spreads != null) {
                sweep.add(spreads);
            }
            sweep.add(ThresholdUpdate.ends(state, order.start(), priors, rng));
        } else if (state.byGroup && state.groups > 1) {
            // the plain model: the latent levels are redrawn below before any step reads them
            sweep.add(CollapsedSpreadUpdate.ifSlow(state, priors, rng, warmup));
        }
        if (state.byGroup) {
            sweep.add(CommonThresholdUpdate.of(state, priors, rng));
            sweep.add(ThresholdSpreadUpdate.of(state, priors, rng));
        }
        if (channel != null) {
            sweep.add(StyleClassUpdate.of(state, priors, rng));
        }
        if (state.attractionOn()) {
            sweep.add(AttractionUpdate.held(state, priors, rng, warmup));
            AttractionTradeUpdate trade = AttractionTradeUpdate.of(state, priors, rng, maxRange, ridges, warmup);
            if (trade != null) {
                sweep.add(trade);
            }
        }
        ThresholdRescaleUpdate thresholds = ThresholdRescaleUpdate.of(state, order.start(), priors, rng);
        List<Update> levelSteps = List.of(LatentLevelUpdate.of(state, rng), thresholds,
                RegressionUpdate.of(state.level, priors.level(), priors.groupMean(), rng));
        if (state.attractionOn()) {
            sweep.add(BoundedRedrawSteps.of(state, levelSteps, maxRange));
        } else {
            sweep.addAll(levelSteps);
        }
        if (state.groups > 1) {
            sweep.add(PoolingUpdate.of(state.level, priors.groupMean(), priors.groupSd(), rng));
        }
        if (channel != null) {
            if (StyleClassUpdate.augmented(state)) {
                sweep.add(RegressionUpdate.of(state.style, priors.style(), priors.styleMean(), rng));
            }
            if (state.groups > 1) {
                sweep.add(PoolingUpdate.of(state.style, priors.styleMean(), priors.styleSd(), rng));
            }
        }
        return new Chain(state, List.copyOf(sweep), thresholds, rng);
    }

    /** Writes the current state as a draw's row. */
    void writeRow(ParameterLayout layout, double[] row) {
        state.writeRow(layout, row);
    }

    /** One sweep: every update of the cycle once (indexed, so a sweep allocates no iterator). */
    void sweepOnce(boolean warmingUp) {
        for (int i = 0; i < sweep.size(); i++) {
            sweep.get(i).update(warmingUp);
        }
    }

    /** The random stream's state, the chain state, then each stateful update in sweep order. */
    @Override
    public void save(DataOutput out) throws IOException {
        byte[] stream = ((RandomProviderDefaultState) rng.saveState()).getState();
        out.writeInt(stream.length);
        out.write(stream);
        state.save(out);
        Checkpointed.saveAll(sweep, out);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        byte[] stream = new byte[in.readInt()];
        in.readFully(stream);
        rng.restoreState(new RandomProviderDefaultState(stream));
        state.restore(in);
        Checkpointed.restoreAll(sweep, in);
    }

    /** Acceptance of the joint Hamiltonian step while sampling; NaN when the sweep has none or it never started. */
    double jointAcceptance() {
        return joint(JointHamiltonianUpdate::acceptanceRate);
    }

    /** The joint step's mean leapfrog steps per trajectory while sampling; NaN as above. */
    double jointLeapfrogSteps() {
        return joint(JointHamiltonianUpdate::meanLeapfrogSteps);
    }

    /** The share of the joint step's trajectories that stopped on a wall while sampling; NaN as above. */
    double jointWallShare() {
        return joint(JointHamiltonianUpdate::wallShare);
    }

    private double joint(ToDoubleFunction<JointHamiltonianUpdate> statistic) {
        for (Update u : sweep) {
            if (u instanceof JointHamiltonianUpdate) {
                return statistic.applyAsDouble((JointHamiltonianUpdate) u);
            }
        }
        return Double.NaN;
    }

    /** Under attraction, the share of sampling sweeps without the latent-level steps ({@link BoundedRedrawSteps}); else 0. */
    double latentStepsSkipped() {
        for (Update u : sweep) {
            if (u instanceof BoundedRedrawSteps) {
                return ((BoundedRedrawSteps) u).skippedShare();
            }
        }
        return 0;
    }

    /** Which spreads {@link CollapsedSpreadUpdate} moves ("threshold_sd", "style_sd", both, or "none"); null without that step. */
    String spreadMoves() {
        for (Update u : sweep) {
            if (u instanceof CollapsedSpreadUpdate) {
                return ((CollapsedSpreadUpdate) u).movedSpreads();
            }
        }
        return null;
    }

    /** Acceptance of the rescaling steps, made in every mode. */
    double thresholdAcceptance() {
        return thresholdUpdate.acceptanceRate();
    }

    /** For tests: the chain's state. */
    ChainState state() {
        return state;
    }
}
