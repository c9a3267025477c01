package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.BufferedWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.stat.descriptive.moment.Mean;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A generated file of a million rows and five columns loads into the right columns. The expected
 * sums are accumulated while the file is written; no timing is asserted.
 */
class LargeFileTest {

    private static final int ROWS = 1_000_000;
    private static final int GROUPS = 25;
    private static final String[] EDUCATION = {"primary", "secondary", "tertiary"};

    @TempDir
    Path dir;

    @Test
    void loadsAMillionRows() throws Exception {
        SplittableRandom random = new SplittableRandom(42L);
        Path file = dir.resolve("large.csv");
        long ratingSum = 0;
        int[] groupSizes = new int[GROUPS];
        int[] educationCounts = new int[EDUCATION.length];
        double weightSum = 0;
        int missingRatings = 0;
        double[] income = new double[ROWS];
        int used = 0;
        try (BufferedWriter out = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            out.write("rating,region,income,education,weight\n");
            StringBuilder line = new StringBuilder(64);
            for (int i = 0; i < ROWS; i++) {
                int rating = random.nextInt(11);
                // regions appear in order 0, 1, 2, ... in the first rows, so their index is their number
                int region = i < GROUPS ? i : random.nextInt(GROUPS);
                long cents = 100_000 + random.nextInt(900_000);
                int education = i < EDUCATION.length ? i : random.nextInt(10) < 5 ? 1 : random.nextInt(10) < 5 ? 0 : 2;
                int weightTenths = 1 + random.nextInt(30);
                boolean missing = i % 997 == 500;
                line.setLength(0);
                line.append(missing ? "NA" : Integer.toString(rating)).append(",\"Region ").append(region)
                        .append("\",").append(cents / 100).append('.');
                long fraction = cents % 100;
                line.append(fraction < 10 ? "0" : "").append(fraction).append(',').append(EDUCATION[education])
                        .append(',').append(weightTenths / 10).append('.').append(weightTenths % 10).append('\n');
                out.append(line);
                if (missing) {
                    missingRatings++;
                    continue;
                }
                ratingSum += rating;
                groupSizes[region]++;
                educationCounts[education]++;
                weightSum += weightTenths / 10.0;
                income[used++] = cents / 100.0;
            }
        }

        long start = System.nanoTime();
        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", new Scale(0, 10)).group("region")
                .level("income", "education").style("education").weight("weight").build());
        System.out.printf("LargeFileTest: read %d rows in %.2f s%n", ROWS, (System.nanoTime() - start) / 1e9);

        assertEquals(ROWS, survey.exclusions().rowsRead());
        assertEquals(ROWS - missingRatings, survey.size());
        assertEquals(missingRatings, survey.exclusions().missingByColumn().get("rating"));
        long readRatingSum = 0;
        for (byte c : survey.category()) {
            readRatingSum += c;
        }
        assertEquals(ratingSum, readRatingSum);
        assertArrayEquals(groupSizes, survey.groupSizes());
        assertEquals("Region 0", survey.groupLabels().get(0));
        assertEquals("Region " + (GROUPS - 1), survey.groupLabels().get(GROUPS - 1));
        double readWeightSum = 0;
        for (double w : survey.weight()) {
            readWeightSum += w;
        }
        // sums of a million tenths in a different order: rounding differs by far less than 1e-6
        assertEquals(weightSum, readWeightSum, 1e-6);

        Covariates level = survey.level();
        double[] incomeUsed = Arrays.copyOf(income, used);
        // reference: Apache Commons Math 3.6.1 Mean and bias-corrected StandardDeviation
        assertEquals(new Mean().evaluate(incomeUsed), level.centre(0), 1e-9);
        assertEquals(new StandardDeviation().evaluate(incomeUsed), level.scale(0), 1e-9);
        assertEquals("education=primary", level.name(1));
        assertEquals("education=tertiary", level.name(2));
        assertEquals("secondary", level.referenceLevel(1));
        assertEquals(educationCounts[0], columnSum(level.column(1)), 0.0);
        assertEquals(educationCounts[2], columnSum(level.column(2)), 0.0);
        assertEquals(educationCounts[0], columnSum(survey.style().column(0)), 0.0);
    }

    private static double columnSum(double[] x) {
        double s = 0;
        for (double v : x) {
            s += v;
        }
        return s;
    }
}
