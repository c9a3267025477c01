package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.stat.descriptive.moment.Mean;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Numeric covariates are centred and divided by the sample sd, denominator n-1 (MODEL.md section 1).
 * Reference: Apache Commons Math 3.6.1 {@code Mean} and {@code StandardDeviation} (bias-corrected,
 * its default). Tolerance 1e-12 relative: both are two-pass sums over the same doubles, so they
 * differ only by rounding.
 */
class StandardisationTest {

    @TempDir
    Path dir;

    private static final double RELATIVE = 1e-12;

    @Test
    void fromNumericCentresAndScalesByTheSampleStandardDeviation() {
        Random random = new Random(20240607L);
        double[] income = new double[500];
        double[] age = new double[500];
        for (int i = 0; i < income.length; i++) {
            income[i] = Math.exp(7 + random.nextGaussian());
            age[i] = 18 + random.nextInt(70);
        }
        Covariates c = Covariates.fromNumeric(List.of("income", "age"), List.of(income, age));
        assertStandardised(c, 0, income);
        assertStandardised(c, 1, age);
        assertEquals("income", c.name(0));
        assertEquals("income", c.sourceColumn(0));
        assertNotSame(income, c.column(0));
        assertEquals(2, c.count());
    }

    @Test
    void theReaderStandardisesWhatItReads() throws Exception {
        Random random = new Random(7L);
        int n = 2000;
        double[] x = new double[n];
        StringBuilder text = new StringBuilder("rating,x\n");
        for (int i = 0; i < n; i++) {
            x[i] = 1e4 + 250 * random.nextGaussian();
            text.append(random.nextInt(11)).append(',').append(x[i]).append('\n');
        }
        Survey survey = SurveyReader.read(SurveyFiles.write(dir, "x.csv", text.toString()),
                SurveySpec.builder("rating", new Scale(0, 10)).level("x").build());
        assertStandardised(survey.level(), 0, x);
    }

    @Test
    void aCoefficientPerInternalUnitDividedByTheScaleIsPerUserUnit() {
        double[] years = {20, 30, 40, 50, 60};
        Covariates c = Covariates.fromNumeric(List.of("age"), List.of(years));
        // internal value of 50 minus that of 40 is one user-unit step of 10 years, i.e. 10 / scale
        assertEquals(10 / c.scale(0), c.column(0)[3] - c.column(0)[2], 1e-12);
        assertEquals(40, c.centre(0), 0.0);
        assertEquals(Math.sqrt(250), c.scale(0), 1e-12);
    }

    @Test
    void rejectsConstantAndNonFiniteColumns() {
        IllegalArgumentException constant = assertThrows(IllegalArgumentException.class,
                () -> Covariates.fromNumeric(List.of("x"), List.of(new double[] {0.1, 0.1, 0.1})));
        assertEquals("covariate \"x\" is constant (the single value 0.1 in the rows used), so its coefficient"
                + " cannot be told apart from the intercept; expected a covariate that varies; drop the column",
                constant.getMessage());
        assertThrows(IllegalArgumentException.class,
                () -> Covariates.fromNumeric(List.of("x"), List.of(new double[] {1, Double.NaN})));
        assertThrows(IllegalArgumentException.class,
                () -> Covariates.fromNumeric(List.of("x"), List.of(new double[] {1, 2e150})));
        assertThrows(IllegalArgumentException.class,
                () -> Covariates.fromNumeric(List.of("x", "y"), List.of(new double[] {1, 2}, new double[] {1, 2, 3})));
        assertThrows(IllegalArgumentException.class,
                () -> Covariates.fromNumeric(List.of("x", "x"), List.of(new double[] {1, 2}, new double[] {2, 1})));
    }

    @Test
    void noneIsEmpty() {
        assertEquals(0, Covariates.none().count());
        assertEquals(0, Covariates.none().rows());
        assertEquals(0, Covariates.builder().build().count());
    }

    private static void assertStandardised(Covariates c, int j, double[] raw) {
        double mean = new Mean().evaluate(raw);
        double sd = new StandardDeviation().evaluate(raw);
        assertEquals(mean, c.centre(j), RELATIVE * Math.abs(mean));
        assertEquals(sd, c.scale(j), RELATIVE * sd);
        double[] internal = c.column(j);
        for (int i = 0; i < raw.length; i++) {
            assertEquals((raw[i] - mean) / sd, internal[i], 1e-10);
        }
        assertEquals(0.0, new Mean().evaluate(internal), 1e-12);
        assertEquals(1.0, new StandardDeviation().evaluate(internal), 1e-12);
    }
}
