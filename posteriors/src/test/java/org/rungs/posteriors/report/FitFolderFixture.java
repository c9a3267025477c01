package org.rungs.posteriors.report;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.DrawsCsv;

/**
 * Writes an invented fit folder in the formats the fit command writes (run.json, summary.csv,
 * draws.csv and the derived tables) for any number of groups, with every component on. The
 * numbers are plausible shapes, not the output of a fit: heaps at 0, 5 and 10, intended
 * distributions without them, chains that mix (or, with {@code converged = false}, chains that
 * do not), so that each chart of the report has something to show.
 */
final class FitFolderFixture {
    static final int CHAINS = 4;
    static final int ITERATIONS = 200;
    static final int[] ATTRACTING = {0, 5, 10};
    static final List<String> EDUCATION = List.of("primary", "secondary", "tertiary");
    static final List<String> COVARIATES = List.of("income", "age", "female");

    private FitFolderFixture() {
    }

    /** The fictional regions of the demo survey. */
    static List<String> demoRegions() {
        return List.of("Eastmarch", "Brackenreach", "Corrowmere", "Dunsellow", "Glimmerford", "Quillhaven", "Tarnwhistle",
                "Vellanmoor", "Orrinsdale", "Saltergrim", "Lowenfurrow", "Mistlecombe");
    }

    /** Region 1 .. Region n. */
    static List<String> numberedRegions(int count) {
        List<String> names = new ArrayList<>();
        for (int g = 1; g <= count; g++) {
            names.add("Region " + g);
        }
        return names;
    }

    static Path write(Path dir, List<String> groups, boolean converged, long seed) throws IOException {
        Files.createDirectories(dir);
        Random random = new Random(seed);
        int g = groups.size();
        double[] intended = new double[g];
        for (int i = 0; i < g; i++) {
            intended[i] = 6.2 + 0.9 * random.nextGaussian();
        }
        writeRun(dir, g);
        writeSummaryAndDraws(dir, groups, converged, random);
        writeGroups(dir, groups, intended, random);
        writeDistributions(dir, groups, intended, random);
        writeCoarse(dir);
        writeCoefficients(dir);
        writeAttraction(dir, groups, random);
        return dir;
    }

    private static void writeRun(Path dir, int groups) throws IOException {
        String json = """
                {
                  "versions": {"rungs": "0.1.0-SNAPSHOT", "java": "17", "os": "Linux amd64"},
                  "input": {
                    "file": "/data/demo-survey.csv",
                    "sha256": "98822b5228a299611a798fc730cb6d7c354e9e9cbb91c10d9ee4448c37837dd9",
                    "rows_read": 18040, "rows_used": 18000, "rows_excluded": 40,
                    "missing_by_column": {"rating": 25, "region": 0, "income": 15, "age": 0},
                    "groups": %d, "scale": "0..10"
                  },
                  "model": {
                    "thresholds": "by-group", "style_classes": "coarse (default points)", "attraction": "0, 5, 10 by group",
                    "priors": {"level": "normal(0.0, 1.0)", "group_mean": "normal(0.0, 2.0)", "group_sd": "half-normal(1.0)",
                      "threshold": "normal(0.0, 3.0)", "threshold_sd": "half-normal(0.5)", "style": "normal(0.0, 1.0)",
                      "style_mean": "normal(-1.0, 1.0)", "style_sd": "half-normal(1.0)", "attraction_mean": "normal(0.0, 0.5)",
                      "attraction_sd": "half-normal(0.3)"},
                    "level_covariates": {
                      "income": {"source_column": "income", "kind": "numeric", "centre": 3.19, "scale": 1.68},
                      "age": {"source_column": "age", "kind": "numeric", "centre": 48.9, "scale": 15.0},
                      "female": {"source_column": "sex", "kind": "indicator"}
                    }
                  },
                  "sampler": {"chains": 4, "warmup": 1000, "draws": 1000, "thin": 2, "kept_draws": 1000, "seed": 1,
                    "seconds": 61.5, "interrupted": false, "joint_step_acceptance_per_chain": "0.646, 0.719, 0.729, 0.584",
                    "joint_step_leapfrog_steps_per_chain": "6.053, 8.058, 11.699, 6.003",
                    "joint_step_walls_per_chain": "0.272, 0.240, 0.239, 0.317",
                    "spread_moves_per_chain": "none; style_sd; threshold_sd, style_sd; none"},
                  "derived_draws": 1000,
                  "cross_validation": {"draws": 1000, "respondents": 18000, "elpd_loo": -33438.5, "elpd_loo_se": 97.6,
                    "p_loo": 102.3, "pareto_k_good": 17990, "pareto_k_ok": 7, "pareto_k_bad": 2, "pareto_k_very_bad": 1},
                  "comparison_fit": {"chains": 4, "warmup": 1000, "draws": 1000,
                    "verdict": "All 153 quantities converged (R-hat <= 1.01, bulk and tail ESS >= 100 per chain)."},
                  "finished": "2026-12-02T01:32:16Z",
                  "warnings": ["40 rows excluded: the rating or a covariate is missing."]
                }
                """.formatted(groups);
        Files.writeString(dir.resolve("run.json"), json, StandardCharsets.UTF_8);
    }

