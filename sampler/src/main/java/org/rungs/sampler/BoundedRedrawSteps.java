package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import java.util.List;

/**
 * Under number attraction, the latent-level draws and the steps that condition on them (threshold
 * rescaling, the level's conjugate regression), made only while the redraw scheme of
 * {@link LatentLevelUpdate} has a bounded cost: in every group the attractions span at most
 * {@link #MAX_RANGE}, so a respondent's acceptance probability is at least exp(-MAX_RANGE) and
 * its expected number of rejected draws below 1,000 whatever its level. Otherwise the sweep skips
 * them; the joint step, the collapsed threshold steps and the attraction steps still run.
 *
 * <p>Exact: the steps inside leave the attractions unchanged and each leaves the joint posterior
 * invariant, so each leaves the posterior given the attractions invariant; whether they run
 * depends on the attractions alone, so the sweep's kernel is, for each value of the attractions,
 * either one that leaves that conditional invariant or the identity, and the mixture leaves the
 * joint posterior invariant. A chain far from the posterior (early warm-up, or a run-away start)
 * could otherwise stall in the scheme: its cost grows like exp(max a - min a).
 */
final class BoundedRedrawSteps implements Update, Checkpointed {
    /** log(1,000): the largest spread max a - min a (0 included) in a group at which the steps run. */
    static final double MAX_RANGE = Math.log(1000);
    private final ChainState state;
    private final List<Update> steps;
    private final double maxRange;
    private int samplingSweeps;
    private int skipped;

    private BoundedRedrawSteps(ChainState state, List<Update> steps, double maxRange) {
        this.state = state;
        this.steps = steps;
        this.maxRange = maxRange;
    }

    static BoundedRedrawSteps of(ChainState state, List<Update> steps) {
        return of(state, steps, MAX_RANGE);
    }

    /** For tests: another largest range, so that the bound binds on an ordinary posterior. */
    static BoundedRedrawSteps of(ChainState state, List<Update> steps, double maxRange) {
        return new BoundedRedrawSteps(state, List.copyOf(steps), maxRange);
    }

    @Override
    public void update(boolean adapt) {
        boolean bounded = bounded(state, maxRange);
        if (!adapt) {
            samplingSweeps++;
            skipped += bounded ? 0 : 1;
        }
        if (bounded) {
            for (int i = 0; i < steps.size(); i++) { // indexed: no iterator per sweep
                steps.get(i).update(adapt);
            }
        }
    }

    /** True when every group's attractions, 0 included, span at most maxRange. */
    static boolean bounded(ChainState s, double maxRange) {
        for (int g = 0; g < s.groups; g++) {
            if (!bounded(s.attraction, g * s.categories, s.attracted, maxRange)) {
                return false;
            }
        }
        return true;
    }

    /** True when the attractions at {@code at + k} (k in attracted), 0 included, span at most maxRange. */
    static boolean bounded(double[] attraction, int at, int[] attracted, double maxRange) {
        double low = 0;
        double top = 0;
        for (int k : attracted) {
            low = Math.min(low, attraction[at + k]);
            top = Math.max(top, attraction[at + k]);
        }
        return top - low <= maxRange;
    }

    /** The share of sampling sweeps in which the steps were skipped; 0 before sampling. */
    double skippedShare() {
        return samplingSweeps == 0 ? 0 : skipped / (double) samplingSweeps;
    }

    /** The counters, then each stateful step in order. */
    @Override
    public void save(DataOutput out) throws IOException {
        out.writeInt(samplingSweeps);
        out.writeInt(skipped);
        Checkpointed.saveAll(steps, out);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        samplingSweeps = in.readInt();
        skipped = in.readInt();
        Checkpointed.restoreAll(steps, in);
    }
}
