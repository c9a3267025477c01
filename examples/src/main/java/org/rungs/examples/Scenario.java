package org.rungs.examples;

import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.stream.IntStream;

/**
 * The true model behind a simulated survey: MODEL.md sections 2 (latent level) and 3
 * (thresholds), optionally with the response style classes and number attraction of section 4,
 * with every value on the user's scale (coefficients per unit of the raw
 * covariate, intercepts at raw covariates equal to zero).
 *
 * <p>{@code seed} fixes the parameters that a scenario draws rather than states (the group
 * levels {@code u[g]} of {@link GroupLevels.Drawn}, the threshold deviations of
 * {@link ThresholdDeviations.Drawn}, the style intercepts and attraction deviations when drawn);
 * the respondents come from the seed given to
 * {@link Simulator#simulate(Scenario, long)}, so one scenario yields many data sets with the
 * same truth.
 *
 * @param scale the rating scale
 * @param groups the groups in order, with their numbers of respondents
 * @param levelCovariates the covariates of the latent level, with their true effects
 * @param groupLevels the group intercepts {@code alpha[g]}
 * @param thresholds the common thresholds {@code c[1..M-1]}: increasing and summing to zero
 * @param thresholdDeviations the group deviations {@code d[g,.]}
 * @param styleClasses the coarse-responder class of MODEL.md 4 and 4a, or {@link StyleClasses#none()}
 * @param attraction the number attraction of MODEL.md 4b, or {@link NumberAttraction#none()}
 * @param seed the seed of the drawn parameters
 */
