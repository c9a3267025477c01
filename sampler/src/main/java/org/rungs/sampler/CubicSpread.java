package org.rungs.sampler;

/**
 * A sum over a group's respondents of a smooth function of their level, read as a sum over
 * equally spaced nodes: each respondent's value is spread over its four nearest nodes with the
 * cubic Lagrange weights (Abramowitz & Stegun 1964, 25.2.13 with n = 4; from memory), by class
 * (full-scale, coarse) and answer, so that sum_i f(x_i) is sum_node weight f(node) up to an
 * error of order spacing^4 times f''''. Per group at most {@link #capacity} nodes, spaced at
 * least as {@link NormaliserGrid#SPACING}; node 0 lies one spacing below the group's smallest
 * value. The first stages of the delayed-acceptance moves read it ({@link AttractionUpdate}'s
 * ridge moves, {@link AttractionTradeUpdate}).
 */
final class CubicSpread {
    /** The value that a respondent contributes, by its position in the survey order. */
    interface Values {
        double at(int i);
    }

    final int capacity;
    private final int m;
    /** Per group: the smallest value, the spacing, the number of nodes (0: no respondents). */
    final double[] low;
    final double[] spacing;
    final int[] count;
    /** At {@link #first}(g, class, answer) + node: the weights summed over the respondents. */
    final double[] weight;

    CubicSpread(int groups, int categories, int capacity) {
        this.capacity = capacity;
        this.m = categories;
        this.low = new double[groups];
        this.spacing = new double[groups];
        this.count = new int[groups];
        this.weight = new double[groups * 2 * categories * capacity];
    }

    /** Index of node 0 of group g, class (1 coarse, 0 full-scale) and answer r in {@link #weight}. */
    int first(int g, int coarseClass, int r) {
        return ((g * 2 + coarseClass) * m + r) * capacity;
    }

    /** The level at node j of group g. */
    double node(int g, int j) {
        return low[g] + (j - 1) * spacing[g];
    }

    /** Lays out group g's nodes over its respondents' values and spreads each over them. */
    void spread(ChainState s, int g, Values values) {
        int from = s.start[g * m];
        int to = s.start[(g + 1) * m];
        java.util.Arrays.fill(weight, first(g, 0, 0), first(g + 1, 0, 0), 0);
        double lowest = Double.POSITIVE_INFINITY;
        double highest = Double.NEGATIVE_INFINITY;
        for (int i = from; i < to; i++) {
            double v = values.at(i);
            lowest = Math.min(lowest, v);
            highest = Math.max(highest, v);
        }
        if (lowest > highest) {
            count[g] = 0;
            return;
        }
        double h = Math.max(NormaliserGrid.SPACING, (highest - lowest) / (capacity - 4));
        int nodes = Math.min(capacity, (int) Math.ceil((highest - lowest) / h) + 4);
        low[g] = lowest;
        spacing[g] = h;
        count[g] = nodes;
        for (int i = from; i < to; i++) {
            double x = (values.at(i) - lowest) / h;
            int j = Math.min(nodes - 4, (int) x);
            double t = x - j;
            // node j + 1 lies at low + j h: the basis on the nodes at t = -1, 0, 1, 2
            int at = first(g, s.coarse != null && s.coarse[i] == 1 ? 1 : 0, s.category[i]) + j;
            double a = t + 1;
            double b = t - 1;
            double c = t - 2;
            weight[at] -= t * b * c / 6;
            weight[at + 1] += a * b * c / 2;
            weight[at + 2] -= a * t * c / 2;
            weight[at + 3] += a * t * b / 6;
        }
    }
}
