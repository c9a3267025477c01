package org.rungs.posteriors.report;

import java.io.BufferedReader;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.rungs.posteriors.LeaveOneOut;

/**
 * Fits of different models to the same rows of the same file, compared by their leave-one-out
 * predictive accuracy (each fit's {@code cross_validation.csv}): the difference of elpd_loo from
 * the best fit and its standard error, sqrt(n) times the sd of the pointwise differences
 * (Vehtari, Gelman & Gabry 2017, Statistics and Computing 27, eq. 24). The pointwise differences
 * are paired by the file's row, so the fits must have used the same rows, and they must predict the
 * same thing: the same rating column on the same scale (our rule: otherwise elpd_loo measures
 * predictions of different outcomes, and their difference means nothing); a difference of a few
 * standard errors or less does not tell the models apart (same paper, section 5.2; equation and
 * section numbers from memory).
 */
public final class CrossValidationComparison {
    /** The file every fit folder of a comparison must hold. */
    public static final String FILE = "cross_validation.csv";

    /**
     * One fit in the comparison.
     *
     * @param dir        the fit folder
     * @param model      the model in words, from run.json
     * @param elpd       elpd_loo
     * @param se         its standard error
     * @param mcse       its Monte Carlo standard error
     * @param effective  p_loo
     * @param unreliable respondents whose Pareto k exceeds {@link LeaveOneOut#RELIABLE_K}
     * @param difference elpd_loo minus the best fit's (0 for the best)
     * @param differenceSe the standard error of that difference (0 for the best)
     * @param byGroup    the difference and its standard error over each group's respondents
     * @param converged  the fit's summary.csv shows it converged (or converged within chance) and it was not interrupted
     */
    public record Fit(Path dir, String model, double elpd, double se, double mcse, double effective, int unreliable,
                      double difference, double differenceSe, List<GroupDifference> byGroup, boolean converged) {
        public Fit {
            byGroup = List.copyOf(byGroup);
        }
    }

    /**
     * A fit's elpd_loo minus the best fit's over one group's respondents, and its standard error
     * (the same formula within the group): where a model predicts better or worse.
     */
    public record GroupDifference(String group, int respondents, double difference, double differenceSe) {
    }

    private CrossValidationComparison() {
    }

    /**
     * Reads the fit folders and compares them, best first.
     *
     * @throws IOException when a folder is named twice or is not a cross-validated fit, the fits read
     *                     different files, other rating columns or scales, or used different rows, or
     *                     a file is malformed; the message says which
     */
    public static List<Fit> compare(List<Path> dirs) throws IOException {
        if (dirs.size() < 2) {
            throw new IOException("name at least two fit folders to compare, got " + dirs.size());
        }
        List<Pointwise> fits = new ArrayList<>();
        for (Path dir : dirs) {
            fits.add(Pointwise.read(dir));
        }
        for (int i = 0; i < fits.size(); i++) {
            for (int j = i + 1; j < fits.size(); j++) {
                if (Files.isSameFile(fits.get(i).dir, fits.get(j).dir)) {
                    throw new IOException(fits.get(i).dir + " and " + fits.get(j).dir + " are the same fit folder; name"
                            + " the folders of different fits");
                }
            }
        }
        Pointwise first = fits.get(0);
        for (Pointwise other : fits.subList(1, fits.size())) {
            first.checkComparable(other);
        }
        Pointwise best = fits.stream().max(Comparator.comparingDouble(Pointwise::total)).orElseThrow();
        List<Fit> out = new ArrayList<>();
        for (Pointwise f : fits) {
            int n = f.elpd.length;
            double[] difference = new double[n];
            for (int i = 0; i < n; i++) {
                difference[i] = f.elpd[i] - best.elpd[i];
            }
            out.add(new Fit(f.dir, f.model, f.total(), LeaveOneOut.standardError(f.elpd), f.mcse(),
                    LeaveOneOut.total(f.effective), f.unreliable(), LeaveOneOut.total(difference),
                    f == best ? 0 : LeaveOneOut.standardError(difference), byGroup(first, difference, f == best),
                    converged(f.dir)));
        }
        out.sort(Comparator.comparingDouble(Fit::difference).reversed());
        return out;
    }

    /**
     * Whether the fit in {@code dir} converged, by the verdict its report gives from summary.csv
     * (false without a summary.csv): our rule, after an audit in which compare ranked fits whose
     * chains had not converged without a word.
     */
    private static boolean converged(Path dir) throws IOException {
        Path summary = dir.resolve("summary.csv");
        if (!Files.isRegularFile(summary)) {
            return false;
        }
        FitFolder fit = new FitFolder(dir, Json.read(dir.resolve("run.json")), CsvTable.read(summary), null, null, null,
                null, null, null);
        return ConvergenceSection.verdict(fit).converged();
    }

