package org.rungs.posteriors;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * Draws as CSV: header {@code chain,iteration,<names...>}, one row per draw, chain and
 * iteration 1-based, chain after chain. Numbers are written as by {@link Double#toString(double)}
 * (shortest text that reads back to the same double), so a file reads back exactly.
 */
public final class DrawsCsv {
    private static final String CHAIN = "chain";
    private static final String ITERATION = "iteration";

    private DrawsCsv() {
    }

    /** Writes all draws, atomically (temporary file in the same folder, then rename). */
    public static void write(Draws draws, Path file) throws IOException {
        write(draws, null, file);
    }

    /**
     * As {@link #write(Draws, Path)}, with {@code iterations[i]} in the iteration column of each
     * chain's i-th draw (a subset's draws keep the numbers they have in the whole), or 1, 2, ...
     * when it is null. Such a file reads back with {@link #read} only when the numbers are 1, 2, ...
     */
    public static void write(Draws draws, int[] iterations, Path file) throws IOException {
        if (iterations != null && iterations.length != draws.iterations()) {
            throw new IllegalArgumentException(iterations.length + " iteration numbers for " + draws.iterations() + " draws per chain");
        }
        AtomicFiles.write(file, out -> {
            StringBuilder line = new StringBuilder(CHAIN).append(',').append(ITERATION);
            for (String name : draws.names()) {
                line.append(',').append(CsvField.quote(name));
            }
            out.append(line).append('\n');
            int parameters = draws.parameterCount();
            int perChain = draws.iterations();
            for (int c = 0; c < draws.chains(); c++) {
                for (int i = 0; i < perChain; i++) {
                    line.setLength(0);
                    line.append(c + 1).append(',').append(iterations == null ? i + 1 : iterations[i]);
                    int position = c * perChain + i;
                    for (int p = 0; p < parameters; p++) {
                        line.append(',').append(draws.column(p)[position]);
                    }
                    out.append(line).append('\n');
                }
            }
        });
    }

    /**
     * Reads draws written by {@link #write}. Rows may come in any order but must cover every
     * (chain, iteration) pair of the grid exactly once; the counts are the largest indices seen.
     *
     * @throws IOException naming the line and column of the first malformed entry
     */
    public static Draws read(Path file) throws IOException {
        try (Csv csv = Csv.open(file)) {
            List<String> header = csv.next();
            if (header == null) {
                throw new IOException(file + ": the file is empty; expected a header chain,iteration,<names...>");
            }
            if (header.size() < 2 || !header.get(0).equals(CHAIN) || !header.get(1).equals(ITERATION)) {
                throw csv.fault("the header must start with chain,iteration; got " + String.join(",", header));
            }
            List<String> names = List.copyOf(header.subList(2, header.size()));
            Set<String> seen = new HashSet<>();
            for (int p = 0; p < names.size(); p++) {
                if (!seen.add(names.get(p))) {
                    throw csv.fault("column " + (p + 3) + ": duplicate parameter name '" + names.get(p) + "'");
                }
            }
            return readRows(csv, file, names);
        }
    }

    private static Draws readRows(Csv csv, Path file, List<String> names) throws IOException {
        int parameters = names.size();
        int rows = 0;
        int[] chainOf = new int[1024];
        int[] iterationOf = new int[1024];
        int[] lineOf = new int[1024];
        double[] values = new double[1024 * Math.max(parameters, 1)];
        List<String> fields;
        while ((fields = csv.next()) != null) {
            if (fields.size() != parameters + 2) {
                throw csv.fault("expected " + (parameters + 2) + " fields, got " + fields.size());
            }
            if (rows == chainOf.length) {
                int grown = 2 * rows;
                chainOf = Arrays.copyOf(chainOf, grown);
                iterationOf = Arrays.copyOf(iterationOf, grown);
                lineOf = Arrays.copyOf(lineOf, grown);
                values = Arrays.copyOf(values, grown * Math.max(parameters, 1));
            }
            chainOf[rows] = positiveIndex(csv, fields.get(0), 1, CHAIN);
            iterationOf[rows] = positiveIndex(csv, fields.get(1), 2, ITERATION);
            lineOf[rows] = csv.recordLine();
            for (int p = 0; p < parameters; p++) {
                String text = fields.get(p + 2);
                try {
                    values[rows * parameters + p] = Double.parseDouble(text);
                } catch (NumberFormatException e) {
                    throw csv.fault("column " + (p + 3) + " (" + names.get(p) + "): '" + text + "' is not a number");
                }
            }
            rows++;
        }
        if (rows == 0) {
            throw new IOException(file + ": no draws after the header");
        }
        int chains = 0;
        int iterations = 0;
        for (int r = 0; r < rows; r++) {
            chains = Math.max(chains, chainOf[r]);
            iterations = Math.max(iterations, iterationOf[r]);
        }
        if ((long) chains * iterations > rows) {
            throw new IOException(file + ": " + rows + " rows cannot fill the grid of " + chains + " chains x "
                    + iterations + " iterations given by the largest indices");
        }
        Draws draws = new Draws(names, chains, iterations);
        boolean[] filled = new boolean[chains * iterations];
        for (int r = 0; r < rows; r++) {
            int position = (chainOf[r] - 1) * iterations + iterationOf[r] - 1;
            if (filled[position]) {
                throw new IOException(file + ": line " + lineOf[r] + ": chain " + chainOf[r] + " iteration "
                        + iterationOf[r] + " appears twice");
            }
            filled[position] = true;
            for (int p = 0; p < parameters; p++) {
                draws.column(p)[position] = values[r * parameters + p];
            }
        }
        return draws;
    }

    private static int positiveIndex(Csv csv, String text, int column, String what) throws IOException {
        try {
            int index = Integer.parseInt(text);
            if (index >= 1) {
                return index;
            }
        } catch (NumberFormatException e) {
            // reported below with the position
        }
        throw csv.fault("column " + column + " (" + what + "): '" + text + "' is not a positive integer");
    }
}
