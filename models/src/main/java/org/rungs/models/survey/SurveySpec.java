package org.rungs.models.survey;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Set;

/**
 * Which columns of a survey file mean what.
 *
 * @param ratingColumn the rating, an integer on {@code scale}
 * @param groupColumn the group label, or null for one group labelled {@value #SINGLE_GROUP}
 * @param levelColumns covariates of the latent level (MODEL.md section 2)
 * @param styleColumns covariates of the response style (section 4); may share columns with level
 * @param categoricalColumns covariates read as categorical even when every value is a number
 * @param referenceLevels reference level per categorical column (naming one makes the column
 *     categorical); otherwise the most frequent level
 * @param weightColumn survey weights, or null when unweighted
 * @param missingCodes values meaning "missing" in every used column, besides empty cells and {@code NA};
 *     none may be a rating of {@code scale}, which would discard real answers unasked (say so with
 *     {@code missingCodesByColumn} of the rating column if it is meant)
 * @param missingCodesByColumn further missing codes of single columns
 */
public record SurveySpec(String ratingColumn, String groupColumn, List<String> levelColumns, List<String> styleColumns,
        Set<String> categoricalColumns, Map<String, String> referenceLevels, String weightColumn, Scale scale,
        List<String> missingCodes, Map<String, List<String>> missingCodesByColumn) {

    /** Label of the only group when the specification names no group column. */
    public static final String SINGLE_GROUP = "all";

    public SurveySpec {
        Objects.requireNonNull(ratingColumn, "ratingColumn");
        Objects.requireNonNull(scale, "scale");
        levelColumns = List.copyOf(levelColumns == null ? List.of() : levelColumns);
        styleColumns = List.copyOf(styleColumns == null ? List.of() : styleColumns);
        categoricalColumns = Collections.unmodifiableSet(new LinkedHashSet<>(
                categoricalColumns == null ? Set.of() : categoricalColumns));
        referenceLevels = Collections.unmodifiableMap(new LinkedHashMap<>(
                referenceLevels == null ? Map.of() : referenceLevels));
        missingCodes = List.copyOf(missingCodes == null ? List.of() : missingCodes);
        for (String code : missingCodes) {
            requireOffTheScale(code, scale, ratingColumn);
        }
        Map<String, List<String>> byColumn = new LinkedHashMap<>();
        if (missingCodesByColumn != null) {
            missingCodesByColumn.forEach((column, codes) -> byColumn.put(column, List.copyOf(codes)));
        }
        missingCodesByColumn = Collections.unmodifiableMap(byColumn);
        if (categoricalColumns.contains(null) || referenceLevels.containsKey(null)
                || referenceLevels.containsValue(null) || byColumn.containsKey(null)) {
            throw new IllegalArgumentException("null column name or reference level in the survey specification");
        }
        Set<String> roles = new HashSet<>();
        roles.add(ratingColumn);
        for (String role : Arrays.asList(groupColumn, weightColumn)) {
            if (role != null && !roles.add(role)) {
                throw new IllegalArgumentException("column \"" + role + "\" has two roles among rating, group and weight");
            }
        }
        Set<String> covariates = new LinkedHashSet<>();
        for (List<String> list : List.of(levelColumns, styleColumns)) {
            if (new HashSet<>(list).size() != list.size()) {
                throw new IllegalArgumentException("a covariate is listed twice in " + list);
            }
            for (String column : list) {
                if (roles.contains(column)) {
                    throw new IllegalArgumentException("column \"" + column
                            + "\" is the rating, group or weight and cannot also be a covariate");
                }
            }
            covariates.addAll(list);
        }
        for (String column : categoricalColumns) {
            requireCovariate(covariates, column, "declared categorical");
        }
        for (String column : referenceLevels.keySet()) {
            requireCovariate(covariates, column, "given a reference level");
        }
        for (String column : byColumn.keySet()) {
            if (!roles.contains(column) && !covariates.contains(column)) {
                throw new IllegalArgumentException("column \"" + column
                        + "\" has missing codes but is not used by the survey specification");
            }
        }
    }

    /**
     * Refuses a code for every column that is a rating of the scale (our rule): in the rating
     * column it would silently discard every real answer of that rating.
     */
    private static void requireOffTheScale(String code, Scale scale, String ratingColumn) {
        byte[] bytes = Blanks.strip(code).getBytes(StandardCharsets.UTF_8);
        DecimalScanner scanner = new DecimalScanner();
        if (scanner.scan(bytes, 0, bytes.length) != DecimalScanner.Kind.NUMBER) {
            return;
        }
        double v = scanner.value();
        if (v == Math.rint(v) && v >= scale.lowest() && v <= scale.highest()) {
            long rating = (long) v;
            throw new IllegalArgumentException("the missing code " + Text.quote(code) + " for every column is the rating "
                    + rating + " of the scale " + scale + ", so it would discard the real answers of " + rating
                    + " in the rating column " + Text.quote(ratingColumn) + "; expected missing codes off the scale, or"
                    + " --missing-in " + Text.escape(ratingColumn) + "=" + Text.escape(Blanks.strip(code))
                    + " if answers of " + rating + " really mean missing");
        }
    }

    private static void requireCovariate(Set<String> covariates, String column, String what) {
        if (!covariates.contains(column)) {
            throw new IllegalArgumentException("column \"" + column + "\" is " + what
                    + " but is not a level or style covariate");
        }
    }

    /** A rating and an optional group column, nothing else. */
    public static SurveySpec of(String ratingColumn, String groupColumn, Scale scale) {
        return builder(ratingColumn, scale).group(groupColumn).build();
    }

    public static Builder builder(String ratingColumn, Scale scale) {
        return new Builder(ratingColumn, scale);
    }

    /** Whether a covariate column is categorical by declaration (a file can also make it so). */
    public boolean declaredCategorical(String column) {
        return categoricalColumns.contains(column) || referenceLevels.containsKey(column);
    }

    /**
     * The columns the reader uses, in this order: rating, group, weight, then the level and style
     * covariates without repeats.
     */
    public List<String> usedColumns() {
        Set<String> used = new LinkedHashSet<>();
        used.add(ratingColumn);
        if (groupColumn != null) {
            used.add(groupColumn);
        }
        if (weightColumn != null) {
            used.add(weightColumn);
        }
        used.addAll(levelColumns);
        used.addAll(styleColumns);
        return List.copyOf(used);
    }

    /** Builder with defaults: no group, no covariates, no weights, no missing codes beyond empty and NA. */
    public static final class Builder {
        private final String ratingColumn;
        private final Scale scale;
        private String groupColumn;
        private final List<String> levelColumns = new ArrayList<>();
        private final List<String> styleColumns = new ArrayList<>();
        private final Set<String> categoricalColumns = new LinkedHashSet<>();
        private final Map<String, String> referenceLevels = new LinkedHashMap<>();
        private String weightColumn;
        private final List<String> missingCodes = new ArrayList<>();
        private final Map<String, List<String>> missingCodesByColumn = new LinkedHashMap<>();

        private Builder(String ratingColumn, Scale scale) {
            this.ratingColumn = ratingColumn;
            this.scale = scale;
        }

        public Builder group(String column) {
            groupColumn = column;
            return this;
        }

        public Builder level(String... columns) {
            levelColumns.addAll(Arrays.asList(columns));
            return this;
        }

        public Builder style(String... columns) {
            styleColumns.addAll(Arrays.asList(columns));
            return this;
        }

        public Builder categorical(String... columns) {
            categoricalColumns.addAll(Arrays.asList(columns));
            return this;
        }

        public Builder reference(String column, String level) {
            referenceLevels.put(column, level);
            return this;
        }

        public Builder weight(String column) {
            weightColumn = column;
            return this;
        }

        /** Codes meaning "missing" in every used column, e.g. "88", "99", "-1". */
        public Builder missingCodes(String... codes) {
            missingCodes.addAll(Arrays.asList(codes));
            return this;
        }

        /** Codes meaning "missing" in one column. */
        public Builder missingCodesFor(String column, String... codes) {
            missingCodesByColumn.computeIfAbsent(column, c -> new ArrayList<>()).addAll(Arrays.asList(codes));
            return this;
        }

        public SurveySpec build() {
            return new SurveySpec(ratingColumn, groupColumn, levelColumns, styleColumns, categoricalColumns,
                    referenceLevels, weightColumn, scale, missingCodes, missingCodesByColumn);
        }
    }
}
