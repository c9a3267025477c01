package org.rungs.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.rungs.models.survey.Scale;

/**
 * The bad-input corpus of the models module (models/src/test/resources/survey/corpus, whose
 * manifest gives each file's exact message) run through {@code rungs fit}: every unusable file
 * exits with 2, prints its message and leaves no output; every valid but unusual one fits, records
 * its warnings in run.json and writes no NaN estimate.
 */
final class CorpusCommandLineTest {
    private static final Path CORPUS = Path.of("..", "models", "src", "test", "resources", "survey", "corpus");

    @TempDir
    Path dir;

    record Case(String file, String spec, String outcome, String expected, String warnings) {
        @Override
        public String toString() {
            return file;
        }
    }

    static Stream<Case> cases() throws IOException {
        List<Case> cases = new ArrayList<>();
        for (String line : Files.readAllLines(CORPUS.resolve("corpus.tsv"), StandardCharsets.UTF_8)) {
            if (line.startsWith("#") || line.isBlank()) {
                continue;
            }
            String[] f = line.split("\t", -1);
            cases.add(new Case(f[0], f[1], f[2], f[3], f.length > 4 ? f[4] : "-"));
        }
        return cases.stream();
    }

    /**
     * The manifest's spec column as fit options (keys as in the models module's CorpusTest). On a
     * scale of 3 points the default coarse points are the whole scale, which fit refuses
     * (ModelSpec.checkRatings); the corpus is about the reader, so there the coarse class is off.
     */
    private static List<String> options(String spec) {
        List<String> args = new ArrayList<>(List.of("--rating", "rating", "--group", "region"));
        if (!spec.equals("-")) {
            for (String option : spec.split(" ")) {
                int eq = option.indexOf('=');
                args.add("--" + option.substring(0, eq));
                args.add(option.substring(eq + 1));
                if (option.startsWith("scale=") && Scale.parse(option.substring(eq + 1)).categories() <= 3) {
                    args.addAll(List.of("--style-classes", "none"));
                }
            }
        }
        return args;
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("cases")
    void eachFileGivesItsMessageOrAFitWithItsWarnings(Case c) throws IOException {
        Path file = CORPUS.resolve(c.file());
        Path out = dir.resolve("out");
        List<String> args = new ArrayList<>(List.of("fit", file.toString()));
        args.addAll(options(c.spec()));
        args.addAll(List.of("--chains", "2", "--warmup", "30", "--draws", "30", "--seed", "1", "--threads", "1",
                "--out", out.toString()));
        CommandLineTest.Run run = CommandLineTest.rungs(args.toArray(new String[0]));
        assertFalse(run.err().contains("\tat "), "no stack trace: " + run.err());
        if (c.outcome().equals("error")) {
            assertEquals(Main.INPUT_ERROR, run.exit(), run.err());
            String expected = c.expected().replace("FILE", file.toString());
            assertTrue(run.err().contains(expected), "expected\n" + expected + "\nin\n" + run.err());
            assertTrue(!Files.exists(out) || isEmpty(out), "nothing written for " + c.file());
            return;
        }
        assertEquals(0, run.exit(), run.err());
        String record = Files.readString(out.resolve("run.json"));
        if (!c.warnings().equals("-")) {
            for (String warning : c.warnings().split(" \\| ")) {
                String inJson = warning.replace("\\", "\\\\").replace("\"", "\\\"");
                assertTrue(record.contains(inJson), "warning '" + warning + "' in run.json:\n" + record);
            }
        }
        for (String name : new String[] {"summary.csv", "groups.csv"}) {
            for (String line : Files.readAllLines(out.resolve(name))) {
                String[] cells = line.split(",");
                // The estimates (mean, sd, quantiles) must be numbers; diagnostics of 60 draws may be NaN by rule.
                for (int k = 1; k < Math.min(cells.length, 6); k++) {
                    assertFalse(cells[k].equals("NaN"), name + ": " + line);
                }
            }
        }
    }

    private static boolean isEmpty(Path folder) throws IOException {
        try (Stream<Path> s = Files.list(folder)) {
            return s.findAny().isEmpty();
        }
    }
}
