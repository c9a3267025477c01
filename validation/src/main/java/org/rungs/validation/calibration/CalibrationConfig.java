package org.rungs.validation.calibration;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Scale;
import org.rungs.priors.Priors;

/**
 * One simulation-based calibration (Talts et al. 2018): the simulated design, the model the data
 * are drawn from, the model that is fitted, the sampler and the number of replications. The two
 * model specs are equal for a calibration of the engine; making them differ in one component
 * (a prior, the threshold mode, the style classes carried by {@link ModelSpec}) is how a
 * deliberately wrong component is planted.
 *
 * @param scale               the rating scale
 * @param groups              number of groups G
 * @param respondents         respondents per group
 * @param covariates          numeric level covariates, drawn standard normal before standardising
 * @param styleCovariates     numeric style covariates (MODEL.md 4, w), drawn likewise; only with the coarse class
 * @param styleLevels         0: the style covariates are standard normal; else each takes the values
 *                            0..styleLevels-1 with equal chances, as a categorical one coded in numbers
 * @param simulation          model and priors the parameters and ratings are drawn from
 * @param fit                 model and priors of the fit
 * @param chains              chains per fit
 * @param warmup              warm-up iterations per chain
 * @param draws               kept iterations per chain
 * @param rankDraws           L, the draws kept after thinning; a rank lies in 0..L
 * @param seed                base seed; replication r depends on (seed, r) only
 * @param replications        number of replications
 * @param alpha               family-wise false-alarm rate of the verdicts over all parameters
 */
