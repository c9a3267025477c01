package org.rungs.examples;

import java.io.BufferedWriter;
import java.io.IOException;
import java.math.BigDecimal;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Collections;
import java.util.List;
import java.util.Map;

/** A survey drawn by {@link Simulator}: primitive columns, one row per respondent, and the true parameters. */
public final class SimulatedSurvey {

    /** Name of the group column in the written file. */
    public static final String GROUP_COLUMN = "region";

    /** Name of the rating column in the written file. */
    public static final String RATING_COLUMN = "rating";

    private final Scenario scenario;
    private final int[] group;
    private final int[] rating;
    private final double[][] covariates;
    private final Map<String, Double> truth;

    SimulatedSurvey(Scenario scenario, int[] group, int[] rating, double[][] covariates, Map<String, Double> truth) {
        this.scenario = scenario;
        this.group = group;
        this.rating = rating;
        this.covariates = covariates;
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

    /** Raw values of one level covariate, on the user's scale. */
    public double[] covariate(String name) {
        int j = covariateNames().indexOf(name);
        if (j < 0) {
            throw new IllegalArgumentException("no covariate named " + name + "; there are " + covariateNames());
        }
        return covariates[j].clone();
    }

    /** True parameter values under the engine's draw names, on its internal scale (see {@link Simulator}). */
    public Map<String, Double> truth() {
        return truth;
    }

    /** Writes {@code region,rating,<covariates>}, one row per respondent. */
    public void writeCsv(Path file) throws IOException {
        List<Scenario.LevelCovariate> columns = scenario.levelCovariates();
        try (BufferedWriter out = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            out.write(GROUP_COLUMN + "," + RATING_COLUMN);
            for (Scenario.LevelCovariate column : columns) {
                out.write("," + column.name());
            }
            out.write('\n');
            for (int row = 0; row < rating.length; row++) {
                out.write(groupLabel(row));
                out.write(',');
                out.write(Integer.toString(rating[row]));
                for (int j = 0; j < columns.size(); j++) {
                    out.write(',');
                    // Plain decimals at the column's rounding, which parse back to the same double.
                    out.write(BigDecimal.valueOf(covariates[j][row]).setScale(columns.get(j).decimals(), RoundingMode.HALF_UP).toPlainString());
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
}