    private static void writeSummaryAndDraws(Path dir, List<String> groups, boolean converged, Random random)
            throws IOException {
        List<String> names = new ArrayList<>(List.of("level.income", "level.age", "group_mean", "group_sd"));
        for (String group : groups) {
            names.add("group." + group);
        }
        for (int k = 1; k <= 10; k++) {
            names.add("threshold." + k);
        }
        names.addAll(List.of("style_mean", "style_sd"));
        Draws draws = new Draws(names, CHAINS, ITERATIONS);
        StringBuilder summary = new StringBuilder("name,mean,sd,q5,q50,q95,rhat,ess_bulk,ess_tail,mcse_mean,flag\n");
        for (int p = 0; p < names.size(); p++) {
            double centre = random.nextGaussian();
            boolean stuck = !converged && p % 3 == 0;
            double[] all = new double[CHAINS * ITERATIONS];
            for (int c = 0; c < CHAINS; c++) {
                // AR(1) around the centre; a stuck chain sits apart from the others.
                double level = centre + (stuck ? 0.8 * (c - 1.5) : 0);
                double x = level;
                for (int i = 0; i < ITERATIONS; i++) {
                    x = level + 0.5 * (x - level) + 0.2 * random.nextGaussian();
                    draws.set(p, c, i, x);
                    all[c * ITERATIONS + i] = x;
                }
            }
            double[] sorted = all.clone();
            Arrays.sort(sorted);
            double mean = Arrays.stream(all).average().orElseThrow();
            double sd = Math.sqrt(Arrays.stream(all).map(v -> (v - mean) * (v - mean)).sum() / (all.length - 1));
            double rhat = stuck ? 1.2 + 0.1 * random.nextDouble() : 1.0 + 0.005 * random.nextDouble();
            double ess = stuck ? 20 + 10 * random.nextDouble() : 400 + 200 * random.nextDouble();
            summary.append(String.format(Locale.ROOT, "%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s%n", names.get(p), mean, sd,
                    sorted[(int) (0.05 * all.length)], sorted[all.length / 2], sorted[(int) (0.95 * all.length)], rhat, ess,
                    ess * 1.1, sd / Math.sqrt(ess), stuck ? "rhat>1.01;low ess_bulk;low ess_tail" : "ok"));
        }
        Files.writeString(dir.resolve("summary.csv"), summary, StandardCharsets.UTF_8);
        DrawsCsv.write(draws, dir.resolve("draws.csv"));
    }