public record CalibrationConfig(Scale scale, int groups, int respondents, int covariates, int styleCovariates,
        int styleLevels, ModelSpec simulation,
        ModelSpec fit, int chains, int warmup, int draws, int rankDraws, long seed, int replications, double alpha) {

    /** The file of a calibration folder that records the configuration. */
    public static final String FILE = "calibration.txt";

    public CalibrationConfig {
        if (groups < 1 || respondents < 1 || covariates < 0) {
            throw new IllegalArgumentException("need at least one group of at least one respondent and no negative covariate count, got "
                    + groups + " groups of " + respondents + " and " + covariates + " covariates");
        }
        if (covariates > 0 && groups * respondents < covariates + 2) {
            throw new IllegalArgumentException(covariates + " covariates need more than " + (covariates + 1) + " respondents");
        }
        if (styleCovariates < 0) {
            throw new IllegalArgumentException("the number of style covariates cannot be negative, got " + styleCovariates);
        }
        if (styleLevels < 0 || styleLevels == 1) {
            throw new IllegalArgumentException("style covariates take 0 (normal) or at least 2 levels, got " + styleLevels);
        }
        if (styleCovariates > 0 && !simulation.styleClasses().coarse() && !fit.styleClasses().coarse()) {
            throw new IllegalArgumentException("style covariates enter only the coarse class; choose the coarse style classes");
        }
        if (styleCovariates > 0 && groups * respondents < styleCovariates + 2) {
            throw new IllegalArgumentException(styleCovariates + " style covariates need more than " + (styleCovariates + 1)
                    + " respondents");
        }
        if (chains < 1 || warmup < 0 || draws < 1) {
            throw new IllegalArgumentException("need chains >= 1, warm-up >= 0 and draws >= 1");
        }
        if (rankDraws < 1 || rankDraws > chains * draws) {
            throw new IllegalArgumentException("the draws kept for ranks (" + rankDraws + ") must lie in 1.."
                    + chains * draws + " (chains x draws)");
        }
        if (replications < 1) {
            throw new IllegalArgumentException("at least one replication is needed, got " + replications);
        }
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("the false-alarm rate alpha must lie strictly between 0 and 1, got " + alpha);
        }
    }

    /**
     * The small configuration used in CI: scale 0..4, 3 groups of 40, one covariate, by-group
     * thresholds, default priors, 2 chains of 200 warm-up and 200 kept iterations thinned to 99.
     */
    public static CalibrationConfig small(long seed, int replications) {
        ModelSpec model = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults());
        return new CalibrationConfig(new Scale(0, 4), 3, 40, 1, 0, 0, model, model, 2, 200, 200, 99, seed, replications, 0.01);
    }

    /**
     * The small configuration of the coarse class used in CI: scale 0..4 with the default coarse
     * points {0, 2, 4} (so ratings 1 and 3 are ties), 3 groups of 60, one level and one style
     * covariate, by-group thresholds, default priors, 2 chains of 300 warm-up and 300 kept
     * iterations thinned to 99.
     */
    public static CalibrationConfig coarse(long seed, int replications) {
        ModelSpec model = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.coarse(null));
        return new CalibrationConfig(new Scale(0, 4), 3, 60, 1, 1, 0, model, model, 2, 300, 300, 99, seed, replications, 0.01);
    }

    /**
     * The small configuration of the complete model used in CI: the coarse configuration with
     * number attraction on its default set, which on 0..4 with coarse points {0, 2, 4} is {1, 3}.
     */
    public static CalibrationConfig attraction(long seed, int replications) {
        CalibrationConfig coarse = coarse(seed, replications);
        return coarse.withModel(coarse.fit().withAttraction(NumberAttraction.besidesCoarsePoints()));
    }

    public CalibrationConfig withFit(ModelSpec f) {
        return new CalibrationConfig(scale, groups, respondents, covariates, styleCovariates, styleLevels, simulation, f, chains,
                warmup, draws, rankDraws, seed, replications, alpha);
    }

    public CalibrationConfig withModel(ModelSpec both) {
        return new CalibrationConfig(scale, groups, respondents, covariates, styleCovariates, styleLevels, both, both, chains,
                warmup, draws, rankDraws, seed, replications, alpha);
    }

    public CalibrationConfig withDesign(int g, int perGroup, int p) {
        return new CalibrationConfig(scale, g, perGroup, p, styleCovariates, styleLevels, simulation, fit, chains, warmup, draws,
                rankDraws, seed, replications, alpha);
    }

    public CalibrationConfig withReplications(int r) {
        return new CalibrationConfig(scale, groups, respondents, covariates, styleCovariates, styleLevels, simulation, fit, chains,
                warmup, draws, rankDraws, seed, r, alpha);
    }

    public CalibrationConfig withStyleCovariates(int q) {
        return new CalibrationConfig(scale, groups, respondents, covariates, q, styleLevels, simulation, fit, chains, warmup, draws,
                rankDraws, seed, replications, alpha);
    }

    /** Style covariates taking the values 0..levels-1 (see the record's parameters). */
    public CalibrationConfig withStyleLevels(int levels) {
        return new CalibrationConfig(scale, groups, respondents, covariates, styleCovariates, levels, simulation, fit, chains, warmup,
                draws, rankDraws, seed, replications, alpha);
    }

    public CalibrationConfig withSampler(int c, int w, int d, int l) {
        return new CalibrationConfig(scale, groups, respondents, covariates, styleCovariates, styleLevels, simulation, fit, c, w, d,
                l, seed, replications, alpha);
    }

    /** Labels of the simulated groups, {@code g1..gG}. */
    public List<String> groupLabels() {
        List<String> labels = new ArrayList<>(groups);
        for (int g = 1; g <= groups; g++) {
            labels.add("g" + g);
        }
        return labels;
    }

    /** Names of the simulated covariates, {@code x1..xP}. */
    public List<String> covariateNames() {
        List<String> names = new ArrayList<>(covariates);
        for (int j = 1; j <= covariates; j++) {
            names.add("x" + j);
        }
        return names;
    }

    /** Names of the simulated style covariates, {@code w1..wQ}. */
    public List<String> styleCovariateNames() {
        List<String> names = new ArrayList<>(styleCovariates);
        for (int j = 1; j <= styleCovariates; j++) {
            names.add("w" + j);
        }
        return names;
    }

    /** Whether the data are simulated or fitted with the coarse class. */
    public boolean coarseClass() {
        return simulation.styleClasses().coarse() || fit.styleClasses().coarse();
    }

    /**
     * The text of {@value #FILE}: one {@code key = value} line per component. Two folders hold
     * replications of the same calibration exactly when these texts are equal.
     */
    public String describe() {
        StringBuilder sb = new StringBuilder();
        line(sb, "model", coarseClass() ? "ordered-probit with coarse class" : "ordered-probit");
        line(sb, "scale", scale.toString());
        line(sb, "groups", Integer.toString(groups));
        line(sb, "respondents_per_group", Integer.toString(respondents));
        line(sb, "level_covariates", Integer.toString(covariates));
        line(sb, "simulation_thresholds", simulation.thresholdMode().label());
        line(sb, "simulation_priors", simulation.priors().toString());
        line(sb, "fit_thresholds", fit.thresholdMode().label());
        line(sb, "fit_priors", fit.priors().toString());
        if (coarseClass()) {
            // only with the coarse class, so that folders of ordered-probit calibrations keep their text
            line(sb, "style_covariates", Integer.toString(styleCovariates));
            if (styleLevels > 0) {
                // only when set, so that earlier folders keep their text
                line(sb, "style_levels", Integer.toString(styleLevels));
            }
            line(sb, "simulation_style_classes", simulation.styleClasses().label());
            line(sb, "fit_style_classes", fit.styleClasses().label());
        }
        if (simulation.attraction().on() || fit.attraction().on()) {
            // only with attraction, so that folders of earlier calibrations keep their text
            line(sb, "simulation_attraction", simulation.attraction().label());
            line(sb, "fit_attraction", fit.attraction().label());
        }
        line(sb, "chains", Integer.toString(chains));
        line(sb, "warmup", Integer.toString(warmup));
        line(sb, "draws", Integer.toString(draws));
        line(sb, "rank_draws", Integer.toString(rankDraws));
        line(sb, "seed", Long.toString(seed));
        line(sb, "replications", Integer.toString(replications));
        line(sb, "alpha", String.format(Locale.ROOT, "%s", alpha));
        return sb.toString();
    }

    private static void line(StringBuilder sb, String key, String value) {
        sb.append(key).append(" = ").append(value).append('\n');
    }
}
