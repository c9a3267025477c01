package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;

/** {@link LatentLevelUpdate}: the design sums of the redraw scheme's rejected draws. */
class LatentLevelUpdateTest {
    private static final int GROUPS = 7;
    private static final int PER_GROUP = 40;

    /**
     * Under attraction every rejected draw adds its respondent's covariate row to the level
     * regression's design (MODEL.md 4b, the redraw scheme). With covariates constant within each
     * group the expected sums are closed-form: group g's count e_g of rejected draws is what its
     * cells hold beyond its respondents, its covariate sums e_g x_g, and the products
     * sum_g e_g x_g x_g'. Checked for one to four covariates (the run path, whose sums are kept
     * per run) and five (the respondent path); with the run path's packing of the products off by
     * one index the test failed. Tolerance 1e-9 relative: sums of a few hundred terms.
     */
    @Test
    void rejectedDrawsEnterTheDesignOncePerDraw() {
        for (int p = 1; p <= 5; p++) {
            ChainState s = state(p, 40L + p);
            int m = s.categories;
            for (int g = 0; g < GROUPS; g++) {
                s.attraction[g * m + 1] = 1.2;
                s.attraction[g * m + 3] = -0.8;
            }
            LatentLevelUpdate.of(s, RandomSource.XO_RO_SHI_RO_128_PP.create(7L + p)).update(false);
            RegressionBlock level = s.level;
            double[][] gram = new double[p][p];
            double rejected = 0;
            for (int g = 0; g < GROUPS; g++) {
                double inCells = 0;
                for (int r = 0; r < m; r++) {
                    inCells += s.cells.n(g * m + r);
                }
                int first = s.start[g * m];
                assertEquals(inCells - (s.start[(g + 1) * m] - first), level.extraCount[g], 1e-9,
                        "group " + g + "'s rejected draws, " + p + " covariates");
                rejected += level.extraCount[g];
                for (int j = 0; j < p; j++) {
                    double xj = level.columns[j][first];
                    assertEquals(level.extraCount[g] * xj, level.extraGroupCovariate[g][j], 1e-9 * (1 + Math.abs(xj) * level.extraCount[g]),
                            "group " + g + ", covariate " + j + " of " + p);
                    for (int k = 0; k < p; k++) {
                        gram[j][k] += level.extraCount[g] * xj * level.columns[k][first];
                    }
                }
            }
            assertTrue(rejected > 20, "the attractions make draws rejected: " + rejected);
            for (int j = 0; j < p; j++) {
                for (int k = 0; k < p; k++) {
                    assertEquals(gram[j][k], level.extraGram[j][k], 1e-9 * (1 + Math.abs(gram[j][k])),
                            "product of covariates " + j + " and " + k + " of " + p);
                }
            }
        }
    }

    /** Scale 1..5, numbers 2 and 4 attracted, p covariates drawn once per group, answers uniform. */
    private static ChainState state(int p, long seed) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        int n = GROUPS * PER_GROUP;
        int[] group = new int[n];
        byte[] category = new byte[n];
        double[][] perGroup = new double[GROUPS][p];
        for (double[] row : perGroup) {
            for (int j = 0; j < p; j++) {
                row[j] = 4 * rng.nextDouble() - 2;
            }
        }
        List<double[]> columns = new ArrayList<>();
        List<String> names = new ArrayList<>();
        for (int j = 0; j < p; j++) {
            columns.add(new double[n]);
            names.add("x" + j);
        }
        for (int i = 0; i < n; i++) {
            group[i] = i % GROUPS;
            category[i] = (byte) rng.nextInt(5);
            for (int j = 0; j < p; j++) {
                columns.get(j)[i] = perGroup[group[i]][j];
            }
        }
        Survey survey = Survey.of(new Scale(1, 5), category, group, List.of("a", "b", "c", "d", "e", "f", "h"),
                Covariates.fromNumeric(names, columns), Covariates.none(), null);
        ChainState s = new ChainState(SurveyOrder.of(survey), true, null, new int[] {1, 3});
        InitialValues.apply(s, -1, rng);
        return s;
    }
}
