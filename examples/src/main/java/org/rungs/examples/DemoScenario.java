package org.rungs.examples;

import java.util.ArrayList;
import java.util.List;

/**
 * The built-in demo: an invented life-satisfaction survey (0..10) of 12 fictional regions,
 * 1,500 respondents each, with monthly income (thousands) and age (years) as level covariates.
 * Regions differ in level by about 0.4 latent standard deviations and space their thresholds
 * somewhat differently (tau_d = 0.15).
 *
 * <p>{@link #scenario()} tells the full story of MODEL.md section 4: about a third of the
 * respondents with basic education answer coarsely on 0, 5 and 10, fewer among the better
 * educated (education is the style covariate), and a few regions like one number and avoid
 * another. {@link #orderedProbit()} is the same survey without either.
 */
public final class DemoScenario {

    /** Seed of the demo's drawn parameters and, by default, of its respondents. */
    public static final long SEED = 20261202L;

    /** Invented region names. */
    static final String[] REGIONS = {
        "Eastmarch", "Brackenreach", "Corrowmere", "Dunsellow", "Glimmerford", "Quillhaven",
        "Tarnwhistle", "Vellanmoor", "Orrinsdale", "Saltergrim", "Lowenfurrow", "Mistlecombe"
    };

    /** Region intercepts at income 0 and age 0, user's scale; their sd is about 0.38. */
    private static final double[] ALPHA = {1.05, 0.55, 0.95, 0.35, 0.85, 0.60, 1.25, 0.15, 0.75, 0.45, 1.45, 0.90};

    /** Thresholds before centring: gaps widen from 0.40 at the bottom to about 0.6 at the top. */
    private static final double[] RAW_THRESHOLDS = {-2.5, -2.1, -1.7, -1.25, -0.8, -0.25, 0.3, 0.9, 1.55, 2.15};

    private static final int RESPONDENTS_PER_REGION = 1500;

    /**
     * Probit of the coarse class with basic education, per region drawn around -0.43
     * (Phi(-0.43) = 0.33, a third) with sd 0.2.
     */
    private static final Scenario.GroupLevels STYLE_INTERCEPTS = new Scenario.GroupLevels.Drawn(-0.43, 0.2);

    /** Education: shares and effects on the probit of coarse (about 33%, 15% and 7% coarse). */
    static final Scenario.StyleCovariate EDUCATION = new Scenario.StyleCovariate.Categorical("education", List.of(
            new Scenario.StyleCovariate.Category("basic", 0.25, 0),
            new Scenario.StyleCovariate.Category("secondary", 0.45, -0.6),
            new Scenario.StyleCovariate.Category("tertiary", 0.30, -1.05)), null);

    /** {@code abar[j]} on the default set {1, 2, 3, 4, 6, 7, 8, 9}: 7 and 8 mildly liked, 3 and 9 mildly avoided. */
    private static final double[] MEAN_ATTRACTION = {0, 0, -0.1, 0, 0, 0.2, 0.1, -0.1};

    /**
     * {@code t[g,.]}: Eastmarch and Quillhaven like 7 and avoid 4, Dunsellow likes 8 and avoids
     * 3; the other regions follow the mean.
     */
    private static final double[][] ATTRACTION_DEVIATIONS = {
        {0, 0, 0, -0.5, 0, 0.6, 0, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
        {0, 0, -0.4, 0, 0, 0, 0.5, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
        {0, 0, 0, -0.4, 0, 0.5, 0, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
        {0, 0, 0, 0, 0, 0, 0, 0},
    };

    private DemoScenario() {
    }

    /** The full demo: ordered probit with coarse responders (by education) and number attraction. */
    public static Scenario scenario() {
        return new Scenario(new Scenario.Scale(0, 10), groups(), levelCovariates(),
                new Scenario.GroupLevels.Fixed(ALPHA), Scenario.centred(RAW_THRESHOLDS),
                new Scenario.ThresholdDeviations.Drawn(0.15),
                new Scenario.StyleClasses.Coarse(List.of(EDUCATION), STYLE_INTERCEPTS),
                new Scenario.NumberAttraction.Active(MEAN_ATTRACTION, new Scenario.AttractionDeviations.Fixed(ATTRACTION_DEVIATIONS)),
                SEED);
    }

    /** The same regions, covariates and thresholds as the plain hierarchical ordered probit. */
    public static Scenario orderedProbit() {
        return new Scenario(new Scenario.Scale(0, 10), groups(), levelCovariates(),
                new Scenario.GroupLevels.Fixed(ALPHA), Scenario.centred(RAW_THRESHOLDS),
                new Scenario.ThresholdDeviations.Drawn(0.15), SEED);
    }

    private static List<Scenario.Group> groups() {
        List<Scenario.Group> groups = new ArrayList<>();
        for (String region : REGIONS) {
            groups.add(new Scenario.Group(region, RESPONDENTS_PER_REGION));
        }
        return groups;
    }

    private static List<Scenario.LevelCovariate> levelCovariates() {
        return List.of(
                // Thousands per month: median 2.8, mean about 3.2; +0.12 latent sd per thousand.
                new Scenario.LevelCovariate("income", new CovariateDistribution.LogNormal(2.8, 0.5), 0.12, 2),
                // Whole years of adults: -0.004 latent sd per year.
                new Scenario.LevelCovariate("age", new CovariateDistribution.TruncatedNormal(48, 17, 18, 90), -0.004, 0));
    }
}
