package org.rungs.posteriors.report;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.DrawsCsv;

/**
 * The files of a fit folder that the report reads. run.json and summary.csv are required; the
 * others are null when absent (the component was off or the quantity not computed).
 */
record FitFolder(Path dir, Object run, CsvTable summary, Draws draws, CsvTable groups, CsvTable distributions,
        CsvTable coarseShares, CsvTable coefficients, CsvTable attraction) {

    static FitFolder read(Path dir) throws IOException {
        Path runFile = dir.resolve("run.json");
        Path summaryFile = dir.resolve("summary.csv");
        for (Path required : List.of(runFile, summaryFile)) {
            if (!Files.isRegularFile(required)) {
                throw new IOException(dir + " is not a fit folder: " + required.getFileName() + " is missing");
            }
        }
        Object run = Json.read(runFile);
        if (!(run instanceof Map)) {
            throw new IOException(runFile.toAbsolutePath() + ": expected a JSON object, the run record of a fit");
        }
        Path drawsFile = dir.resolve("draws.csv");
        return new FitFolder(dir, run, CsvTable.read(summaryFile),
                Files.isRegularFile(drawsFile) ? DrawsCsv.read(drawsFile) : null,
                CsvTable.readIfPresent(dir.resolve("groups.csv")),
                CsvTable.readIfPresent(dir.resolve("distributions.csv")),
                CsvTable.readIfPresent(dir.resolve("coarse_shares.csv")),
                CsvTable.readIfPresent(dir.resolve("coefficients.csv")),
                CsvTable.readIfPresent(dir.resolve("attraction.csv")));
    }

    /** Text at a dotted path of run.json, or the fallback when absent. */
    String text(String path, String fallback) {
        Object value = Json.at(run, path);
        if (value == null) {
            return fallback;
        }
        if (value instanceof Double d && d == Math.rint(d) && Math.abs(d) < 1e15) {
            return Long.toString(d.longValue());
        }
        return value.toString();
    }

    /** Number at a dotted path of run.json, or NaN when absent or not a number. */
    double number(String path) {
        return Json.at(run, path) instanceof Double d ? d : Double.NaN;
    }

    boolean flag(String path) {
        return Boolean.TRUE.equals(Json.at(run, path));
    }

    /** Map at a dotted path of run.json; empty when absent. */
    @SuppressWarnings("unchecked")
    Map<String, Object> map(String path) {
        return Json.at(run, path) instanceof Map<?, ?> m ? (Map<String, Object>) m : Map.of();
    }

    /** List at a dotted path of run.json; empty when absent. */
    @SuppressWarnings("unchecked")
    List<Object> list(String path) {
        return Json.at(run, path) instanceof List<?> l ? (List<Object>) l : List.of();
    }
}
