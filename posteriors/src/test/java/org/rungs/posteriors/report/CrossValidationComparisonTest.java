package org.rungs.posteriors.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The comparison of cross-validated fits on small hand-written folders: the difference and its
 * standard error against the paper's formula worked by hand (Vehtari, Gelman & Gabry 2017, eq.
 * 24: se = sqrt(n var(d_i))), and every refusal with its message.
 */
class CrossValidationComparisonTest {
    private static final String HEADER = "row,rating,elpd_loo,p_loo,pareto_k,mcse_elpd_loo,group\n";

    private static Path fit(Path dir, String name, String sha, String... rows) throws IOException {
        return recordedFit(dir, name, sha, "rating", "0..10", "", rows);
    }

    /** A fit folder whose run.json records the rating column, the scale and {@code model}'s further keys. */
    private static Path recordedFit(Path dir, String name, String sha, String rating, String scale, String model, String... rows)
            throws IOException {
        Path folder = dir.resolve(name);
        Files.createDirectories(folder);
        Files.writeString(folder.resolve("run.json"), "{\"input\": {\"sha256\": \"" + sha + "\", \"scale\": \"" + scale
                + "\"}, \"options\": {\"rating\": \"" + rating + "\", \"style\": [], \"prior\": []}, \"model\": {\"style_classes\": "
                + "\"none\", \"attraction\": \"none\", \"thresholds\": \"shared\"" + model + "}}");
        Files.writeString(folder.resolve("cross_validation.csv"), HEADER + String.join("\n", rows) + "\n");
        return folder;
    }

    @Test
    void differenceAndItsStandardErrorArePairedByRow(@TempDir Path dir) throws IOException {
        // a's pointwise elpd -1, -2, -3, -4; b's -1.5, -2, -2.5, -6 ("a, b" group labels test the last column's quoting)
        Path a = fit(dir, "a", "abc", "2,3,-1,0.1,0.2,0.01,North", "3,4,-2,0.1,0.3,0.01,North", "5,1,-3,0.1,0.8,0.01,\"a, b\"",
                "9,0,-4,0.1,0.1,0.01,South");
        Path b = fit(dir, "b", "abc", "2,3,-1.5,0.2,0.2,0.02,North", "3,4,-2,0.2,0.3,0.02,North",
                "5,1,-2.5,0.2,0.2,0.02,\"a, b\"", "9,0,-6,0.2,0.1,0.02,South");
        List<CrossValidationComparison.Fit> fits = CrossValidationComparison.compare(List.of(b, a));
        // a: -10, b: -12; d = b - a = -0.5, 0, 0.5, -2: sum -2, mean -0.5, squares 0 + 0.25 + 1 + 2.25 = 3.5,
        // var = 3.5 / 3, se = sqrt(4 * 3.5 / 3)
        assertEquals(a, fits.get(0).dir());
        assertEquals(-10, fits.get(0).elpd(), 1e-12);
        assertEquals(0, fits.get(0).difference(), 0);
        assertEquals(1, fits.get(0).unreliable());
        assertEquals(0.4, fits.get(0).effective(), 1e-12);
        assertEquals(b, fits.get(1).dir());
        assertEquals(-2, fits.get(1).difference(), 1e-12);
        assertEquals(Math.sqrt(4 * 3.5 / 3), fits.get(1).differenceSe(), 1e-12);
        // se of a's elpd: values -1..-4, mean -2.5, squares 5, se = sqrt(4 * 5 / 3)
        assertEquals(Math.sqrt(4 * 5.0 / 3), fits.get(0).se(), 1e-12);
        assertEquals(0.02, fits.get(0).mcse(), 1e-12);
        // by group, b - a: North -0.5 and 0 (sum -0.5, se sqrt(2 * 0.125)), "a, b" 0.5, South -2 (one
        // respondent each: no se)
        List<CrossValidationComparison.GroupDifference> groups = fits.get(1).byGroup();
        assertEquals(List.of("North", "a, b", "South"), groups.stream().map(CrossValidationComparison.GroupDifference::group).toList());
        assertEquals(2, groups.get(0).respondents());
        assertEquals(-0.5, groups.get(0).difference(), 1e-12);
        assertEquals(0.5, groups.get(0).differenceSe(), 1e-12);
        assertEquals(0.5, groups.get(1).difference(), 1e-12);
        assertTrue(Double.isNaN(groups.get(2).differenceSe()));
        assertEquals(-2, groups.get(2).difference(), 1e-12);
        assertTrue(CrossValidationComparison.formatByGroup(fits).contains("-0.5 (0.5)"));
        // our rule: a group of one respondent says it has no se rather than printing NaN
        String byGroup = CrossValidationComparison.formatByGroup(fits);
        assertTrue(byGroup.contains("-2.0 (no se)") && !byGroup.contains("NaN"), byGroup);
        String table = CrossValidationComparison.format(fits);
        assertTrue(table.contains("Best predicted: " + a), table);
        assertTrue(table.contains("Pareto k above 0.7"), table);
    }

