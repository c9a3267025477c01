package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Every file of {@code survey/corpus/} as {@code corpus.tsv} says: malformed or hostile files stop
 * with exactly the message listed (the file's path written {@code FILE}); valid but unusual files
 * read, and the warnings listed are the ones their data call for.
 *
 * <p>Columns of {@code corpus.tsv}: file, spec, outcome, message or row count, warnings. The spec is
 * {@code -} for {@code rating=rating group=region scale=0..10}, or those keys overridden and
 * {@code level=}, {@code style=}, {@code categorical=}, {@code weight=}, {@code missing=},
 * {@code missing-in=COL=CODES} added, lists comma-separated, {@code group=} alone meaning no group column. Outcome {@code error} lists
 * the message; outcome {@code ok} lists {@code rows=N} and the warnings separated by {@code " | "}
 * ({@code -} for none).
 */
class CorpusTest {

    private static final Path CORPUS = SurveyFiles.resource("corpus");

    /** One line of the manifest. */
    record Case(String file, String spec, String outcome, String expected, String warnings) {
        @Override
        public String toString() {
            return file;
        }
    }

    static List<Case> manifest() {
        try {
            List<Case> cases = new ArrayList<>();
            for (String line : Files.readAllLines(CORPUS.resolve("corpus.tsv"), StandardCharsets.UTF_8)) {
                if (line.isBlank() || line.startsWith("#")) {
                    continue;
                }
                String[] f = line.split("\t", -1);
                assertEquals(5, f.length, "corpus.tsv line needs 5 tab-separated columns: " + line);
                cases.add(new Case(f[0], f[1], f[2], f[3], f[4]));
            }
            return cases;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static Stream<Arguments> cases() {
        return manifest().stream().map(Arguments::of);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("cases")
    void readsAsTheManifestSays(Case c) throws Exception {
        Path file = CORPUS.resolve(c.file());
        SurveySpec spec = spec(c.spec());
        switch (c.outcome()) {
            case "error" -> {
                SurveyInputException e = assertThrows(SurveyInputException.class, () -> SurveyReader.read(file, spec),
                        "expected an error for " + c.file());
                assertEquals(c.expected(), e.getMessage().replace(file.toString(), "FILE"));
            }
            case "ok" -> {
                Survey survey = SurveyReader.read(file, spec);
                assertEquals(c.expected(), "rows=" + survey.size());
                List<String> expected = c.warnings().equals("-") ? List.of() : Arrays.asList(c.warnings().split(" \\| "));
                assertEquals(expected, DataWarnings.of(survey));
                assertFinite(survey.level());
                assertFinite(survey.style());
            }
            default -> fail("outcome must be error or ok: " + c.outcome());
        }
    }

    @Test
    void theCorpusCoversTheIssueAndEveryFileIsListedOnce() throws IOException {
        List<String> listed = manifest().stream().map(Case::file).toList();
        Set<String> files;
        try (Stream<Path> all = Files.list(CORPUS)) {
            files = all.map(p -> p.getFileName().toString()).filter(n -> !n.equals("corpus.tsv"))
                    .collect(Collectors.toCollection(TreeSet::new));
        }
        assertEquals(files, new TreeSet<>(listed));
        assertEquals(listed.size(), new TreeSet<>(listed).size(), "a file is listed twice");
        assertTrue(listed.size() >= 30, "issue 7 asks for at least 30 files");
    }

    /** No NaN or infinity reaches the model, however odd the covariate's values. */
    static void assertFinite(Covariates covariates) {
        for (int j = 0; j < covariates.count(); j++) {
            assertTrue(Double.isFinite(covariates.centre(j)) && covariates.scale(j) > 0
                    && Double.isFinite(covariates.scale(j)), covariates.name(j));
            for (double v : covariates.column(j)) {
                assertTrue(Double.isFinite(v), covariates.name(j));
            }
        }
    }

    /** The manifest's spec column as a {@link SurveySpec}. */
    static SurveySpec spec(String text) {
        String rating = "rating";
        String group = "region";
        String scale = "0..10";
        String weight = null;
        List<String> level = List.of();
        List<String> style = List.of();
        List<String> categorical = List.of();
        List<String> missing = List.of();
        String missingIn = null;
        if (!text.equals("-")) {
            for (String option : text.split(" ")) {
                int eq = option.indexOf('=');
                String key = option.substring(0, eq);
                String value = option.substring(eq + 1);
                List<String> list = value.isEmpty() ? List.of() : List.of(value.split(","));
                switch (key) {
                    case "rating" -> rating = value;
                    case "group" -> group = value.isEmpty() ? null : value;
                    case "scale" -> scale = value;
                    case "weight" -> weight = value;
                    case "level" -> level = list;
                    case "style" -> style = list;
                    case "categorical" -> categorical = list;
                    case "missing" -> missing = list;
                    case "missing-in" -> missingIn = value;
                    default -> throw new IllegalArgumentException("unknown spec key " + key);
                }
            }
        }
        SurveySpec.Builder builder = SurveySpec.builder(rating, Scale.parse(scale)).group(group).weight(weight)
                .level(level.toArray(String[]::new)).style(style.toArray(String[]::new))
                .categorical(categorical.toArray(String[]::new)).missingCodes(missing.toArray(String[]::new));
        if (missingIn != null) {
            int eq = missingIn.indexOf('=');
            builder.missingCodesFor(missingIn.substring(0, eq), missingIn.substring(eq + 1).split(","));
        }
        return builder.build();
    }
}
