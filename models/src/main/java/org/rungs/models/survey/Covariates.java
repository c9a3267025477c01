package org.rungs.models.survey;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * Covariate columns on the internal scale of MODEL.md section 1: a numeric column is centred and
 * divided by its sample standard deviation (denominator n-1); a categorical column becomes 0/1
 * indicators against a reference level, not scaled. A coefficient per internal unit divided by
 * {@link #scale(int)} is per unit of the user's column.
 */
public final class Covariates {

    /** Largest magnitude of a raw numeric value: squares and sums of squares stay finite. */
    public static final double MAX_MAGNITUDE = 1e150;
    /** Smallest standard deviation of a numeric covariate: per-unit effects are divided by it. */
    public static final double MIN_SPREAD = 1e-150;

    private static final Covariates NONE = new Covariates(0, new String[0], new double[0][], new boolean[0],
            new String[0], new double[0], new double[0], new String[0]);

    private final int rows;
    private final String[] names;
    private final double[][] columns;
    private final boolean[] indicator;
    private final String[] sourceColumns;
    private final double[] centres;
    private final double[] scales;
    private final String[] referenceLevels;

    private Covariates(int rows, String[] names, double[][] columns, boolean[] indicator, String[] sourceColumns,
            double[] centres, double[] scales, String[] referenceLevels) {
        this.rows = rows;
        this.names = names;
        this.columns = columns;
        this.indicator = indicator;
        this.sourceColumns = sourceColumns;
        this.centres = centres;
        this.scales = scales;
        this.referenceLevels = referenceLevels;
    }

    /** The empty set. */
    public static Covariates none() {
        return NONE;
    }

    /**
     * Standardised numeric columns.
     *
     * @throws IllegalArgumentException for a value that is not finite or exceeds
     *     {@link #MAX_MAGNITUDE}, a constant column, or exactly collinear columns (named)
     */
    public static Covariates fromNumeric(List<String> names, List<double[]> rawColumns) {
        if (names.size() != rawColumns.size()) {
            throw new IllegalArgumentException(names.size() + " names for " + rawColumns.size() + " columns");
        }
        Builder builder = builder();
        for (int j = 0; j < names.size(); j++) {
            builder.numeric(names.get(j), rawColumns.get(j));
        }
        return builder.build();
    }

    /** A builder that mixes numeric and categorical columns; the rank check covers all of them. */
    public static Builder builder() {
        return new Builder();
    }

    /** Number of internal columns (a categorical column with K levels gives K-1). */
    public int count() {
        return names.length;
    }

    /** Number of rows; 0 for {@link #none()}. */
    public int rows() {
        return rows;
    }

    /** The column name for a numeric column, {@code column=level} for an indicator. */
    public String name(int j) {
        return names[j];
    }

    /** Internal values of column j: the stored array, read-only by contract (not copied for speed). */
    public double[] column(int j) {
        return columns[j];
    }

    /** Whether column j is a 0/1 indicator of a categorical level. */
    public boolean isIndicator(int j) {
        return indicator[j];
    }

    /** The file column column j comes from. */
    public String sourceColumn(int j) {
        return sourceColumns[j];
    }

    /** Value subtracted from the user's column: its mean; 0 for indicators. */
    public double centre(int j) {
        return centres[j];
    }

    /** Divisor applied after centring: the sample sd (n-1); 1 for indicators. */
    public double scale(int j) {
        return scales[j];
    }

    /** The reference level of an indicator's categorical column; null for a numeric column. */
    public String referenceLevel(int j) {
        return referenceLevels[j];
    }

    @Override
    public String toString() {
        return "Covariates" + Arrays.toString(names);
    }

    /** The same covariates with rows reordered: row r of the result is row {@code order[r]} of this. */
    public Covariates permuted(int[] order) {
        if (columns.length == 0) {
            return this;
        }
        if (order.length != rows) {
            throw new IllegalArgumentException("a reordering of " + rows + " rows needs " + rows + " positions, got " + order.length);
        }
        double[][] moved = new double[columns.length][];
        for (int j = 0; j < columns.length; j++) {
            double[] from = columns[j];
            double[] to = new double[rows];
            for (int r = 0; r < rows; r++) {
                to[r] = from[order[r]];
            }
            moved[j] = to;
        }
        return new Covariates(rows, names, moved, indicator, sourceColumns, centres, scales, referenceLevels);
    }

    /** Collects raw columns; {@link #build()} standardises them and checks the rank of {@code [1, X]}. */
    public static final class Builder {
        private final List<Source> sources = new ArrayList<>();

        private Builder() {
        }

        /** A numeric column, raw values on the user's scale (the array is not kept). */
        public Builder numeric(String name, double[] raw) {
            sources.add(new Source(name, raw.clone(), null, null, null));
            return this;
        }

        /**
         * A categorical column given as codes {@code 0..levels.size()-1} into {@code levels}. Every
         * level must occur. The reference is {@code referenceLevel} when not null, else the most
         * frequent level, ties broken by first appearance; one indicator per other level follows,
         * in order of first appearance.
         */
        public Builder categorical(String name, int[] levelCodes, List<String> levels, String referenceLevel) {
            sources.add(new Source(name, null, levelCodes.clone(), List.copyOf(levels), referenceLevel));
            return this;
        }

        /**
         * @throws IllegalArgumentException for unequal lengths, a repeated name, a value that is not
         *     finite or exceeds {@link #MAX_MAGNITUDE}, a constant column, an unknown reference level
         *     or exactly collinear columns (named in the message)
         */
        public Covariates build() {
            if (sources.isEmpty()) {
                return NONE;
            }
            int n = sources.get(0).rows();
            List<String> names = new ArrayList<>();
            List<double[]> columns = new ArrayList<>();
            List<String> sourceNames = new ArrayList<>();
            List<String> references = new ArrayList<>();
            List<double[]> moments = new ArrayList<>();
            Set<String> seen = new HashSet<>();
            for (Source source : sources) {
                String name = source.name();
                if (name == null || !seen.add(name)) {
                    throw new IllegalArgumentException("covariate name " + name + " is null or repeated");
                }
                if (source.rows() != n) {
                    throw new IllegalArgumentException("covariate " + Text.quote(name) + " has " + source.rows()
                            + " rows; the first covariate has " + n);
                }
                if (source.raw() != null) {
                    double[] raw = source.raw();
                    double[] centreAndScale = standardise(name, raw);
                    names.add(name);
                    columns.add(raw);
                    sourceNames.add(name);
                    references.add(null);
                    moments.add(centreAndScale);
                } else {
                    int[] codes = source.codes();
                    List<String> levels = source.levels();
                    int[] order = indicatorOrder(name, codes, levels, source.referenceLevel());
                    for (int k = 1; k < order.length; k++) {
                        int level = order[k];
                        double[] column = new double[n];
                        for (int i = 0; i < n; i++) {
                            column[i] = codes[i] == level ? 1 : 0;
                        }
                        names.add(name + "=" + levels.get(level));
                        columns.add(column);
                        sourceNames.add(name);
                        references.add(levels.get(order[0]));
                        moments.add(null);
                    }
                }
            }
            double[][] internal = columns.toArray(new double[0][]);
            int[] dependence = LimitedPivotingGramSchmidt.firstDependence(internal);
            if (dependence.length > 0) {
                throw collinear(dependence, names, sourceNames);
            }
            int p = names.size();
            boolean[] isIndicator = new boolean[p];
            double[] centre = new double[p];
            double[] scale = new double[p];
            for (int j = 0; j < p; j++) {
                double[] m = moments.get(j);
                isIndicator[j] = m == null;
                centre[j] = m == null ? 0 : m[0];
                scale[j] = m == null ? 1 : m[1];
            }
            return new Covariates(n, names.toArray(new String[0]), internal, isIndicator,
                    sourceNames.toArray(new String[0]), centre, scale, references.toArray(new String[0]));
        }
    }

    /** One source column: numeric ({@code raw}, a private copy) or categorical ({@code codes}, {@code levels}). */
    private record Source(String name, double[] raw, int[] codes, List<String> levels, String referenceLevel) {
        int rows() {
            return raw != null ? raw.length : codes.length;
        }
    }

    /**
     * Standardises {@code raw} in place; returns its mean and sample sd (n-1), by the corrected
     * two-pass algorithm. Rejects bad or constant columns.
     */
    private static double[] standardise(String name, double[] raw) {
        int n = raw.length;
        for (int i = 0; i < n; i++) {
            if (!(Math.abs(raw[i]) <= MAX_MAGNITUDE)) {
                throw new CovariateProblem(name, "value " + raw[i] + " at index " + i + " of covariate "
                        + Text.quote(name) + " is not finite or exceeds " + MAX_MAGNITUDE + " in magnitude",
                        "finite numbers of magnitude at most " + MAX_MAGNITUDE);
            }
        }
        boolean constant = true;
        for (int i = 1; i < n && constant; i++) {
            constant = raw[i] == raw[0];
        }
        if (constant) {
            throw constant(name, n == 0 ? "no rows" : "the single value " + format(raw[0]));
        }
        // work on raw * 2^k with the largest magnitude near 1: exact, and squares of tiny values
        // (1e-200, or subnormal ones) no longer underflow to a zero spread
        double largest = 0;
        for (double v : raw) {
            largest = Math.max(largest, Math.abs(v));
        }
        int k = -Math.getExponent(largest);
        double sum = 0;
        for (double v : raw) {
            sum += Math.scalb(v, k);
        }
        double mean = sum / n;
        double correction = 0;
        for (double v : raw) {
            correction += Math.scalb(v, k) - mean;
        }
        mean += correction / n;
        double squares = 0;
        for (double v : raw) {
            double d = Math.scalb(v, k) - mean;
            squares += d * d;
        }
        double sd = Math.sqrt(squares / (n - 1));
        double spread = Math.scalb(sd, -k);
        if (!(spread >= MIN_SPREAD)) {
            throw new CovariateProblem(name, "covariate " + Text.quote(name) + " varies by less than " + MIN_SPREAD
                    + " (standard deviation " + spread + "), so its effects per unit would overflow",
                    "a spread of at least " + MIN_SPREAD + " (rescale the column)");
        }
        for (int i = 0; i < n; i++) {
            raw[i] = (Math.scalb(raw[i], k) - mean) / sd;
        }
        return new double[] {Math.scalb(mean, -k), Math.scalb(sd, -k)};
    }

    /** Level indices: the reference first, then the other levels in order of first appearance. */
    private static int[] indicatorOrder(String name, int[] codes, List<String> levels, String referenceLevel) {
        int k = levels.size();
        if (new HashSet<>(levels).size() != k) {
            throw new IllegalArgumentException("levels of " + Text.quote(name) + " repeat: " + levels);
        }
        long[] counts = new long[k];
        int[] first = new int[k];
        Arrays.fill(first, -1);
        for (int i = 0; i < codes.length; i++) {
            int c = codes[i];
            if (c < 0 || c >= k) {
                throw new IllegalArgumentException("code " + c + " at index " + i + " of " + Text.quote(name)
                        + " is outside 0.." + (k - 1));
            }
            if (counts[c]++ == 0) {
                first[c] = i;
            }
        }
        for (int level = 0; level < k; level++) {
            if (counts[level] == 0) {
                throw new IllegalArgumentException("level " + Text.quote(levels.get(level)) + " of " + Text.quote(name)
                        + " does not occur");
            }
        }
        if (k < 2) {
            throw constant(name, k == 0 ? "no rows" : "the single level " + Text.quote(levels.get(0)));
        }
        Integer[] byAppearance = new Integer[k];
        for (int level = 0; level < k; level++) {
            byAppearance[level] = level;
        }
        Arrays.sort(byAppearance, (a, b) -> Integer.compare(first[a], first[b]));
        int reference;
        if (referenceLevel != null) {
            reference = levels.indexOf(referenceLevel);
            if (reference < 0) {
                throw new CovariateProblem(name, "the reference level " + Text.quote(referenceLevel)
                        + " of " + Text.quote(name) + " does not occur among its levels " + Text.quoteAll(levels),
                        "one of the levels found");
            }
        } else {
            reference = byAppearance[0];
            for (int level : byAppearance) {
                if (counts[level] > counts[reference]) {
                    reference = level;
                }
            }
        }
        int[] order = new int[k];
        order[0] = reference;
        int next = 1;
        for (int level : byAppearance) {
            if (level != reference) {
                order[next++] = level;
            }
        }
        return order;
    }

    private static CovariateProblem constant(String name, String what) {
        return new CovariateProblem(name, "covariate " + Text.quote(name) + " is constant (" + what
                + " in the rows used), so its coefficient cannot be told apart from the intercept",
                "a covariate that varies; drop the column");
    }

    private static CovariateProblem collinear(int[] dependence, List<String> names, List<String> sources) {
        String dependent = names.get(dependence[0]);
        if (dependence.length == 1) {
            return new CovariateProblem(sources.get(dependence[0]), "covariate " + Text.quote(dependent)
                    + " is constant after the columns before it are accounted for",
                    "a covariate that varies; drop the column");
        }
        List<String> others = new ArrayList<>();
        for (int m = 1; m < dependence.length; m++) {
            others.add(names.get(dependence[m]));
        }
        List<String> all = new ArrayList<>(others);
        all.add(dependent);
        return new CovariateProblem(sources.get(dependence[0]), "covariates " + Text.quoteAll(all)
                + " are exactly collinear: with the intercept, " + Text.quote(dependent)
                + " is a linear combination of " + Text.quoteAll(others)
                + " (residual below " + LimitedPivotingGramSchmidt.TOLERANCE + " of its spread)",
                "linearly independent covariates; drop one of the named columns");
    }

    private static String format(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