    /** The pointwise differences summed within each group of {@code rows}, in order of the groups' first rows. */
    private static List<GroupDifference> byGroup(Pointwise rows, double[] difference, boolean best) {
        int groups = rows.labels.size();
        int[] size = new int[groups];
        for (int g : rows.group) {
            size[g]++;
        }
        double[][] part = new double[groups][];
        for (int g = 0; g < groups; g++) {
            part[g] = new double[size[g]];
        }
        int[] filled = new int[groups];
        for (int i = 0; i < difference.length; i++) {
            int g = rows.group[i];
            part[g][filled[g]++] = difference[i];
        }
        List<GroupDifference> out = new ArrayList<>();
        for (int g = 0; g < groups; g++) {
            out.add(new GroupDifference(rows.labels.get(g), size[g], LeaveOneOut.total(part[g]),
                    best ? 0 : LeaveOneOut.standardError(part[g])));
        }
        return out;
    }

    /**
     * Per group, each fit's elpd_loo minus the best fit's with its standard error, one column per
     * fit but the best; control characters in the labels escaped.
     */
    public static String formatByGroup(List<Fit> fits) {
        StringBuilder b = new StringBuilder();
        List<GroupDifference> first = fits.get(0).byGroup();
        List<String> labels = first.stream().map(d -> Json.escape(d.group(), Integer.MAX_VALUE)).toList();
        int width = Math.max(5, labels.stream().mapToInt(String::length).max().orElse(5));
        b.append("elpd_diff by group against the best fit, ").append(fits.get(0).dir()).append(", with its se:")
                .append(System.lineSeparator());
        b.append(String.format(Locale.ROOT, "%-" + width + "s %11s", "group", "respondents"));
        for (Fit f : fits.subList(1, fits.size())) {
            b.append(String.format(Locale.ROOT, "  %22s", f.dir()));
        }
        b.append(System.lineSeparator());
        for (int g = 0; g < first.size(); g++) {
            b.append(String.format(Locale.ROOT, "%-" + width + "s %11d", labels.get(g), first.get(g).respondents()));
            for (Fit f : fits.subList(1, fits.size())) {
                GroupDifference d = f.byGroup().get(g);
                // a group of one respondent has no standard error (the formula divides by n - 1)
                String se = Double.isNaN(d.differenceSe()) ? "no se" : String.format(Locale.ROOT, "%.1f", d.differenceSe());
                b.append(String.format(Locale.ROOT, "  %22s", String.format(Locale.ROOT, "%.1f (%s)", d.difference(), se)));
            }
            b.append(System.lineSeparator());
        }
        return b.toString();
    }

    /** The comparison as a table and a sentence on how to read it. */
    public static String format(List<Fit> fits) {
        StringBuilder b = new StringBuilder();
        int width = Math.max(3, fits.stream().mapToInt(f -> f.dir().toString().length()).max().orElse(3));
        b.append(String.format(Locale.ROOT, "%-" + width + "s %12s %8s %8s %12s %8s %6s  %s%n", "fit", "elpd_loo", "se", "p_loo",
                "elpd_diff", "se_diff", "k>0.7", "model"));
        for (Fit f : fits) {
            b.append(String.format(Locale.ROOT, "%-" + width + "s %12.1f %8.1f %8.1f %12.1f %8.1f %6d  %s%n", f.dir(), f.elpd(),
                    f.se(), f.effective(), f.difference(), f.differenceSe(), f.unreliable(), f.model()));
        }
        Fit best = fits.get(0);
        b.append("Best predicted: " + best.dir() + ". elpd_diff is each fit's elpd_loo minus the best's, respondent by"
                + " respondent (paired by the file's row); a difference within about 2 se_diff, or of a few units, does not"
                + " tell the models apart (common practice; Vehtari, Gelman & Gabry 2017 discuss the standard error).");
        b.append(System.lineSeparator());
        List<String> unconverged = fits.stream().filter(f -> !f.converged()).map(f -> f.dir().toString()).toList();
        if (!unconverged.isEmpty()) {
            b.append("Not converged: " + String.join(", ", unconverged) + " (summary.csv flags parameters, the fit was"
                    + " interrupted, or summary.csv is missing); their elpd_loo may change with longer chains: run them"
                    + " longer, as each fit's console or report says, before reading this comparison.");
            b.append(System.lineSeparator());
        }
        if (fits.stream().anyMatch(f -> f.unreliable() > 0)) {
            b.append("Some respondents have Pareto k above 0.7, where the importance sampling is unreliable; read those fits'"
                    + " figures with care (their cross_validation.csv lists the respondents).");
            b.append(System.lineSeparator());
        }
        return b.toString();
    }