    @Test
    void refusesFitsThatCannotBePaired(@TempDir Path dir) throws IOException {
        Path a = fit(dir, "a", "abc", "2,3,-1,0.1,0.2,0.01,North", "3,4,-2,0.1,0.3,0.01,North");
        Path other = fit(dir, "other", "def", "2,3,-1,0.1,0.2,0.01,North", "3,4,-2,0.1,0.3,0.01,North");
        Path fewer = fit(dir, "fewer", "abc", "2,3,-1,0.1,0.2,0.01,North", "4,4,-2,0.1,0.3,0.01,North");
        Path plain = dir.resolve("plain");
        Files.createDirectories(plain);
        Files.writeString(plain.resolve("run.json"), "{\"input\": {\"sha256\": \"abc\"}}");
        Path unordered = fit(dir, "unordered", "abc", "3,3,-1,0.1,0.2,0.01,North", "2,4,-2,0.1,0.3,0.01,North");
        Path broken = fit(dir, "broken", "abc", "2,3,minus one,0.1,0.2,0.01,North");

        assertMessage(List.of(a, other), "were fitted to different files (SHA-256 abc and def)");
        assertMessage(List.of(a, fewer), "used different rows of the file (1 row only in the first, 1 row only in the second,"
                + " the first of them row 3)");
        assertMessage(List.of(a, plain), "holds no cross_validation.csv: the fit ran without --cross-validate");
        assertMessage(List.of(a, dir.resolve("nothing")), "is not a fit folder: run.json is missing");
        assertMessage(List.of(a), "name at least two fit folders");
        assertMessage(List.of(a, unordered), "row 3: the rows are not in increasing order (2 after 3)");
        assertMessage(List.of(a, broken), "row 2: expected a row number and five numbers before the group");
    }

    @Test
    void refusesFitsOfAnotherRatingColumnOrScaleAndAFolderNamedTwice(@TempDir Path dir) throws IOException {
        // our rule: elpd_loo of different outcomes measures different predictions; their difference means nothing
        String[] rows = {"2,3,-1,0.1,0.2,0.01,North", "3,4,-2,0.1,0.3,0.01,North"};
        Path a = recordedFit(dir, "a", "abc", "rating", "0..10", "", rows);
        Path otherColumn = recordedFit(dir, "r2", "abc", "r2", "0..10", "", rows);
        Path otherScale = recordedFit(dir, "wide", "abc", "rating", "0..12", "", rows);
        Path bell = recordedFit(dir, "bell", "abc", "rat\\u0007ing", "0..10", "", rows);
        Files.createDirectories(dir.resolve("x"));

        assertMessage(List.of(a, otherColumn), a + " and " + otherColumn + " predict different rating columns (--rating"
                + " \"rating\" and \"r2\")");
        assertMessage(List.of(a, otherScale), a + " and " + otherScale + " read the ratings on different scales (--scale"
                + " \"0..10\" and \"0..12\")");
        IOException escaped = assertThrows(IOException.class, () -> CrossValidationComparison.compare(List.of(a, bell)));
        assertTrue(escaped.getMessage().contains("\"rat\\u0007ing\""), escaped.getMessage());
        assertTrue(escaped.getMessage().chars().noneMatch(Character::isISOControl), escaped.getMessage());
        assertMessage(List.of(a, a), a + " and " + a + " are the same fit folder");
        assertMessage(List.of(a, otherScale, dir.resolve("x").resolve("..").resolve("a")), "are the same fit folder");
    }

