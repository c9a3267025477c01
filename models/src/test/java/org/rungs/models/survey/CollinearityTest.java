package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Exactly collinear covariates are refused and named: the rank of [1, X] is checked by
 * Gram-Schmidt with limited pivoting, tolerance 1e-7 (R 4.2.2, {@code formals(qr.default)$tol}).
 */
class CollinearityTest {

    @TempDir
    Path dir;

    private static double[] gaussian(Random random, int n) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = random.nextGaussian();
        }
        return x;
    }

    @Test
    void aSumOfTwoColumnsIsNamedWithBoth() {
        Random random = new Random(1L);
        double[] a = gaussian(random, 300);
        double[] b = gaussian(random, 300);
        double[] noise = gaussian(random, 300);
        double[] sum = new double[300];
        for (int i = 0; i < 300; i++) {
            sum[i] = 0.1 * a[i] + 3 * b[i] - 7;
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Covariates.fromNumeric(
                List.of("a", "noise", "b", "sum"), List.of(a, noise, b, sum)));
        assertTrue(e.getMessage().startsWith("covariates \"a\", \"b\" and \"sum\" are exactly collinear: with the"
                + " intercept, \"sum\" is a linear combination of \"a\" and \"b\""), e.getMessage());
    }

    @Test
    void aRescaledCopyIsCollinearWithTheIntercept() {
        double[] years = {20, 31, 45, 52, 67, 70};
        double[] birth = new double[years.length];
        for (int i = 0; i < years.length; i++) {
            birth[i] = 2024 - years[i];
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Covariates.fromNumeric(List.of("age", "birth_year"), List.of(years, birth)));
        assertTrue(e.getMessage().contains("\"birth_year\" is a linear combination of \"age\""), e.getMessage());
    }

    @Test
    void indicatorsThatAddUpToANumericColumnAreCollinear() {
        int[] codes = {0, 1, 2, 0, 1, 2, 2};
        double[] notLow = new double[codes.length];
        for (int i = 0; i < codes.length; i++) {
            notLow[i] = codes[i] == 0 ? 0 : 1;
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Covariates.builder()
                .categorical("education", codes, List.of("low", "mid", "high"), "low")
                .numeric("schooled", notLow)
                .build());
        assertTrue(e.getMessage().contains("\"schooled\" is a linear combination of \"education=mid\" and"
                + " \"education=high\""), e.getMessage());
    }

    @Test
    void nearlyButNotExactlyCollinearColumnsAreAccepted() {
        Random random = new Random(3L);
        double[] a = gaussian(random, 1000);
        double[] b = new double[1000];
        for (int i = 0; i < 1000; i++) {
            // the part of b not explained by a has relative size ~1e-4, far above the 1e-7 tolerance
            b[i] = a[i] + 1e-4 * random.nextGaussian();
        }
        assertEquals(2, Covariates.fromNumeric(List.of("a", "b"), List.of(a, b)).count());
    }

    @Test
    void anExactDependencyHiddenByDecimalRoundingIsStillFound() {
        // shares and percentages typed with limited decimals: 100 * share == percent up to rounding of doubles
        double[] share = {0.125, 0.3, 0.71, 0.05, 0.9};
        double[] percent = {12.5, 30, 71, 5, 90};
        double[] other = {1, 0, 2, 5, 1};
        assertThrows(IllegalArgumentException.class,
                () -> Covariates.fromNumeric(List.of("share", "other", "percent"), List.of(share, other, percent)));
    }

    @Test
    void theReaderNamesCollinearColumnsOfTheFile() {
        Path file = SurveyFiles.write(dir, "c.csv", "rating,urban,area\n1,1,city\n2,0,village\n3,1,city\n4,0,village\n");
        SurveyInputException e = assertThrows(SurveyInputException.class, () -> SurveyReader.read(file,
                SurveySpec.builder("rating", new Scale(0, 10)).level("urban", "area").build()));
        assertEquals("area", e.column());
        assertTrue(e.getMessage().contains("covariates \"urban\" and \"area=village\" are exactly collinear"),
                e.getMessage());
    }

    @Test
    void levelAndStyleAreCheckedSeparately() throws Exception {
        // the same column in both sets is fine: each set has its own intercept
        Path file = SurveyFiles.write(dir, "s.csv", "rating,x\n1,1\n2,3\n3,2\n");
        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", new Scale(0, 10)).level("x").style("x").build());
        assertEquals(1, survey.level().count());
        assertEquals(1, survey.style().count());
    }
}
