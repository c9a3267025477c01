package org.rungs.sampler.derived;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.ParameterLayout;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.priors.Priors;

/**
 * attraction.csv against statistics of a fabricated set of draws computed here from their
 * definitions: the mean, the sample sd (divisor n - 1), R's type-7 quantiles (Hyndman & Fan 1996,
 * the default of R's quantile()), the share of positive draws, and the prior sds of MODEL.md 5.
 */
class AttractionProfileTest {
    /** Sums of at most 14 terms of size ~1: both sides agree to rounding, so 1e-12. */
    private static final double EXACT = 1e-12;
    private static final Scale SCALE = new Scale(0, 4);
    /** Not the defaults, so that the test sees which prior sds are used: sd(abar) 0.7, tau_a ~ Half-Normal(0, 0.4). */
    private static final Priors PRIORS = Priors.defaults().with("attraction_mean=normal(0,0.7)")
            .with("attraction_sd=half-normal(0.4)");
    private static final List<String> LABELS = List.of("North", "South, coast");

    private static Survey survey(List<String> labels) {
        int[] group = labels.size() == 1 ? new int[6] : new int[] {0, 0, 0, 1, 1, 1};
        return Survey.of(SCALE, new byte[] {0, 1, 2, 3, 4, 2}, group, labels, Covariates.none(), Covariates.none(), null);
    }

    private static ModelSpec spec() {
        return new ModelSpec(ThresholdMode.BY_GROUP, PRIORS, StyleClasses.none(), NumberAttraction.of(3, 1));
    }

    /** Every column random; the attraction columns centred at different values, North's a[3] above and abar[3] below 0. */
    private static Draws draws(ParameterLayout layout) {
        Random random = new Random(17);
        Draws draws = new Draws(layout.names(), 2, 7);
        for (int p = 0; p < layout.size(); p++) {
            double centre = layout.names().get(p).startsWith("attraction") ? 0.6 * random.nextGaussian() : 0;
            for (int c = 0; c < 2; c++) {
                for (int t = 0; t < 7; t++) {
                    draws.set(p, c, t, centre + 0.4 * random.nextGaussian());
                }
            }
        }
        int above = draws.indexOf("attraction.North.3");
        int below = draws.indexOf("attraction.3");
        for (int c = 0; c < 2; c++) {
            for (int t = 0; t < 7; t++) {
                if (above >= 0) {
                    draws.set(above, c, t, 0.5 + random.nextDouble());
                }
                if (below >= 0) {
                    draws.set(below, c, t, -0.1 - random.nextDouble());
                }
            }
        }
        return draws;
    }

    private static double[] values(Draws draws, String name) {
        int p = draws.indexOf(name);
        assertTrue(p >= 0, "no column " + name);
        double[] x = new double[draws.chains() * draws.iterations()];
        for (int c = 0; c < draws.chains(); c++) {
            for (int t = 0; t < draws.iterations(); t++) {
                x[c * draws.iterations() + t] = draws.get(p, c, t);
            }
        }
        return x;
    }

    private static double mean(double[] x) {
        double sum = 0;
        for (double v : x) {
            sum += v;
        }
        return sum / x.length;
    }

    private static double sd(double[] x) {
        double m = mean(x);
        double sum = 0;
        for (double v : x) {
            sum += (v - m) * (v - m);
        }
        return Math.sqrt(sum / (x.length - 1));
    }

    /** Type 7: x_(floor h) + (h - floor h)(x_(floor h + 1) - x_(floor h)), h = (n - 1) p, 0-based order statistics. */
    private static double quantile(double[] x, double p) {
        double[] sorted = x.clone();
        Arrays.sort(sorted);
        double h = (sorted.length - 1) * p;
        int low = (int) Math.floor(h);
        return low + 1 < sorted.length ? sorted[low] + (h - low) * (sorted[low + 1] - sorted[low]) : sorted[low];
    }

    private static double[] exp(double[] x) {
        return Arrays.stream(x).map(Math::exp).toArray();
    }