    @Test
    void theModelColumnNamesWhatMayDifferBetweenFitsOfTheSameRows(@TempDir Path dir) throws IOException {
        String[] rows = {"2,3,-1,0.1,0.2,0.01,North", "3,4,-2,0.1,0.3,0.01,North"};
        Path plain = fit(dir, "plain", "abc", rows);
        Path covariates = recordedFit(dir, "covariates", "abc", "rating", "0..10", ", \"level_covariates\": {\"income\": "
                + "{\"source_column\": \"income\"}, \"school=high\": {\"source_column\": \"school\"}, \"school=low\": "
                + "{\"source_column\": \"school\"}}", rows);
        List<CrossValidationComparison.Fit> fits = CrossValidationComparison.compare(List.of(plain, covariates));
        assertEquals(List.of("style classes none, attraction none, thresholds shared",
                "style classes none, attraction none, thresholds shared, level covariates income,school"),
                List.of(model(fits, plain), model(fits, covariates)));
    }

    private static String model(List<CrossValidationComparison.Fit> fits, Path dir) {
        return fits.stream().filter(f -> f.dir().equals(dir)).findFirst().orElseThrow().model();
    }

    private static void assertMessage(List<Path> dirs, String part) {
        IOException e = assertThrows(IOException.class, () -> CrossValidationComparison.compare(dirs));
        assertTrue(e.getMessage().contains(part), e.getMessage());
    }

    /**
     * Our rule, after an audit in which compare ranked fits whose chains had not converged without
     * a word: the fits whose summary.csv does not show convergence (or is missing) are named.
     */
    @Test
    void fitsThatHaveNotConvergedAreNamed(@TempDir Path dir) throws IOException {
        String header = "name,mean,sd,q5,q50,q95,rhat,ess_bulk,ess_tail,mcse_mean,flag,rhat_chance\n";
        Path good = fit(dir, "good", "abc", "2,3,-1,0.1,0.2,0.01,North", "3,4,-2,0.1,0.3,0.01,North");
        Files.writeString(good.resolve("summary.csv"), header + "level.x,0.5,0.1,0.3,0.5,0.7,1.001,900,800,0.003,ok,0.6\n");
        Path slow = fit(dir, "slow", "abc", "2,3,-1.5,0.2,0.2,0.02,North", "3,4,-2,0.2,0.3,0.02,North");
        Files.writeString(slow.resolve("summary.csv"), header
                + "level.x,0.5,0.1,0.3,0.5,0.7,1.2,30,40,0.02,rhat>1.01;low ess_bulk;low ess_tail,0.0001\n");
        Path bare = fit(dir, "bare", "abc", "2,3,-1.2,0.2,0.2,0.02,North", "3,4,-2,0.2,0.3,0.02,North");
        List<CrossValidationComparison.Fit> fits = CrossValidationComparison.compare(List.of(good, slow, bare));
        assertEquals(List.of(true, false, false), fits.stream().map(CrossValidationComparison.Fit::converged).toList());
        String table = CrossValidationComparison.format(fits);
        // best first: good -3, bare -3.2, slow -3.5
        assertTrue(table.contains("Not converged: " + bare + ", " + slow + " ("), table);
        String alone = CrossValidationComparison.format(fits.subList(0, 1));
        assertTrue(!alone.contains("Not converged"), alone);
    }
}