    /** One fit folder's pointwise values, in the order of the file's rows. */
    private static final class Pointwise {
        final Path dir;
        final String sha256;
        /** The rating column as given to the fit, or null when run.json does not name it (a demo). */
        final String rating;
        final String scale;
        final String model;
        final int[] row;
        final double[] elpd;
        final double[] effective;
        final double[] paretoK;
        final double[] mcse;
        /** Each respondent's group, numbered in order of first appearance, and the labels. */
        final int[] group;
        final List<String> labels;

        private Pointwise(Path dir, String sha256, String rating, String scale, String model, int[] row, double[] elpd,
                double[] effective, double[] paretoK, double[] mcse, int[] group, List<String> labels) {
            this.dir = dir;
            this.sha256 = sha256;
            this.rating = rating;
            this.scale = scale;
            this.model = model;
            this.row = row;
            this.elpd = elpd;
            this.effective = effective;
            this.paretoK = paretoK;
            this.mcse = mcse;
            this.group = group;
            this.labels = labels;
        }

        static Pointwise read(Path dir) throws IOException {
            Path runFile = dir.resolve("run.json");
            if (!Files.isRegularFile(runFile)) {
                throw new IOException(dir + " is not a fit folder: run.json is missing");
            }
            Object run = Json.read(runFile);
            Path file = dir.resolve(FILE);
            if (!Files.isRegularFile(file)) {
                throw new IOException(dir + " holds no " + FILE + ": the fit ran without --cross-validate; fit it again with"
                        + " --cross-validate");
            }
            Object sha = Json.at(run, "input.sha256");
            if (!(sha instanceof String)) {
                throw new IOException(runFile + ": no input.sha256; expected the run record of a fit");
            }
            Object scale = Json.at(run, "input.scale");
            if (!(scale instanceof String)) {
                throw new IOException(runFile + ": no input.scale; expected the run record of a fit");
            }
            Object rating = Json.at(run, "options.rating");
            int capacity = 1 << 12;
            int[] row = new int[capacity];
            double[] elpd = new double[capacity];
            double[] effective = new double[capacity];
            double[] paretoK = new double[capacity];
            double[] mcse = new double[capacity];
            int[] group = new int[capacity];
            Map<String, Integer> groupIndex = new LinkedHashMap<>();
            int n = 0;
            try (BufferedReader in = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
                String header = in.readLine();
                if (header == null || !header.startsWith("row,rating,elpd_loo,p_loo,pareto_k,mcse_elpd_loo")) {
                    throw new IOException(file + ", row 1: expected the header row,rating,elpd_loo,p_loo,pareto_k,"
                            + "mcse_elpd_loo,group");
                }
                int line = 1;
                for (String text = in.readLine(); text != null; text = in.readLine()) {
                    line++;
                    String[] field = text.split(",", 7);
                    if (n == row.length) {
                        int grown = 2 * n;
                        row = Arrays.copyOf(row, grown);
                        elpd = Arrays.copyOf(elpd, grown);
                        effective = Arrays.copyOf(effective, grown);
                        paretoK = Arrays.copyOf(paretoK, grown);
                        mcse = Arrays.copyOf(mcse, grown);
                        group = Arrays.copyOf(group, grown);
                    }
                    try {
                        row[n] = Integer.parseInt(field[0]);
                        elpd[n] = Double.parseDouble(field[2]);
                        effective[n] = Double.parseDouble(field[3]);
                        paretoK[n] = Double.parseDouble(field[4]);
                        mcse[n] = Double.parseDouble(field[5]);
                        group[n] = groupIndex.computeIfAbsent(unquote(field[6]), label -> groupIndex.size());
                    } catch (NumberFormatException | ArrayIndexOutOfBoundsException e) {
                        throw new IOException(file + ", row " + line + ": expected a row number and five numbers before the"
                                + " group, got " + text);
                    }
                    if (n > 0 && row[n] <= row[n - 1]) {
                        throw new IOException(file + ", row " + line + ": the rows are not in increasing order (" + row[n]
                                + " after " + row[n - 1] + ")");
                    }
                    n++;
                }
            }
            if (n == 0) {
                throw new IOException(file + ": no respondents after the header");
            }
            return new Pointwise(dir, (String) sha, rating instanceof String r ? r : null, (String) scale, model(run),
                    Arrays.copyOf(row, n), Arrays.copyOf(elpd, n), Arrays.copyOf(effective, n), Arrays.copyOf(paretoK, n), Arrays.copyOf(mcse, n), Arrays.copyOf(group, n),
                    List.copyOf(groupIndex.keySet()));
        }

