package org.rungs.examples;

import java.util.ArrayList;
import java.util.List;

/**
 * The built-in demo: an invented life-satisfaction survey (0..10) of 12 fictional regions,
 * 1,200 respondents each, with monthly income (thousands) and age (years) as level
 * covariates. Regions differ in level by about 0.4 latent standard deviations and space their
 * thresholds somewhat differently (tau_d = 0.15); the mean reported rating is close to 7.
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

    private static final int RESPONDENTS_PER_REGION = 1200;

    private DemoScenario() {
    }

    public static Scenario scenario() {
        List<Scenario.Group> groups = new ArrayList<>();
        for (String region : REGIONS) {
            groups.add(new Scenario.Group(region, RESPONDENTS_PER_REGION));
        }
        List<Scenario.LevelCovariate> covariates = List.of(
                // Thousands per month: median 2.8, mean about 3.2; +0.12 latent sd per thousand.
                new Scenario.LevelCovariate("income", new CovariateDistribution.LogNormal(2.8, 0.5), 0.12, 2),
                // Whole years of adults: -0.004 latent sd per year.
                new Scenario.LevelCovariate("age", new CovariateDistribution.TruncatedNormal(48, 17, 18, 90), -0.004, 0));
        return new Scenario(new Scenario.Scale(0, 10), groups, covariates,
                new Scenario.GroupLevels.Fixed(ALPHA), Scenario.centred(RAW_THRESHOLDS),
                new Scenario.ThresholdDeviations.Drawn(0.15), SEED);
    }
}