    private static void writeGroups(Path dir, List<String> groups, double[] intended, Random random) throws IOException {
        StringBuilder sb = new StringBuilder("group,respondents,reported_mean");
        for (String q : List.of("intended_mean", "harmonised_mean", "mean_bias", "coarse_share", "rank_intended",
                "rank_harmonised")) {
            sb.append(',').append(q).append("_mean,").append(q).append("_q5,").append(q).append("_q95");
        }
        sb.append(",p_top3_intended,p_top3_harmonised,rank_change\n");
        int g = groups.size();
        double[] harmonised = new double[g];
        double[] reported = new double[g];
        for (int i = 0; i < g; i++) {
            harmonised[i] = intended[i] + 0.3 * random.nextGaussian();
            reported[i] = intended[i] - 0.25 + 0.3 * random.nextGaussian();
        }
        int[] rankIntended = ranks(intended);
        int[] rankHarmonised = ranks(harmonised);
        int[] rankReported = ranks(reported);
        for (int i = 0; i < g; i++) {
            double coarse = 0.1 + 0.15 * random.nextDouble();
            sb.append(quote(groups.get(i))).append(',').append(1500).append(',').append(num(reported[i]));
            triple(sb, intended[i], 0.12);
            triple(sb, harmonised[i], 0.15);
            triple(sb, reported[i] - intended[i], 0.1);
            triple(sb, coarse, 0.04);
            sb.append(',').append(rankIntended[i]).append(',').append(Math.max(1, rankIntended[i] - 1)).append(',')
                    .append(Math.min(g, rankIntended[i] + 1));
            sb.append(',').append(rankHarmonised[i]).append(',').append(Math.max(1, rankHarmonised[i] - 2)).append(',')
                    .append(Math.min(g, rankHarmonised[i] + 2));
            double top3 = rankIntended[i] <= 3 ? 0.7 : 0.05;
            sb.append(',').append(num(top3)).append(',').append(num(top3)).append(',')
                    .append(rankIntended[i] - rankReported[i]).append('\n');
        }
        Files.writeString(dir.resolve("groups.csv"), sb, StandardCharsets.UTF_8);
    }

    private static void writeDistributions(Path dir, List<String> groups, double[] intended, Random random)
            throws IOException {
        StringBuilder sb = new StringBuilder("group,rating,observed_count,reported_share,intended_share_mean,intended_share_q5,"
                + "intended_share_q95,harmonised_share_mean,harmonised_share_q5,harmonised_share_q95,replicated_mean,"
                + "replicated_q5,replicated_q95,outside_90\n");
        int respondents = 1500;
        for (int i = 0; i < groups.size(); i++) {
            double[] share = new double[11];
            double total = 0;
            for (int k = 0; k <= 10; k++) {
                share[k] = Math.exp(-0.5 * Math.pow((k - intended[i]) / 2.0, 2));
                total += share[k];
            }
            double[] reported = new double[11];
            double reportedTotal = 0;
            for (int k = 0; k <= 10; k++) {
                share[k] /= total;
                // Coarse responders heap on 0, 5 and 10 and leave the neighbours of 5 short.
                reported[k] = share[k] * (k == 5 ? 1.6 : k == 0 || k == 10 ? 1.5 : k == 4 || k == 6 ? 0.8 : 1.0);
                reportedTotal += reported[k];
            }
            for (int k = 0; k <= 10; k++) {
                double observedShare = reported[k] / reportedTotal;
                int count = (int) Math.round(respondents * observedShare);
                double replicated = count * (1 + 0.05 * random.nextGaussian());
                double halfWidth = 1.645 * Math.sqrt(replicated + 1);
                boolean outside = k == 7 && i % 4 == 0;
                sb.append(quote(groups.get(i))).append(',').append(k).append(',').append(count).append(',')
                        .append(num((double) count / respondents)).append(',')
                        .append(num(share[k])).append(',').append(num(share[k] * 0.85)).append(',').append(num(share[k] * 1.15))
                        .append(',').append(num(share[k])).append(',').append(num(share[k] * 0.8)).append(',')
                        .append(num(share[k] * 1.2)).append(',').append(num(outside ? replicated * 0.8 : replicated)).append(',')
                        .append(num(Math.max(0, (outside ? replicated * 0.8 : replicated) - halfWidth))).append(',')
                        .append(num((outside ? replicated * 0.8 : replicated) + halfWidth)).append(',').append(outside)
                        .append('\n');
            }
        }
        Files.writeString(dir.resolve("distributions.csv"), sb, StandardCharsets.UTF_8);
    }

