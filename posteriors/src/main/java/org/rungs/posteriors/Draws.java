package org.rungs.posteriors;

import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * Draws of named scalar parameters from several chains. Each parameter is one primitive column
 * laid out chain after chain: {@code column[chain * iterations + iteration]}, the flat layout the
 * diagnostics in {@link Convergence} work on.
 */
public final class Draws {
    private final List<String> names;
    private final Map<String, Integer> indexByName;
    private final int chains;
    private final int iterations;
    private final double[][] columns;

    public Draws(List<String> names, int chains, int iterations) {
        this(List.copyOf(names), chains, iterations, null);
    }

    private Draws(List<String> names, int chains, int iterations, double[][] columns) {
        if (chains < 1) {
            throw new IllegalArgumentException("draws need at least one chain, got " + chains);
        }
        if (iterations < 0) {
            throw new IllegalArgumentException("iterations must not be negative, got " + iterations);
        }
        if ((long) chains * iterations > Integer.MAX_VALUE) {
            throw new IllegalArgumentException(chains + " chains x " + iterations + " iterations do not fit in one column");
        }
        Map<String, Integer> index = new HashMap<>();
        for (int p = 0; p < names.size(); p++) {
            if (index.put(names.get(p), p) != null) {
                throw new IllegalArgumentException("duplicate parameter name '" + names.get(p) + "'");
            }
        }
        this.names = names;
        this.indexByName = index;
        this.chains = chains;
        this.iterations = iterations;
        this.columns = columns != null ? columns : new double[names.size()][chains * iterations];
    }

    public int chains() {
        return chains;
    }

    public int iterations() {
        return iterations;
    }

    public int parameterCount() {
        return names.size();
    }

    /** Parameter names in column order; unmodifiable. */
    public List<String> names() {
        return names;
    }

    /** Column of the named parameter, or -1 when there is none. */
    public int indexOf(String name) {
        Integer index = indexByName.get(name);
        return index == null ? -1 : index;
    }

    /** Stores one draw of every parameter, in column order. */
    public void putRow(int chain, int iteration, double[] values) {
        if (values.length != columns.length) {
            throw new IllegalArgumentException("a row needs " + columns.length + " values, got " + values.length);
        }
        int position = position(chain, iteration);
        for (int p = 0; p < columns.length; p++) {
            columns[p][position] = values[p];
        }
    }

    public void set(int parameter, int chain, int iteration, double value) {
        columns[Objects.checkIndex(parameter, columns.length)][position(chain, iteration)] = value;
    }

    public double get(int parameter, int chain, int iteration) {
        return columns[Objects.checkIndex(parameter, columns.length)][position(chain, iteration)];
    }

    /** A new chains x iterations copy of one parameter's draws. */
    public double[][] chainsOf(int parameter) {
        double[] column = columns[Objects.checkIndex(parameter, columns.length)];
        double[][] byChain = new double[chains][];
        for (int c = 0; c < chains; c++) {
            byChain[c] = Arrays.copyOfRange(column, c * iterations, (c + 1) * iterations);
        }
        return byChain;
    }

    /** A copy holding the first {@code keptIterations} draws of every chain (for an interrupted run). */
    public Draws withIterations(int keptIterations) {
        Objects.checkFromToIndex(0, keptIterations, iterations);
        double[][] kept = new double[columns.length][chains * keptIterations];
        for (int p = 0; p < columns.length; p++) {
            for (int c = 0; c < chains; c++) {
                System.arraycopy(columns[p], c * iterations, kept[p], c * keptIterations, keptIterations);
            }
        }
        return new Draws(names, chains, keptIterations, kept);
    }

    /** The live column of one parameter, chain after chain; for the diagnostics in this package. */
    double[] column(int parameter) {
        return columns[parameter];
    }

    private int position(int chain, int iteration) {
        return Objects.checkIndex(chain, chains) * iterations + Objects.checkIndex(iteration, iterations);
    }
}
