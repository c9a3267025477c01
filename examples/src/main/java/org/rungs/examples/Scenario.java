package org.rungs.examples;

import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * The true model behind a simulated survey: MODEL.md sections 2 (latent level) and 3
 * (thresholds), with every value on the user's scale (coefficients per unit of the raw
 * covariate, intercepts at raw covariates equal to zero).
 *
 * <p>{@code seed} fixes the parameters that a scenario draws rather than states (the group
 * levels {@code u[g]} of {@link GroupLevels.Drawn}, the threshold deviations of
 * {@link ThresholdDeviations.Drawn}); the respondents come from the seed given to
 * {@link Simulator#simulate(Scenario, long)}, so one scenario yields many data sets with the
 * same truth.
 *
 * @param scale the rating scale
 * @param groups the groups in order, with their numbers of respondents
 * @param levelCovariates the covariates of the latent level, with their true effects
 * @param groupLevels the group intercepts {@code alpha[g]}
 * @param thresholds the common thresholds {@code c[1..M-1]}: increasing and summing to zero
 * @param thresholdDeviations the group deviations {@code d[g,.]}
 * @param seed the seed of the drawn parameters
 */
public record Scenario(Scale scale, List<Group> groups, List<LevelCovariate> levelCovariates,
                       GroupLevels groupLevels, double[] thresholds,
                       ThresholdDeviations thresholdDeviations, long seed) {

    /** Largest absolute sum accepted as zero for thresholds and deviations. */
    static final double SUM_TOLERANCE = 1e-9;

    /** Column names that the written survey file already uses. */
    private static final Set<String> RESERVED = Set.of(SimulatedSurvey.GROUP_COLUMN, SimulatedSurvey.RATING_COLUMN);

    public Scenario {
        groups = List.copyOf(groups);
        levelCovariates = List.copyOf(levelCovariates);
        thresholds = thresholds.clone();
        if (groups.isEmpty()) {
            throw new IllegalArgumentException("a scenario needs at least one group");
        }
        Set<String> labels = new HashSet<>();
        for (Group group : groups) {
            if (!labels.add(group.label())) {
                throw new IllegalArgumentException("group label " + group.label() + " is used twice");
            }
        }
        Set<String> names = new HashSet<>(RESERVED);
        for (LevelCovariate covariate : levelCovariates) {
            if (!names.add(covariate.name())) {
                throw new IllegalArgumentException("covariate name " + covariate.name() + " is used twice or reserved");
            }
        }
        checkThresholds(scale, thresholds);
        int groupCount = groups.size();
        if (groupLevels instanceof GroupLevels.Fixed fixed && fixed.alpha().length != groupCount) {
            throw new IllegalArgumentException("there are " + groupCount + " groups but " + fixed.alpha().length + " intercepts");
        }
        if (groupCount == 1 && !(groupLevels instanceof GroupLevels.Fixed && thresholdDeviations instanceof ThresholdDeviations.Shared)) {
            // MODEL.md section 5: with one group alpha and d reduce to the global terms.
            throw new IllegalArgumentException("one group needs a fixed intercept and shared thresholds");
        }
        if (!(thresholdDeviations instanceof ThresholdDeviations.Shared) && thresholds.length < 2) {
            throw new IllegalArgumentException("deviations summing to zero need at least two thresholds");
        }
        if (thresholdDeviations instanceof ThresholdDeviations.Fixed fixed) {
            checkDeviations(thresholds, fixed.deviations(), groups);
        }
    }

    @Override
    public double[] thresholds() {
        return thresholds.clone();
    }

    /** Number of groups G. */
    public int groupCount() {
        return groups.size();
    }

    /** Total number of respondents. */
    public int respondents() {
        return groups.stream().mapToInt(Group::respondents).sum();
    }

    /** {@code values - mean(values)}: MODEL.md section 3 builds c from b and d from s this way. */
    public static double[] centred(double... values) {
        double mean = Arrays.stream(values).average().orElse(0);
        return Arrays.stream(values).map(v -> v - mean).toArray();
    }

    private static void checkThresholds(Scale scale, double[] thresholds) {
        if (thresholds.length != scale.categories() - 1) {
            throw new IllegalArgumentException("a scale of " + scale.categories() + " categories needs "
                    + (scale.categories() - 1) + " thresholds, got " + thresholds.length);
        }
        checkIncreasing(thresholds, "the common thresholds");
        if (Math.abs(Arrays.stream(thresholds).sum()) > SUM_TOLERANCE) {
            throw new IllegalArgumentException("the common thresholds must sum to zero (MODEL.md section 3): " + Arrays.toString(thresholds));
        }
    }

    private static void checkDeviations(double[] thresholds, double[][] deviations, List<Group> groups) {
        if (deviations.length != groups.size()) {
            throw new IllegalArgumentException("there are " + groups.size() + " groups but " + deviations.length + " rows of deviations");
        }
        for (int g = 0; g < deviations.length; g++) {
            double[] d = deviations[g];
            String label = groups.get(g).label();
            if (d.length != thresholds.length) {
                throw new IllegalArgumentException("group " + label + " has " + d.length + " deviations, expected " + thresholds.length);
            }
            if (Math.abs(Arrays.stream(d).sum()) > SUM_TOLERANCE) {
                throw new IllegalArgumentException("the deviations of group " + label + " must sum to zero: " + Arrays.toString(d));
            }
            double[] own = new double[d.length];
            for (int k = 0; k < d.length; k++) {
                own[k] = thresholds[k] + d[k];
            }
            checkIncreasing(own, "the thresholds of group " + label);
        }
    }

    private static void checkIncreasing(double[] values, String what) {
        for (int k = 0; k < values.length; k++) {
            if (!Double.isFinite(values[k]) || (k > 0 && !(values[k] > values[k - 1]))) {
                throw new IllegalArgumentException(what + " must be finite and increasing: " + Arrays.toString(values));
            }
        }
    }

    /** The integer rating scale lowest..highest. */
    public record Scale(int lowest, int highest) {
        public Scale {
            if (lowest >= highest) {
                throw new IllegalArgumentException("a scale needs lowest < highest, got " + lowest + ".." + highest);
            }
        }

        /** Number of categories M. */
        public int categories() {
            return highest - lowest + 1;
        }
    }

    /** A group and its number of respondents. */
    public record Group(String label, int respondents) {
        public Group {
            checkName(label, "group label");
            if (respondents < 1) {
                throw new IllegalArgumentException("group " + label + " needs at least one respondent");
            }
        }
    }

    /**
     * A level covariate: how its raw values are drawn, its true effect per unit of the raw value,
     * and the decimals the raw values are rounded to (the rounded values enter the latent level
     * and the file alike).
     */
    public record LevelCovariate(String name, CovariateDistribution distribution, double perUnitEffect, int decimals) {
        public LevelCovariate {
            checkName(name, "covariate name");
            if (!Double.isFinite(perUnitEffect) || decimals < 0 || decimals > 9) {
                throw new IllegalArgumentException("covariate " + name + " needs a finite effect and 0..9 decimals");
            }
        }
    }

    /** The group intercepts {@code alpha[g]} of MODEL.md section 2. */
    public sealed interface GroupLevels {

        /** Stated intercepts, one per group, on the user's scale. */
        record Fixed(double[] alpha) implements GroupLevels {
            public Fixed {
                alpha = alpha.clone();
                if (Arrays.stream(alpha).anyMatch(a -> !Double.isFinite(a))) {
                    throw new IllegalArgumentException("intercepts must be finite: " + Arrays.toString(alpha));
                }
            }

            @Override
            public double[] alpha() {
                return alpha.clone();
            }
        }

        /** {@code alpha[g] = mean + sd * u[g]}, {@code u[g] ~ Normal(0, 1)} drawn with the scenario's seed. */
        record Drawn(double mean, double sd) implements GroupLevels {
            public Drawn {
                if (!Double.isFinite(mean) || !(sd >= 0) || !Double.isFinite(sd)) {
                    throw new IllegalArgumentException("drawn group levels need a finite mean and sd >= 0, got (" + mean + ", " + sd + ")");
                }
            }
        }
    }

    /** The group deviations {@code d[g,.]} of MODEL.md section 3. */
    public sealed interface ThresholdDeviations {

        /** Mode {@code shared}: {@code d = 0}, one set of thresholds for all groups. */
        static ThresholdDeviations shared() {
            return new Shared();
        }

        /** {@code d = 0}. */
        record Shared() implements ThresholdDeviations {
        }

        /** Stated deviations, a row per group, each row summing to zero. */
        record Fixed(double[][] deviations) implements ThresholdDeviations {
            public Fixed {
                deviations = Arrays.stream(deviations).map(double[]::clone).toArray(double[][]::new);
            }

            @Override
            public double[][] deviations() {
                return Arrays.stream(deviations).map(double[]::clone).toArray(double[][]::new);
            }
        }

        /**
         * {@code d[g,.] = s[g,.] - mean_k s[g,k]}, {@code s[g,k] ~ Normal(0, sd)}, drawn with the
         * scenario's seed and redrawn until the group's thresholds increase (the prior's restriction).
         */
        record Drawn(double sd) implements ThresholdDeviations {
            public Drawn {
                if (!(sd > 0) || !Double.isFinite(sd)) {
                    throw new IllegalArgumentException("drawn deviations need sd > 0, got " + sd);
                }
            }
        }
    }

    private static void checkName(String name, String what) {
        if (name == null || name.isBlank() || name.chars().anyMatch(ch -> ch == ',' || ch == '"' || ch == '\n' || ch == '\r')) {
            throw new IllegalArgumentException(what + " must be non-blank without commas, quotes or line breaks, got " + name);
        }
    }
}
