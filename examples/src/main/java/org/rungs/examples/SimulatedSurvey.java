package org.rungs.examples;

import java.io.BufferedWriter;
import java.io.IOException;
import java.math.BigDecimal;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;

/**
 * A survey drawn by {@link Simulator}: primitive columns, one row per respondent, the latent
 * style classes and the true parameters.
 */
public final class SimulatedSurvey {

    /** Name of the group column in the written file. */
    public static final String GROUP_COLUMN = "region";

    /** Name of the rating column in the written file. */
    public static final String RATING_COLUMN = "rating";

    private final Scenario scenario;
    private final int[] group;
    private final int[] rating;
    private final Map<String, double[]> numericColumns;
    private final Map<String, int[]> categoricalColumns;
    private final Map<String, String> referenceLevels;
    private final boolean[] coarse;
    private final double[] coarseProbability;
    private final Map<String, Double> truth;

    SimulatedSurvey(Scenario scenario, int[] group, int[] rating, Map<String, double[]> numericColumns,
                    Map<String, int[]> categoricalColumns, Map<String, String> referenceLevels, boolean[] coarse,
                    double[] coarseProbability, Map<String, Double> truth) {
        this.scenario = scenario;
        this.group = group;
        this.rating = rating;
        this.numericColumns = numericColumns;
        this.categoricalColumns = categoricalColumns;
        this.referenceLevels = Collections.unmodifiableMap(referenceLevels);
        this.coarse = coarse;
        this.coarseProbability = coarseProbability;
        this.truth = Collections.unmodifiableMap(truth);
    }

    /** The scenario the survey was drawn from. */
    public Scenario scenario() {
        return scenario;
    }

    /** Number of respondents (rows). */
    public int size() {
        return rating.length;
    }

    /** Group labels in the scenario's order; {@link #group()} indexes this list. */
    public List<String> groupLabels() {
        return scenario.groups().stream().map(Scenario.Group::label).toList();
    }

    /** Group of each row, as an index 0..G-1 into {@link #groupLabels()}. */
    public int[] group() {
        return group.clone();
    }

    /** Group label of one row. */
    public String groupLabel(int row) {
        return scenario.groups().get(group[row]).label();
    }

    /** Reported rating of each row. */
    public int[] rating() {
        return rating.clone();
    }

    /** Names of the level covariates, in column order. */
    public List<String> covariateNames() {
        return scenario.levelCovariates().stream().map(Scenario.LevelCovariate::name).toList();
    }

    /** Names of the style covariates, in the scenario's order (some may also be level covariates). */
    public List<String> styleCovariateNames() {
        return scenario.styleClasses() instanceof Scenario.StyleClasses.Coarse style
                ? style.covariates().stream().map(Scenario.StyleCovariate::name).toList() : List.of();
    }

    /**
     * The reference level of each categorical style covariate, as the truth's indicator names
     * use it (stated, or the most frequent); a fit naming these references gives draws of the
     * same names.
     */
    public Map<String, String> referenceLevels() {
        return referenceLevels;
    }

    /** Raw values of a numeric level or style covariate, on the user's scale. */
    public double[] covariate(String name) {
        double[] column = numericColumns.get(name);
        if (column == null) {
            throw new IllegalArgumentException("no numeric covariate named " + name + "; there are " + numericColumns.keySet());
        }
        return column.clone();
    }

    /** Level label of each row of a categorical style covariate. */
    public String[] category(String name) {
        int[] codes = categoricalColumns.get(name);
        if (codes == null) {
            throw new IllegalArgumentException("no categorical covariate named " + name + "; there are " + categoricalColumns.keySet());
        }
        List<Scenario.StyleCovariate.Category> levels = categorical(name).categories();
        String[] labels = new String[codes.length];
        for (int row = 0; row < codes.length; row++) {
            labels[row] = levels.get(codes[row]).label();
        }
        return labels;
    }

    /** Whether each row's respondent is in the coarse class (latent, MODEL.md 4); all false without style classes. */
    public boolean[] coarse() {
        return coarse.clone();
    }

    /** True {@code q_i = Phi(gamma[g_i] + w_i' delta)} of each row (MODEL.md 4c); all 0 without style classes. */
    public double[] coarseProbability() {
        return coarseProbability.clone();
    }

    /** True parameter values under the engine's draw names, on its internal scale (see {@link Simulator}). */
    public Map<String, Double> truth() {
        return truth;
    }

    /**
     * Writes {@code region,rating,<level covariates>,<other style covariates>}, one row per
     * respondent; categorical columns as their level labels.
     */
    public void writeCsv(Path file) throws IOException {
        List<String> columns = new ArrayList<>(covariateNames());
        styleCovariateNames().stream().filter(name -> !columns.contains(name)).forEach(columns::add);
        int[] decimals = new int[columns.size()];
        for (int j = 0; j < columns.size(); j++) {
            decimals[j] = decimals(columns.get(j));
        }
        try (BufferedWriter out = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            out.write(GROUP_COLUMN + "," + RATING_COLUMN);
            for (String column : columns) {
                out.write("," + column);
            }
            out.write('\n');
            String[][] labels = new String[columns.size()][];
            for (int j = 0; j < columns.size(); j++) {
                labels[j] = categoricalColumns.containsKey(columns.get(j)) ? category(columns.get(j)) : null;
            }
            for (int row = 0; row < rating.length; row++) {
                out.write(groupLabel(row));
                out.write(',');
                out.write(Integer.toString(rating[row]));
                for (int j = 0; j < columns.size(); j++) {
                    out.write(',');
                    if (labels[j] != null) {
                        out.write(labels[j][row]);
                    } else {
                        // Plain decimals at the column's rounding, which parse back to the same double.
                        out.write(BigDecimal.valueOf(numericColumns.get(columns.get(j))[row]).setScale(decimals[j], RoundingMode.HALF_UP)
                                .toPlainString());
                    }
                }
                out.write('\n');
            }
        }
    }

    /** Writes {@code parameter,value}, one row per true parameter, values at full double precision. */
    public void writeTruth(Path file) throws IOException {
        try (BufferedWriter out = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            out.write("parameter,value");
            out.write('\n');
            for (Map.Entry<String, Double> entry : truth.entrySet()) {
                out.write(entry.getKey() + "," + entry.getValue());
                out.write('\n');
            }
        }
    }

    /** Decimals of a numeric column; 0 for a categorical one. */
    private int decimals(String name) {
        for (Scenario.LevelCovariate level : scenario.levelCovariates()) {
            if (level.name().equals(name)) {
                return level.decimals();
            }
        }
        for (Scenario.StyleCovariate style : ((Scenario.StyleClasses.Coarse) scenario.styleClasses()).covariates()) {
            if (style.name().equals(name) && style instanceof Scenario.StyleCovariate.Numeric numeric) {
                return numeric.decimals();
            }
        }
        return 0;
    }

    private Scenario.StyleCovariate.Categorical categorical(String name) {
        return ((Scenario.StyleClasses.Coarse) scenario.styleClasses()).covariates().stream()
                .filter(c -> c.name().equals(name)).map(Scenario.StyleCovariate.Categorical.class::cast)
                .findFirst().orElseThrow();
    }
}
