package org.rungs.models.survey;

import java.util.HashSet;
import java.util.List;
import java.util.Objects;

/**
 * The data of MODEL.md section 1 as primitive columns, one entry per respondent: the rating as
 * its position on the scale, the group index, covariates on the internal scale and optional
 * weights. The arrays returned are the stored ones, read-only by contract (not copied, so that
 * sampler loops read them directly).
 */
public final class Survey {
    private final Scale scale;
    private final byte[] category;
    private final int[] group;
    private final List<String> groupLabels;
    private final int[] groupSizes;
    private final Covariates level;
    private final Covariates style;
    private final double[] weight;
    private final Exclusions exclusions;
    /** Each respondent's row in the file it was read from (1-based, the header being row 1); null in memory. */
    private final int[] row;

    private Survey(Scale scale, byte[] category, int[] group, List<String> groupLabels, Covariates level,
            Covariates style, double[] weight, Exclusions exclusions, int[] row) {
        this.scale = Objects.requireNonNull(scale, "scale");
        this.category = Objects.requireNonNull(category, "category");
        this.group = Objects.requireNonNull(group, "group");
        this.groupLabels = List.copyOf(groupLabels);
        this.level = Objects.requireNonNull(level, "level");
        this.style = Objects.requireNonNull(style, "style");
        this.weight = weight;
        this.exclusions = Objects.requireNonNull(exclusions, "exclusions");
        this.row = row;
        int n = category.length;
        if (n == 0) {
            throw new IllegalArgumentException("a survey needs at least one respondent");
        }
        if (group.length != n || (weight != null && weight.length != n) || (row != null && row.length != n)) {
            throw new IllegalArgumentException("columns differ in length: " + n + " categories, " + group.length
                    + " groups" + (weight == null ? "" : ", " + weight.length + " weights")
                    + (row == null ? "" : ", " + row.length + " file rows"));
        }
        for (Covariates c : List.of(level, style)) {
            if (c.count() > 0 && c.rows() != n) {
                throw new IllegalArgumentException("covariates " + c + " have " + c.rows() + " rows, not " + n);
            }
        }
        if (new HashSet<>(this.groupLabels).size() != this.groupLabels.size()) {
            throw new IllegalArgumentException("group labels repeat: " + groupLabels);
        }
        int groups = this.groupLabels.size();
        int m = scale.categories();
        groupSizes = new int[groups];
        double[] groupWeight = new double[groups];
        for (int i = 0; i < n; i++) {
            if (category[i] < 0 || category[i] >= m) {
                throw new IllegalArgumentException("category " + category[i] + " at index " + i + " is outside 0.."
                        + (m - 1) + " for the scale " + scale);
            }
            int g = group[i];
            if (g < 0 || g >= groups) {
                throw new IllegalArgumentException("group " + g + " at index " + i + " is outside 0.." + (groups - 1));
            }
            groupSizes[g]++;
            if (weight != null) {
                if (!(weight[i] >= 0) || weight[i] == Double.POSITIVE_INFINITY) {
                    throw new IllegalArgumentException("weight " + weight[i] + " at index " + i
                            + " is negative or not finite");
                }
                groupWeight[g] += weight[i];
            }
        }
        for (int g = 0; g < groups; g++) {
            if (groupSizes[g] == 0) {
                throw new IllegalArgumentException("group " + Text.quote(this.groupLabels.get(g)) + " has no rows");
            }
            // population summaries (MODEL.md section 6) divide by a group's total weight
            if (weight != null && !(groupWeight[g] > 0)) {
                throw new IllegalArgumentException("the weights of group " + Text.quote(this.groupLabels.get(g))
                        + " sum to zero");
            }
        }
    }

    /**
     * An in-memory survey; the arrays are taken over, not copied. Every group index in
     * {@code 0..groupLabels.size()-1} must occur; weights (null when unweighted) must be finite,
     * non-negative and have a positive sum in every group.
     */
    public static Survey of(Scale scale, byte[] category, int[] group, List<String> groupLabels, Covariates level,
            Covariates style, double[] weight) {
        return new Survey(scale, category, group, groupLabels, level, style, weight,
                Exclusions.none(category.length), null);
    }

    static Survey read(Scale scale, byte[] category, int[] group, List<String> groupLabels, Covariates level,
            Covariates style, double[] weight, Exclusions exclusions, int[] row) {
        return new Survey(scale, category, group, groupLabels, level, style, weight, exclusions, row);
    }

    /**
     * The same survey with rows reordered: row r of the result is row {@code order[r]} of this.
     * Respondents are exchangeable in the model, so the posterior does not change.
     */
    public Survey permuted(int[] order) {
        byte[] c = new byte[order.length];
        int[] g = new int[order.length];
        double[] w = weight == null ? null : new double[order.length];
        int[] at = row == null ? null : new int[order.length];
        for (int r = 0; r < order.length; r++) {
            c[r] = category[order[r]];
            g[r] = group[order[r]];
            if (w != null) {
                w[r] = weight[order[r]];
            }
            if (at != null) {
                at[r] = row[order[r]];
            }
        }
        return new Survey(scale, c, g, groupLabels, level.permuted(order), style.permuted(order), w, exclusions, at);
    }

    /** Position of each rating on the scale, {@code rating - lowest}, in 0..M-1. */
    public byte[] category() {
        return category;
    }

    /** Group index of each respondent, 0..G-1, numbered in order of first appearance in the file. */
    public int[] group() {
        return group;
    }

    /** Group labels exactly as written in the file (callers escape them on output). */
    public List<String> groupLabels() {
        return groupLabels;
    }

    public int groupCount() {
        return groupLabels.size();
    }

    /** Number of respondents per group (a copy). */
    public int[] groupSizes() {
        return groupSizes.clone();
    }

    /** Number of respondents. */
    public int size() {
        return category.length;
    }

    public Scale scale() {
        return scale;
    }

    public Covariates level() {
        return level;
    }

    public Covariates style() {
        return style;
    }

    /** Survey weights, or null when unweighted. */
    public double[] weight() {
        return weight;
    }

    public Exclusions exclusions() {
        return exclusions;
    }

    /**
     * Each respondent's row in the file it was read from, as the reader's messages number rows
     * (1-based, the header being row 1), or null for a survey built in memory.
     */
    public int[] row() {
        return row;
    }
}
