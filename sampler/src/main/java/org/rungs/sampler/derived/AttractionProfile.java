package org.rungs.sampler.derived;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.rungs.models.ParameterLayout;
import org.rungs.posteriors.AtomicFiles;
import org.rungs.posteriors.AttractionWords;
import org.rungs.posteriors.CsvField;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.Summaries;
import org.rungs.priors.Priors;

/**
 * The attraction profile of MODEL.md 6 from every kept draw of the fit: per number j of the
 * attraction set A, a and exp(a) (the odds multiplier of reporting j, MODEL.md 4b) with 90%
 * intervals, P(a > 0), and posterior sd / prior sd, which stays near 1 for a term the data hardly
 * inform. The common terms abar[j] come first as group {@value #COMMON} (with one group they are
 * a[j] itself), then with several groups each group's a[g,j] = abar[j] + t[g,j].
 */
public final class AttractionProfile {
    /** The group label of the common terms in {@code attraction.csv}. */
    public static final String COMMON = AttractionWords.COMMON;

    /**
     * One number's attraction in one group.
     *
     * @param group     the group's label, {@value #COMMON} for a common term
     * @param common    whether the row is the common term abar[j] (a[j] with one group)
     * @param rating    the number j
     * @param pPositive share of the draws with a > 0
     * @param sdRatio   posterior sd of a over its prior sd
     */
    public record Row(String group, boolean common, int rating, double aMean, double aQ5, double aQ95, double expMean,
            double expQ5, double expQ95, double pPositive, double sdRatio) {
        /** What the words on attraction read of this row. */
        public AttractionWords.Term term() {
            return new AttractionWords.Term(group, common, rating, expMean, expQ5, expQ95, pPositive, sdRatio);
        }
    }

    private AttractionProfile() {
    }

    /**
     * The profile's rows, common terms first, then group by group in survey order, each in the
     * order of A; empty when attraction is off.
     *
     * @param draws the fit's draws, columns in the order of {@code layout}
     * @param priors the fit's priors, whose sds scale the sd ratios
     */
    public static List<Row> of(Draws draws, ParameterLayout layout, Priors priors, List<String> groupLabels) {
        if (draws.iterations() == 0) {
            throw new IllegalArgumentException("no draws: every chain has 0 iterations");
        }
        if (!draws.names().subList(0, Math.min(layout.size(), draws.parameterCount())).equals(layout.names())) {
            throw new IllegalArgumentException("the draws' columns do not follow the parameter layout of this survey and model");
        }
        int[] set = layout.attractionSet();
        double commonSd = priors.attractionMean().sd();
        // a[g,j] = abar[j] + t[g,j], t[g,j] ~ Normal(0, tau_a), tau_a ~ Half-Normal(0, s): its marginal
        // prior variance is s_abar^2 + E[tau_a^2] = s_abar^2 + s^2 (a Half-Normal's second moment is
        // that of its Normal); the marginal is not normal, but this is its sd
        double groupSd = Math.hypot(commonSd, priors.attractionSd().sd());
        List<Row> rows = new ArrayList<>();
        for (int j = 0; j < set.length; j++) {
            rows.add(row(draws, layout.attractionOffset() + j, COMMON, true, set[j], commonSd));
        }
        if (layout.groupAttractionOffset() >= 0) {
            for (int g = 0; g < groupLabels.size(); g++) {
                for (int j = 0; j < set.length; j++) {
                    rows.add(row(draws, layout.groupAttractionOffset() + g * set.length + j, groupLabels.get(g), false,
                            set[j], groupSd));
                }
            }
        }
        return rows;
    }

    /**
     * attraction.csv: group, rating, a_mean, a_q5, a_q95, exp_a_mean, exp_a_q5, exp_a_q95,
     * p_positive, sd_ratio; intervals are the 90% central posterior intervals.
     */
    public static void write(List<Row> rows, Path file) throws IOException {
        AtomicFiles.write(file, out -> {
            out.append("group,rating,a_mean,a_q5,a_q95,exp_a_mean,exp_a_q5,exp_a_q95,p_positive,sd_ratio\n");
            StringBuilder line = new StringBuilder();
            for (Row r : rows) {
                line.setLength(0);
                line.append(CsvField.quote(r.group())).append(',').append(r.rating());
                for (double v : new double[] {r.aMean(), r.aQ5(), r.aQ95(), r.expMean(), r.expQ5(), r.expQ95(),
                    r.pPositive(), r.sdRatio()}) {
                    line.append(',').append(DerivedTables.number(v));
                }
                out.append(line.append('\n'));
            }
        });
    }

    private static Row row(Draws draws, int column, String group, boolean common, int rating, double priorSd) {
        double[][] a = draws.chainsOf(column);
        double[][] exp = new double[a.length][];
        long positive = 0;
        for (int c = 0; c < a.length; c++) {
            exp[c] = new double[a[c].length];
            for (int t = 0; t < a[c].length; t++) {
                exp[c][t] = Math.exp(a[c][t]);
                if (a[c][t] > 0) {
                    positive++;
                }
            }
        }
        String name = draws.names().get(column);
        ParameterSummary s = Summaries.of(name, a);
        ParameterSummary e = Summaries.of("exp(" + name + ")", exp);
        return new Row(group, common, rating, s.mean(), s.q05(), s.q95(), e.mean(), e.q05(), e.q95(),
                (double) positive / ((long) draws.chains() * draws.iterations()), s.sd() / priorSd);
    }
}