        /** A field as CsvField.quote wrote it, back to its text (labels hold no line breaks: SurveyReader refuses them). */
        private static String unquote(String field) {
            return field.length() >= 2 && field.startsWith("\"") && field.endsWith("\"")
                    ? field.substring(1, field.length() - 1).replace("\"\"", "\"") : field;
        }

        /**
         * The model's switches from run.json, in a few words, then what else may differ between fits
         * of the same rows when the fit has it: the level's covariates (by source column), the style
         * covariates and the priors given, control characters escaped.
         */
        private static String model(Object run) {
            StringBuilder b = new StringBuilder();
            b.append("style classes ").append(Json.at(run, "model.style_classes"))
                    .append(", attraction ").append(Json.at(run, "model.attraction"))
                    .append(", thresholds ").append(Json.at(run, "model.thresholds"));
            List<String> level = new ArrayList<>();
            if (Json.at(run, "model.level_covariates") instanceof Map<?, ?> covariates) {
                for (Map.Entry<?, ?> c : covariates.entrySet()) {
                    Object source = Json.at(c.getValue(), "source_column");
                    String name = String.valueOf(source != null ? source : c.getKey());
                    if (!level.contains(name)) {
                        level.add(name);
                    }
                }
            }
            appendList(b, "level covariates", level);
            appendList(b, "style covariates", Json.at(run, "options.style"));
            appendList(b, "priors", Json.at(run, "options.prior"));
            return Json.escape(b.toString(), Integer.MAX_VALUE);
        }

        private static void appendList(StringBuilder b, String what, Object list) {
            if (list instanceof List<?> items && !items.isEmpty()) {
                b.append(", ").append(what).append(' ');
                for (int i = 0; i < items.size(); i++) {
                    b.append(i > 0 ? "," : "").append(items.get(i));
                }
            }
        }

        void checkComparable(Pointwise other) throws IOException {
            if (!sha256.equals(other.sha256)) {
                throw new IOException(dir + " and " + other.dir + " were fitted to different files (SHA-256 "
                        + Json.escape(sha256) + " and " + Json.escape(other.sha256) + "); compare fits of the same file");
            }
            if (rating != null && other.rating != null && !rating.equals(other.rating)) {
                throw new IOException(dir + " and " + other.dir + " predict different rating columns (--rating "
                        + Json.quote(rating) + " and " + Json.quote(other.rating) + "); compare fits of the same rating"
                        + " column");
            }
            if (!scale.equals(other.scale)) {
                throw new IOException(dir + " and " + other.dir + " read the ratings on different scales (--scale "
                        + Json.quote(scale) + " and " + Json.quote(other.scale) + "); compare fits on the same scale");
            }
            if (!Arrays.equals(row, other.row)) {
                int onlyHere = 0;
                int onlyThere = 0;
                int i = 0;
                int j = 0;
                int firstDiffering = -1;
                while (i < row.length || j < other.row.length) {
                    if (j == other.row.length || i < row.length && row[i] < other.row[j]) {
                        firstDiffering = firstDiffering < 0 ? row[i] : firstDiffering;
                        onlyHere++;
                        i++;
                    } else if (i == row.length || other.row[j] < row[i]) {
                        firstDiffering = firstDiffering < 0 ? other.row[j] : firstDiffering;
                        onlyThere++;
                        j++;
                    } else {
                        i++;
                        j++;
                    }
                }
                throw new IOException(dir + " and " + other.dir + " used different rows of the file (" + rows(onlyHere)
                        + " only in the first, " + rows(onlyThere) + " only in the second, the first of them row "
                        + firstDiffering + "), as happens when a covariate that one fit uses is missing in some rows;"
                        + " compare fits of the same rows");
            }
        }

        private static String rows(int count) {
            return count + (count == 1 ? " row" : " rows");
        }

        double total() {
            return LeaveOneOut.total(elpd);
        }

        double mcse() {
            return LeaveOneOut.combinedMcse(mcse);
        }

        int unreliable() {
            int count = 0;
            for (double k : paretoK) {
                count += k > LeaveOneOut.RELIABLE_K ? 1 : 0;
            }
            return count;
        }
    }
}
