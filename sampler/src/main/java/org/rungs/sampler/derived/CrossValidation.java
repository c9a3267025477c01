package org.rungs.sampler.derived;

import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import org.rungs.models.ModelSpec;
import org.rungs.models.ParameterLayout;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.CsvField;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.LeaveOneOut;
import org.rungs.priors.StandardNormal;

/**
 * Leave-one-out cross-validation of a fit, respondent by respondent, by Pareto-smoothed
 * importance sampling ({@link LeaveOneOut}; Vehtari, Gelman & Gabry 2017): each respondent's
 * log-likelihood of MODEL.md 4c, the latent level and the class summed out (with attraction
 * 4b), at the draws the derived quantities use. The sum of the pointwise elpd_loo estimates how
 * well the model predicts a new respondent's rating; two models fitted to the same rows are
 * compared by the difference of their sums and its standard error (eq. 24 of the paper, from
 * memory), which
 * {@code rungs compare} reads from the pointwise file. Survey weights do not enter: the criterion
 * is about the model's predictions, not a population total.
 */
public final class CrossValidation {
    private final int[] row;
    private final int[] group;
    private final byte[] category;
    private final List<String> groupLabels;
    private final int lowest;
    private final int draws;
    private final double[] elpd;
    private final double[] effective;
    private final double[] paretoK;
    private final double[] mcse;

    private CrossValidation(Survey survey, int draws, double[] elpd, double[] effective, double[] paretoK, double[] mcse) {
        this.row = survey.row();
        this.group = survey.group();
        this.category = survey.category();
        this.groupLabels = survey.groupLabels();
        this.lowest = survey.scale().lowest();
        this.draws = draws;
        this.elpd = elpd;
        this.effective = effective;
        this.paretoK = paretoK;
        this.mcse = mcse;
    }

    /**
     * Cross-validates the fit whose draws are {@code draws} (columns in the order of
     * {@code layout}) at the iterations {@link DerivedQuantities#compute} uses for
     * {@code maxDraws}, respondents shared out over {@code threads} workers; the result does not
     * depend on {@code threads}.
     */
    public static CrossValidation compute(Survey survey, Draws draws, ParameterLayout layout, ModelSpec spec,
            int maxDraws, int threads) {
        return compute(survey, draws, layout, spec, maxDraws, threads, WorkProgress.NONE);
    }

    /** As above, telling {@code progress} of the respondents cross-validated, a block at a time. */
    public static CrossValidation compute(Survey survey, Draws draws, ParameterLayout layout, ModelSpec spec,
            int maxDraws, int threads, WorkProgress progress) {
        int chains = draws.chains();
        int[] used = DerivedQuantities.usedIterations(chains, draws.iterations(), maxDraws);
        int groups = survey.groupCount();
        int m = survey.scale().categories();
        boolean coarse = spec.styleClasses().coarse();
        RoundingChannel channel = coarse
                ? RoundingChannel.of(survey.scale(), spec.styleClasses().points(survey.scale())) : null;
        boolean attraction = layout.attractionSet().length > 0;
        int s = chains * used.length;
        DrawParameters[] at = new DrawParameters[s];
        for (int c = 0; c < chains; c++) {
            for (int u = 0; u < used.length; u++) {
                DrawParameters p = new DrawParameters(layout, groups, m, survey.scale().lowest(), coarse);
                p.read(draws, c, used[u]);
                at[c * used.length + u] = p;
            }
        }
        int n = survey.size();
        double[][] x = columns(survey.level());
        double[][] w = coarse ? columns(survey.style()) : new double[0][];
        int[] group = survey.group();
        byte[] category = survey.category();
        double[] elpd = new double[n];
        double[] effective = new double[n];
        double[] paretoK = new double[n];
        double[] mcse = new double[n];
        int block = 256;
        AtomicInteger next = new AtomicInteger();
        AtomicInteger finished = new AtomicInteger();
        Runnable worker = () -> {
            LeaveOneOut loo = new LeaveOneOut(chains, used.length);
            double[] logLikelihood = new double[s];
            for (int from = next.getAndAdd(block); from < n; from = next.getAndAdd(block)) {
                for (int i = from; i < Math.min(n, from + block); i++) {
                    int g = group[i];
                    int r = category[i];
                    int base = g * (m + 1);
                    for (int d = 0; d < s; d++) {
                        DrawParameters p = at[d];
                        double eta = p.alpha[g];
                        for (int j = 0; j < x.length; j++) {
                            eta += p.beta[j] * x[j][i];
                        }
                        double q = 0;
                        if (coarse) {
                            double zeta = p.gamma[g];
                            for (int j = 0; j < w.length; j++) {
                                zeta += p.delta[j] * w[j][i];
                            }
                            // held off 0 and 1, where log(q) or log(1 - q) would be minus infinity for a
                            // probit beyond about 8.3 (our guard, no source): a respondent's log-likelihood
                            // then stays finite, though no longer exact, that far out
                            q = Math.min(Math.max(StandardNormal.cdf(zeta), Double.MIN_NORMAL), 1 - 0x1p-53);
                        }
                        logLikelihood[d] = attraction
                                ? ResponseLikelihood.logRespondentAttracted(channel, p.thresholds, base, r, eta, q, p.attraction[g])
                                : ResponseLikelihood.logRespondent(channel, p.thresholds, base, r, eta, q);
                    }
                    loo.evaluate(logLikelihood);
                    elpd[i] = loo.elpd();
                    effective[i] = loo.effectiveParameters();
                    paretoK[i] = loo.paretoK();
                    mcse[i] = loo.mcse();
                }
                progress.done(finished.addAndGet(Math.min(n, from + block) - from), n);
            }
        };
        DerivedQuantities.run(worker, Math.max(1, Math.min(threads, (n + block - 1) / block)));
        return new CrossValidation(survey, s, elpd, effective, paretoK, mcse);
    }