    /** The expected row of attraction.csv from the draws of {@code column}, as doubles after group and rating. */
    private static double[] expected(Draws draws, String column, double priorSd) {
        double[] a = values(draws, column);
        double[] e = exp(a);
        double positive = Arrays.stream(a).filter(v -> v > 0).count() / (double) a.length;
        return new double[] {mean(a), quantile(a, 0.05), quantile(a, 0.95), mean(e), quantile(e, 0.05), quantile(e, 0.95),
            positive, sd(a) / priorSd};
    }

    @Test
    void csvRowsAreTheStatisticsOfTheDrawsWithTheSdRatioAgainstTheFitsPriors(@TempDir Path dir) throws IOException {
        Survey survey = survey(LABELS);
        ParameterLayout layout = ParameterLayout.of(survey, spec());
        Draws draws = draws(layout);
        List<AttractionProfile.Row> rows = AttractionProfile.of(draws, layout, PRIORS, LABELS);
        Path file = dir.resolve("attraction.csv");
        AttractionProfile.write(rows, file);
        List<String> lines = Files.readAllLines(file);
        // the header the report reads, plus sd_ratio
        assertEquals("group,rating,a_mean,a_q5,a_q95,exp_a_mean,exp_a_q5,exp_a_q95,p_positive,sd_ratio", lines.get(0));
        String[] groups = {"all", "all", "North", "North", "\"South, coast\"", "\"South, coast\""};
        String[] columns = {"attraction.1", "attraction.3", "attraction.North.1", "attraction.North.3",
            "attraction.South, coast.1", "attraction.South, coast.3"};
        // a common term's prior sd is that of abar; a group's is sqrt(0.7^2 + 0.4^2) (MODEL.md 4b, 5)
        double[] priorSd = {0.7, 0.7, Math.sqrt(0.65), Math.sqrt(0.65), Math.sqrt(0.65), Math.sqrt(0.65)};
        assertEquals(1 + groups.length, lines.size());
        for (int r = 0; r < groups.length; r++) {
            String line = lines.get(1 + r);
            assertTrue(line.startsWith(groups[r] + "," + (r % 2 == 0 ? 1 : 3) + ","), line);
            String[] cells = line.substring(groups[r].length() + 1).split(",");
            double[] want = expected(draws, columns[r], priorSd[r]);
            for (int c = 0; c < want.length; c++) {
                assertEquals(want[c], Double.parseDouble(cells[1 + c]), EXACT * Math.max(1, Math.abs(want[c])),
                        columns[r] + " field " + c);
            }
            assertEquals(r < 2, rows.get(r).common());
        }
        assertEquals(1.0, rows.get(3).pPositive(), 0, "attraction.North.3 was drawn above 0");
        assertEquals(0.0, rows.get(1).pPositive(), 0, "attraction.3 was drawn below 0");
        double mixed = rows.get(2).pPositive();
        assertTrue(mixed > 0 && mixed < 1, "attraction.North.1 has draws on both sides of 0, got " + mixed);
    }

    @Test
    void oneGroupHasOnlyTheCommonRowsWhichAreItsAttraction() {
        List<String> one = List.of("all");
        Survey survey = survey(one);
        ParameterLayout layout = ParameterLayout.of(survey, spec());
        Draws draws = draws(layout);
        List<AttractionProfile.Row> rows = AttractionProfile.of(draws, layout, PRIORS, one);
        assertEquals(2, rows.size());
        for (int r = 0; r < 2; r++) {
            AttractionProfile.Row row = rows.get(r);
            assertTrue(row.common());
            assertEquals("all", row.group());
            assertEquals(r == 0 ? 1 : 3, row.rating());
            double[] want = expected(draws, "attraction." + row.rating(), 0.7);
            assertEquals(want[0], row.aMean(), EXACT);
            assertEquals(want[7], row.sdRatio(), EXACT);
        }
    }

    @Test
    void attractionOffHasNoRows() {
        Survey survey = survey(LABELS);
        ModelSpec off = spec().withAttraction(NumberAttraction.none());
        ParameterLayout layout = ParameterLayout.of(survey, off);
        assertEquals(List.of(), AttractionProfile.of(draws(layout), layout, PRIORS, LABELS));
    }
}