public record Scenario(Scale scale, List<Group> groups, List<LevelCovariate> levelCovariates,
                       GroupLevels groupLevels, double[] thresholds,
                       ThresholdDeviations thresholdDeviations, StyleClasses styleClasses,
                       NumberAttraction attraction, long seed) {

    /** Largest absolute sum accepted as zero for thresholds and deviations. */
    static final double SUM_TOLERANCE = 1e-9;

    /** Column names that the written survey file already uses. */
    private static final Set<String> RESERVED = Set.of(SimulatedSurvey.GROUP_COLUMN, SimulatedSurvey.RATING_COLUMN);

    /** The plain hierarchical ordered probit: no coarse class, no number attraction. */
    public Scenario(Scale scale, List<Group> groups, List<LevelCovariate> levelCovariates, GroupLevels groupLevels,
                    double[] thresholds, ThresholdDeviations thresholdDeviations, long seed) {
        this(scale, groups, levelCovariates, groupLevels, thresholds, thresholdDeviations, StyleClasses.none(),
                NumberAttraction.none(), seed);
    }

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
        checkStyle(scale, styleClasses, levelCovariates, groups);
        checkAttraction(scale, attraction, attractionSet(scale, styleClasses, attraction), groups);
    }

    @Override
    public double[] thresholds() {
        return thresholds.clone();
    }

    /** The coarse points of MODEL.md 4a, increasing: as stated, else {@code {L, floor((L+U)/2), U}}. */
    public int[] coarsePoints() {
        return coarsePoints(scale, styleClasses);
    }

    /**
     * The attraction set A of MODEL.md 4b: as stated, else increasing; the mean attractions and
     * stated deviations follow this order. Empty without attraction.
     */
    public int[] attractionSet() {
        return attractionSet(scale, styleClasses, attraction);
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

    private static int[] coarsePoints(Scale scale, StyleClasses styleClasses) {
        if (styleClasses instanceof StyleClasses.Coarse coarse && coarse.coarsePoints().length > 0) {
            return IntStream.of(coarse.coarsePoints()).sorted().toArray();
        }
        int lowest = scale.lowest();
        int highest = scale.highest();
        return IntStream.of(lowest, Math.floorDiv(lowest + highest, 2), highest).distinct().toArray();
    }

    private static int[] attractionSet(Scale scale, StyleClasses styleClasses, NumberAttraction attraction) {
        if (!(attraction instanceof NumberAttraction.Active active)) {
            return new int[0];
        }
        if (active.attractionSet().length > 0) {
            return active.attractionSet();
        }
        // MODEL.md 4b: by default every number but the coarse points, which are the reference.
        Set<Integer> coarse = new HashSet<>();
        for (int point : coarsePoints(scale, styleClasses)) {
            coarse.add(point);
        }
        return IntStream.rangeClosed(scale.lowest(), scale.highest()).filter(j -> !coarse.contains(j)).toArray();
    }

    private static void checkStyle(Scale scale, StyleClasses styleClasses, List<LevelCovariate> levelCovariates,
                                   List<Group> groups) {
        if (!(styleClasses instanceof StyleClasses.Coarse coarse)) {
            return;
        }
        int[] points = coarse.coarsePoints();
        if (IntStream.of(points).anyMatch(j -> j < scale.lowest() || j > scale.highest())
                || IntStream.of(points).distinct().count() != points.length) {
            throw new IllegalArgumentException("coarse points must be distinct numbers of the scale: " + Arrays.toString(points));
        }
        if (coarse.intercepts() instanceof GroupLevels.Fixed fixed && fixed.alpha().length != groups.size()) {
            throw new IllegalArgumentException("there are " + groups.size() + " groups but " + fixed.alpha().length
                    + " style intercepts");
        }
        if (groups.size() == 1 && !(coarse.intercepts() instanceof GroupLevels.Fixed)) {
            // MODEL.md section 5: with one group gamma reduces to mu_gamma.
            throw new IllegalArgumentException("one group needs a fixed style intercept");
        }
        Set<String> names = new HashSet<>(RESERVED);
        Set<String> labels = new HashSet<>();
        groups.forEach(group -> labels.add(group.label()));
        for (StyleCovariate covariate : coarse.covariates()) {
            if (!names.add(covariate.name()) || labels.contains(covariate.name())) {
                // style.<name> and style.<label> share one name space.
                throw new IllegalArgumentException("style covariate name " + covariate.name()
                        + " is used twice, reserved or a group label");
            }
            for (LevelCovariate level : levelCovariates) {
                if (level.name().equals(covariate.name()) && !(covariate instanceof StyleCovariate.Numeric numeric
                        && numeric.distribution().equals(level.distribution()) && numeric.decimals() == level.decimals())) {
                    throw new IllegalArgumentException("style covariate " + covariate.name()
                            + " shares its column with a level covariate, so it needs the same distribution and decimals");
                }
            }
        }
    }

    private static void checkAttraction(Scale scale, NumberAttraction attraction, int[] attractionSet, List<Group> groups) {
        if (!(attraction instanceof NumberAttraction.Active active)) {
            return;
        }
        if (attractionSet.length == 0) {
            throw new IllegalArgumentException("the attraction set is empty");
        }
        int[] stated = active.attractionSet();
        if (IntStream.of(stated).distinct().count() != stated.length
                || IntStream.of(stated).anyMatch(j -> j < scale.lowest() || j > scale.highest())) {
            throw new IllegalArgumentException("the attraction set must be distinct numbers of the scale: " + Arrays.toString(stated));
        }
        if (active.meanAttraction().length != attractionSet.length) {
            throw new IllegalArgumentException("the attraction set " + Arrays.toString(attractionSet) + " needs "
                    + attractionSet.length + " mean attractions, got " + active.meanAttraction().length);
        }
        AttractionDeviations deviations = active.deviations();
        if (groups.size() == 1 && !(deviations instanceof AttractionDeviations.None)) {
            // MODEL.md section 5: with one group a reduces to abar.
            throw new IllegalArgumentException("one group has no attraction deviations");
        }
        if (deviations instanceof AttractionDeviations.Fixed fixed) {
            double[][] t = fixed.deviations();
            if (t.length != groups.size() || Arrays.stream(t).anyMatch(row -> row.length != attractionSet.length)) {
                throw new IllegalArgumentException("stated attraction deviations need " + groups.size() + " rows of "
                        + attractionSet.length);
            }
        }
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

    /** Group intercepts: {@code alpha[g]} of MODEL.md section 2, and {@code gamma[g]} of section 4. */
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

    /** The response style classes of MODEL.md 4: mode none, or a coarse class. */
    public sealed interface StyleClasses {

        /** Mode {@code none}: every respondent answers on the full scale. */
        static StyleClasses none() {
            return new None();
        }

        /** Every {@code z_i = full}. */
        record None() implements StyleClasses {
        }

        /**
         * {@code P(z_i = coarse) = Phi(gamma[g_i] + w_i' delta)} (MODEL.md 4).
         *
         * @param covariates the style covariates w with their effects, on the user's scale
         * @param intercepts {@code gamma[g]} at raw numeric covariates 0 and every categorical
         *     covariate at a level of effect 0: stated, or {@code mu_gamma + tau_gamma v[g]} drawn
         * @param coarsePoints the points coarse responders report (MODEL.md 4a); empty for the
         *     default {@code {L, floor((L+U)/2), U}}
         */
        record Coarse(List<StyleCovariate> covariates, GroupLevels intercepts, int[] coarsePoints) implements StyleClasses {
            public Coarse {
                covariates = List.copyOf(covariates);
                coarsePoints = coarsePoints.clone();
            }

            /** With the default coarse points. */
            public Coarse(List<StyleCovariate> covariates, GroupLevels intercepts) {
                this(covariates, intercepts, new int[0]);
            }

            @Override
            public int[] coarsePoints() {
                return coarsePoints.clone();
            }
        }
    }

    /** A covariate of the response style (MODEL.md 1, {@code w_i}). */
    public sealed interface StyleCovariate {

        /** Column name in the file. */
        String name();

        /**
         * A numeric style covariate, effect per unit of the raw value. A level covariate of the
         * same name (same distribution and decimals) is the same column: one value per respondent.
         */
        record Numeric(String name, CovariateDistribution distribution, double perUnitEffect, int decimals)
                implements StyleCovariate {
            public Numeric {
                checkName(name, "covariate name");
                if (!Double.isFinite(perUnitEffect) || decimals < 0 || decimals > 9) {
                    throw new IllegalArgumentException("covariate " + name + " needs a finite effect and 0..9 decimals");
                }
            }

            /** The column of a level covariate, with its own effect on the style. */
            public static Numeric sharing(LevelCovariate level, double perUnitEffect) {
                return new Numeric(level.name(), level.distribution(), perUnitEffect, level.decimals());
            }
        }

        /**
         * A categorical style covariate written as text. {@code reference} is the level the
         * indicators are taken against; null for the most frequent in the data (ties to the first
         * to appear), as the engine chooses.
         */
        record Categorical(String name, List<Category> categories, String reference) implements StyleCovariate {
            public Categorical {
                checkName(name, "covariate name");
                categories = List.copyOf(categories);
                Set<String> labels = new HashSet<>();
                double shares = 0;
                for (Category category : categories) {
                    if (!labels.add(category.label())) {
                        throw new IllegalArgumentException("level " + category.label() + " of " + name + " is used twice");
                    }
                    shares += category.share();
                }
                if (categories.size() < 2 || Math.abs(shares - 1) > SUM_TOLERANCE) {
                    throw new IllegalArgumentException("covariate " + name + " needs at least two levels whose shares sum to 1");
                }
                if (reference != null && !labels.contains(reference)) {
                    throw new IllegalArgumentException("reference " + reference + " is not a level of " + name);
                }
            }
        }

        /** A level of a categorical covariate: its share of respondents and its effect on the probit of coarse. */
        record Category(String label, double share, double effect) {
            public Category {
                checkName(label, "level");
                if (!(share > 0) || share > 1 || !Double.isFinite(effect)) {
                    throw new IllegalArgumentException("level " + label + " needs a share in (0, 1] and a finite effect");
                }
            }
        }
    }

    /** The number attraction of MODEL.md 4b: off, or active on a set A. */
    public sealed interface NumberAttraction {

        /** Mode {@code none}: {@code a = 0} everywhere. */
        static NumberAttraction none() {
            return new None();
        }

        /** {@code a = 0}. */
        record None() implements NumberAttraction {
        }

        /**
         * {@code a[g,j] = abar[j] + t[g,j]} for j in A, 0 elsewhere.
         *
         * @param attractionSet A; empty for the default, every number but the coarse points in
         *     increasing order
         * @param meanAttraction {@code abar[j]} for the numbers of A in their order
         * @param deviations {@code t[g,.]}
         */
        record Active(int[] attractionSet, double[] meanAttraction, AttractionDeviations deviations)
                implements NumberAttraction {
            public Active {
                attractionSet = attractionSet.clone();
                meanAttraction = meanAttraction.clone();
                if (Arrays.stream(meanAttraction).anyMatch(a -> !Double.isFinite(a))) {
                    throw new IllegalArgumentException("mean attractions must be finite: " + Arrays.toString(meanAttraction));
                }
            }

            /** On the default set A. */
            public Active(double[] meanAttraction, AttractionDeviations deviations) {
                this(new int[0], meanAttraction, deviations);
            }

            @Override
            public int[] attractionSet() {
                return attractionSet.clone();
            }

            @Override
            public double[] meanAttraction() {
                return meanAttraction.clone();
            }
        }
    }

    /** The group deviations {@code t[g,j]} of MODEL.md 4b. */
    public sealed interface AttractionDeviations {

        /** {@code t = 0}: every group has {@code abar}; the only choice with one group. */
        static AttractionDeviations none() {
            return new None();
        }

        /** {@code t = 0}. */
        record None() implements AttractionDeviations {
        }

        /** {@code t[g,j] ~ Normal(0, sd)} drawn with the scenario's seed. */
        record Drawn(double sd) implements AttractionDeviations {
            public Drawn {
                if (!(sd > 0) || !Double.isFinite(sd)) {
                    throw new IllegalArgumentException("drawn attraction deviations need sd > 0, got " + sd);
                }
            }
        }

        /** Stated deviations, a row per group, a column per number of A in its order. */
        record Fixed(double[][] deviations) implements AttractionDeviations {
            public Fixed {
                deviations = Arrays.stream(deviations).map(double[]::clone).toArray(double[][]::new);
                if (Arrays.stream(deviations).flatMapToDouble(Arrays::stream).anyMatch(t -> !Double.isFinite(t))) {
                    throw new IllegalArgumentException("attraction deviations must be finite");
                }
            }

            @Override
            public double[][] deviations() {
                return Arrays.stream(deviations).map(double[]::clone).toArray(double[][]::new);
            }
        }
    }

    private static void checkName(String name, String what) {
        if (name == null || name.isBlank() || name.chars().anyMatch(ch -> ch == ',' || ch == '"' || ch == '\n' || ch == '\r')) {
            throw new IllegalArgumentException(what + " must be non-blank without commas, quotes or line breaks, got " + name);
        }
    }
}
