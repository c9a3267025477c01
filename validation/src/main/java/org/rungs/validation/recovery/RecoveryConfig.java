package org.rungs.validation.recovery;

import java.util.Objects;
import org.rungs.examples.Scenario;
import org.rungs.models.ModelSpec;
import org.rungs.models.survey.Scale;

/**
 * One recovery study: a fixed truth, the model fitted to each data set drawn from it, the
 * sampler, and the number of replications.
 *
 * @param truth        the scenario every replication simulates (its respondents drawn afresh)
 * @param truthLabel   the truth in words, for the summary
 * @param fit          the model fitted to each simulated survey
 * @param chains       chains per fit
 * @param warmup       warm-up iterations per chain
 * @param draws        kept iterations per chain
 * @param seed         base seed; replication r depends on (seed, r) only
 * @param replications number of simulated data sets R
 */
public record RecoveryConfig(Scenario truth, String truthLabel, ModelSpec fit, int chains, int warmup, int draws,
        long seed, int replications) {

    /** The file of a study folder that records the configuration. */
    public static final String FILE = "recovery.txt";

    public RecoveryConfig {
        Objects.requireNonNull(truth, "truth");
        Objects.requireNonNull(truthLabel, "truthLabel");
        Objects.requireNonNull(fit, "fit");
        if (chains < 1 || warmup < 0 || draws < 2) {
            throw new IllegalArgumentException("need chains >= 1, warm-up >= 0 and draws >= 2, got " + chains + ", "
                    + warmup + " and " + draws);
        }
        if (replications < 1) {
            throw new IllegalArgumentException("at least one replication is needed, got " + replications);
        }
    }

    /**
     * The demo (or its shrunk form) as the truth.
     *
     * @throws IllegalArgumentException if the fit names a coarse point or attraction number off the truth's scale
     */
    public static RecoveryConfig of(DemoTruth truth, ModelSpec fit, int chains, int warmup, int draws, long seed,
            int replications) {
        Scenario scenario = truth.scenario();
        fit.checkRatings(new Scale(scenario.scale().lowest(), scenario.scale().highest()));
        return new RecoveryConfig(scenario, truth.describe(), fit, chains, warmup, draws, seed, replications);
    }

    /**
     * The text of {@value #FILE}: one {@code key = value} line per component, the scenario and
     * model in full. A rerun into a folder resumes only when these texts are equal.
     */
    public String describe() {
        return "truth = " + truthLabel + '\n'
                + "scenario = " + RecordText.of(truth) + '\n'
                + "fit = " + RecordText.of(fit) + '\n'
                + "chains = " + chains + '\n'
                + "warmup = " + warmup + '\n'
                + "draws = " + draws + '\n'
                + "seed = " + seed + '\n'
                + "replications = " + replications + '\n';
    }
}