    private static void writeCoarse(Path dir) throws IOException {
        StringBuilder sb = new StringBuilder("column,level,share_mean,share_q5,share_q95\n");
        double[] shares = {0.28, 0.17, 0.08};
        for (int l = 0; l < EDUCATION.size(); l++) {
            sb.append("education,").append(EDUCATION.get(l)).append(',').append(num(shares[l])).append(',')
                    .append(num(shares[l] - 0.03)).append(',').append(num(shares[l] + 0.03)).append('\n');
        }
        Files.writeString(dir.resolve("coarse_shares.csv"), sb, StandardCharsets.UTF_8);
    }

    private static void writeCoefficients(Path dir) throws IOException {
        String csv = """
                covariate,kind,ame_mean,ame_q5,ame_q95,ame_per_unit_mean,ame_per_unit_q5,ame_per_unit_q95,naive_ols_per_unit,plain_probit_per_unit_mean,plain_probit_per_unit_q5,plain_probit_per_unit_q95,naive_bias
                income,numeric,0.40,0.37,0.43,0.238,0.220,0.256,0.190,0.201,0.185,0.217,-0.048
                age,numeric,-0.12,-0.15,-0.09,-0.0080,-0.0100,-0.0060,-0.0050,-0.0060,-0.0075,-0.0045,0.0030
                female,indicator,0.21,0.12,0.30,0.21,0.12,0.30,0.15,0.17,0.09,0.25,-0.06
                """;
        Files.writeString(dir.resolve("coefficients.csv"), csv, StandardCharsets.UTF_8);
    }

    private static void writeAttraction(Path dir, List<String> groups, Random random) throws IOException {
        StringBuilder sb = new StringBuilder("group,rating,a_mean,a_q5,a_q95,exp_a_mean,exp_a_q5,exp_a_q95,p_positive,sd_ratio\n");
        List<String> rows = new ArrayList<>(List.of("all"));
        rows.addAll(groups);
        for (String group : rows) {
            for (int j : ATTRACTING) {
                double a = (j == 5 ? 0.35 : 0.1) + 0.1 * random.nextGaussian();
                sb.append(quote(group)).append(',').append(j).append(',').append(num(a)).append(',').append(num(a - 0.15))
                        .append(',').append(num(a + 0.15)).append(',').append(num(Math.exp(a))).append(',')
                        .append(num(Math.exp(a - 0.15))).append(',').append(num(Math.exp(a + 0.15))).append(',')
                        .append(num(a > 0 ? 0.9 : 0.3)).append(',').append(num(0.4)).append('\n');
            }
        }
        Files.writeString(dir.resolve("attraction.csv"), sb, StandardCharsets.UTF_8);
    }

    private static void triple(StringBuilder sb, double mean, double halfWidth) {
        sb.append(',').append(num(mean)).append(',').append(num(mean - halfWidth)).append(',').append(num(mean + halfWidth));
    }

    /** Rank 1 = highest. */
    private static int[] ranks(double[] values) {
        int[] rank = new int[values.length];
        for (int i = 0; i < values.length; i++) {
            rank[i] = 1;
            for (int j = 0; j < values.length; j++) {
                if (values[j] > values[i] || (values[j] == values[i] && j < i)) {
                    rank[i]++;
                }
            }
        }
        return rank;
    }

    private static String num(double value) {
        return String.format(Locale.ROOT, "%.6g", value);
    }

    private static String quote(String value) {
        return value.indexOf(',') >= 0 || value.indexOf('"') >= 0 ? '"' + value.replace("\"", "\"\"") + '"' : value;
    }
}