    private static double[][] columns(Covariates covariates) {
        double[][] columns = new double[covariates.count()][];
        for (int j = 0; j < columns.length; j++) {
            columns[j] = covariates.column(j);
        }
        return columns;
    }

    /** Respondents. */
    public int size() {
        return elpd.length;
    }

    /** Respondent i's elpd_loo, Pareto k and Monte Carlo se, i in the survey's order. */
    double elpd(int i) {
        return elpd[i];
    }

    double paretoK(int i) {
        return paretoK[i];
    }

    double mcse(int i) {
        return mcse[i];
    }

    /** Draws per respondent. */
    public int draws() {
        return draws;
    }

    /** elpd_loo: the sum of the respondents' estimates. */
    public double elpd() {
        return LeaveOneOut.total(elpd);
    }

    /** Its standard error, sqrt(n) times the sd of the pointwise values (Vehtari et al. 2017, eq. 23). */
    public double elpdSe() {
        return LeaveOneOut.standardError(elpd);
    }

    /** p_loo: the effective number of parameters. */
    public double effectiveParameters() {
        return LeaveOneOut.total(effective);
    }

    public double effectiveParametersSe() {
        return LeaveOneOut.standardError(effective);
    }

    /** Monte Carlo standard error of elpd_loo: the root of the sum of the pointwise ones' squares. */
    public double mcse() {
        return LeaveOneOut.combinedMcse(mcse);
    }

    /** Respondents whose Pareto k is at most 0.5, in (0.5, 0.7], in (0.7, 1] and above 1 (loo 2.5.1's table). */
    public int[] paretoKCounts() {
        int[] counts = new int[4];
        for (double k : paretoK) {
            counts[k <= LeaveOneOut.GOOD_K ? 0 : k <= LeaveOneOut.RELIABLE_K ? 1 : k <= 1 ? 2 : 3]++;
        }
        return counts;
    }

    /** The figures of run.json. */
    public Map<String, Object> record() {
        Map<String, Object> r = new LinkedHashMap<>();
        r.put("method", "PSIS-LOO (Vehtari, Gelman & Gabry 2017)");
        r.put("draws", draws);
        r.put("respondents", size());
        r.put("elpd_loo", elpd());
        r.put("elpd_loo_se", elpdSe());
        r.put("elpd_loo_mcse", mcse());
        r.put("p_loo", effectiveParameters());
        r.put("p_loo_se", effectiveParametersSe());
        int[] counts = paretoKCounts();
        r.put("pareto_k_good", counts[0]);
        r.put("pareto_k_ok", counts[1]);
        r.put("pareto_k_bad", counts[2]);
        r.put("pareto_k_very_bad", counts[3]);
        return r;
    }

    /** The console's sentence. */
    public String describe() {
        int[] counts = paretoKCounts();
        int unreliable = counts[2] + counts[3];
        return String.format(Locale.ROOT,
                "Leave-one-out cross-validation (PSIS, %,d draws): elpd_loo %,.1f (se %.1f, Monte Carlo se %.2f), p_loo %.1f;"
                        + " Pareto k above %.1f for %,d of %,d respondents%s",
                draws, elpd(), elpdSe(), mcse(), effectiveParameters(), LeaveOneOut.RELIABLE_K, unreliable, size(),
                unreliable == 0 ? "." : " (their estimates are unreliable; cross_validation.csv lists them).");
    }

    /**
     * cross_validation.csv: per respondent, in the order of the file's rows (or of the survey
     * without them), its row, rating, elpd_loo, p_loo, Pareto k, the Monte Carlo se and its group
     * (last, as the only text).
     */
    public void write(Path file) throws IOException {
        Integer[] order = new Integer[size()];
        for (int i = 0; i < order.length; i++) {
            order[i] = i;
        }
        if (row != null) {
            Arrays.sort(order, (a, b) -> Integer.compare(row[a], row[b]));
        }
        try (BufferedWriter out = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            out.write("row,rating,elpd_loo,p_loo,pareto_k,mcse_elpd_loo,group\n");
            for (int i : order) {
                out.write(Integer.toString(row == null ? i + 1 : row[i]));
                out.write(',');
                out.write(Integer.toString(lowest + category[i]));
                out.write(',');
                out.write(Double.toString(elpd[i]));
                out.write(',');
                out.write(Double.toString(effective[i]));
                out.write(',');
                out.write(Double.toString(paretoK[i]));
                out.write(',');
                out.write(Double.toString(mcse[i]));
                out.write(',');
                out.write(CsvField.quote(groupLabels.get(group[i])));
                out.write('\n');
            }
        }
    }
}
