package org.rungs.sampler.derived;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicInteger;
import org.apache.commons.rng.simple.RandomSource;
import org.rungs.models.ModelSpec;
import org.rungs.models.ParameterLayout;
import org.rungs.models.RoundingChannel;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.DrawsCsv;
import org.rungs.posteriors.ParameterSummary;

/**
 * The derived quantities of MODEL.md section 6, computed per posterior draw so that their
 * uncertainty, R-hat and ESS follow from the draws. Columns of the derived draws, with
 * {@code <label>} a group label and {@code <k>} a rating:
 * <ul>
 * <li>{@code intended_share.<label>.<k>}, {@code harmonised_share.<label>.<k>}: p_int[g,k] with the
 * group's own and with the common thresholds, weighted by the survey weights;
 * <li>{@code intended_mean.<label>}, {@code harmonised_mean.<label>}, {@code mean_bias.<label>}
 * (observed weighted mean minus intended mean);
 * <li>with number attraction only, {@code attracted_share.<label>.<k>}: coarse rounding removed,
 * attraction kept, the weighted mean over the group of pi[g,k](eta_i) exp(a[g,k]) / sum_k
 * pi[g,k](eta_i) exp(a[g,k]) (MODEL.md 4b); {@code attracted_mean.<label>}; and the mean bias
 * split as {@code mean_bias = mean_bias_rounding + mean_bias_attraction}:
 * {@code mean_bias_attraction.<label>} = attracted minus intended mean,
 * {@code mean_bias_rounding.<label>} = reported minus attracted mean (coarse rounding, plus the
 * difference between the observed mean and its expectation under the model);
 * <li>{@code coarse_share.<label>} and {@code coarse_share_by.<column>=<level>}, the weighted mean of
 * q_i in a group and at each level (reference included) of a categorical style covariate, with
 * the coarse class only;
 * <li>{@code rank_intended.<label>}, {@code rank_harmonised.<label>}: 1 for the highest mean;
 * <li>{@code ame.<covariate>} (per internal unit; for an indicator, the weighted mean change of
 * the intended expected rating from the column's reference level to this level, the other
 * covariates as observed) and {@code ame.<covariate>.per_unit} (numeric columns, per unit of the
 * user's column);
 * <li>{@code replicated.<label>.<k>}: a posterior predictive count of rating k (MODEL.md 4c), the
 * full-scale answers drawn with attraction when it is on.
 * </ul>
 */
public final class DerivedQuantities {
    private DerivedQuantities() {
    }

    /**
     * Derived scalars of up to {@code maxDraws} draws: every t-th kept iteration of every chain,
     * the same iterations in each, at least one per chain. Draws are shared out over
     * {@code threads} workers; the predictive counts of draw (chain, iteration) come from a
     * generator seeded from (seed, chain, iteration) alone, so the result does not depend on
     * {@code threads}.
     *
     * @param draws the fit's draws, columns in the order of {@code layout}
     */
    public static DerivedResult compute(Survey survey, Draws draws, ParameterLayout layout, ModelSpec spec,
            int maxDraws, long seed, int threads) {
        return compute(survey, draws, layout, spec, maxDraws, seed, threads, WorkProgress.NONE);
    }

    /** As above, telling {@code progress} of every draw evaluated. */
    public static DerivedResult compute(Survey survey, Draws draws, ParameterLayout layout, ModelSpec spec,
            int maxDraws, long seed, int threads, WorkProgress progress) {
        int[] used = usedIterations(draws, layout, maxDraws, threads);
        int groups = survey.groupCount();
        int m = survey.scale().categories();
        int lowest = survey.scale().lowest();
        byte[] category = survey.category();
        int[] group = survey.group();
        double[] weight = survey.weight();
        int[][] counts = new int[groups][m];
        double[][] shares = new double[groups][m];
        double[] groupWeight = groupWeights(survey);
        for (int i = 0; i < survey.size(); i++) {
            double w = weight == null ? 1 : weight[i];
            counts[group[i]][category[i]]++;
            shares[group[i]][category[i]] += w;
        }
        double[] reportedMeans = new double[groups];
        for (int g = 0; g < groups; g++) {
            for (int k = 0; k < m; k++) {
                shares[g][k] /= groupWeight[g];
                reportedMeans[g] += (lowest + k) * shares[g][k];
            }
        }
        boolean coarse = spec.styleClasses().coarse();
        RoundingChannel channel = coarse
                ? RoundingChannel.of(survey.scale(), spec.styleClasses().points(survey.scale())) : null;
        StylePartition partition = partition(survey, spec);
        boolean attraction = layout.attractionSet().length > 0;
        DerivedColumns columns = columns(survey, layout, spec, partition);
        Draws derived = evaluate(survey, draws, layout, columns, channel, partition, groupWeight, reportedMeans, used,
                seed, threads, progress);
        return new DerivedResult(derived, survey.groupLabels(), survey.scale(), used, counts, shares, reportedMeans,
                coarse, attraction, partition.levels);
    }

    /**
     * The draws {@link #compute} may use so that its table holds at most {@code values} numbers:
     * {@code most}, fewer when the derived quantities are many (many groups), never fewer than
     * {@code least}.
     */
    public static int drawsWithin(Survey survey, ParameterLayout layout, ModelSpec spec, int most, int least,
            long values) {
        int width = columns(survey, layout, spec, partition(survey, spec)).names.size();
        return (int) Math.max(least, Math.min(most, values / Math.max(1, width)));
    }

    private static StylePartition partition(Survey survey, ModelSpec spec) {
        return spec.styleClasses().coarse() ? StylePartition.of(survey.style(), survey.size(), survey.weight())
                : StylePartition.empty();
    }

    private static DerivedColumns columns(Survey survey, ParameterLayout layout, ModelSpec spec,
            StylePartition partition) {
        return new DerivedColumns(survey.groupLabels(), survey.scale(), survey.level(), spec.styleClasses().coarse(),
                layout.attractionSet().length > 0, partition.levels);
    }

    /**
     * The average marginal effects alone ({@code ame.<covariate>} and {@code .per_unit}, as in
     * {@link #compute}) of the same draws {@code compute} would use: what the comparison of effects
     * reads from the plain ordered probit, at a fraction of the cost of every derived quantity.
     */
    public static Draws effects(Survey survey, Draws draws, ParameterLayout layout, int maxDraws, int threads) {
        int[] used = usedIterations(draws, layout, maxDraws, threads);
        DerivedColumns columns = DerivedColumns.effects(survey.groupLabels(), survey.scale(), survey.level());
        // no random numbers are drawn for the effects, so the seed is immaterial
        return evaluate(survey, draws, layout, columns, null, StylePartition.empty(), groupWeights(survey),
                new double[survey.groupCount()], used, 0, threads, WorkProgress.NONE);
    }

    private static int[] usedIterations(Draws draws, ParameterLayout layout, int maxDraws, int threads) {
        if (maxDraws < 1 || threads < 1) {
            throw new IllegalArgumentException("maxDraws and threads must be at least 1, got " + maxDraws + " and " + threads);
        }
        if (draws.iterations() == 0) {
            throw new IllegalArgumentException("no draws: every chain has 0 iterations");
        }
        if (!draws.names().subList(0, Math.min(layout.size(), draws.parameterCount())).equals(layout.names())) {
            throw new IllegalArgumentException("the draws' columns do not follow the parameter layout of this survey and model");
        }
        return usedIterations(draws.chains(), draws.iterations(), maxDraws);
    }

    private static double[] groupWeights(Survey survey) {
        double[] groupWeight = new double[survey.groupCount()];
        double[] weight = survey.weight();
        int[] group = survey.group();
        for (int i = 0; i < survey.size(); i++) {
            groupWeight[group[i]] += weight == null ? 1 : weight[i];
        }
        return groupWeight;
    }

    /** Every used draw of every chain evaluated into {@code columns}, shared out over {@code threads} workers. */
    private static Draws evaluate(Survey survey, Draws draws, ParameterLayout layout, DerivedColumns columns,
            RoundingChannel channel, StylePartition partition, double[] groupWeight, double[] reportedMeans, int[] used,
            long seed, int threads, WorkProgress progress) {
        Draws derived = new Draws(columns.names, draws.chains(), used.length);
        int total = draws.chains() * used.length;
        AtomicInteger next = new AtomicInteger();
        AtomicInteger finished = new AtomicInteger();
        Runnable worker = () -> {
            DrawEvaluator evaluator = new DrawEvaluator(survey, layout, columns, channel, partition, groupWeight,
                    reportedMeans);
            double[] row = new double[columns.names.size()];
            for (int d = next.getAndIncrement(); d < total; d = next.getAndIncrement()) {
                int chain = d / used.length;
                int u = d % used.length;
                evaluator.evaluate(draws, chain, used[u],
                        RandomSource.XO_RO_SHI_RO_128_PP.create(drawSeed(seed, chain, used[u])), row);
                derived.putRow(chain, u, row);
                progress.done(finished.incrementAndGet(), total);
            }
        };
        run(worker, Math.min(threads, total));
        return derived;
    }

    /** groups.csv: one row per group with the means, bias, coarse share and ranks; see {@link DerivedTables}. */
    public static void writeGroups(DerivedResult r, List<ParameterSummary> derivedSummaries, Path file) throws IOException {
        DerivedTables.writeGroups(r, derivedSummaries, file);
    }

    /** distributions.csv: per group and rating, observed, intended, harmonised, attracted (attraction on) and replicated. */
    public static void writeDistributions(DerivedResult r, List<ParameterSummary> derivedSummaries, Path file)
            throws IOException {
        DerivedTables.writeDistributions(r, derivedSummaries, file);
    }

    /**
     * derived_draws.csv: the derived quantities per used draw, each row numbered with the
     * iteration its draw has in draws.csv, so that the two files can be matched row by row.
     */
    public static void writeDraws(DerivedResult r, Path file) throws IOException {
        int[] iterations = new int[r.usedIterations().length];
        for (int u = 0; u < iterations.length; u++) {
            iterations[u] = r.usedIterations()[u] + 1;
        }
        DrawsCsv.write(r.draws(), iterations, file);
    }

    /** coarse_shares.csv: the coarse share at each level of each categorical style covariate. */
    public static void writeCoarseShares(DerivedResult r, List<ParameterSummary> derivedSummaries, Path file)
            throws IOException {
        DerivedTables.writeCoarseShares(r, derivedSummaries, file);
    }

    /** Every t-th of {@code iterations}, t the smallest stride that keeps at most maxDraws over all chains. */
    static int[] usedIterations(int chains, int iterations, int maxDraws) {
        int perChain = Math.max(1, Math.min(iterations, maxDraws / chains));
        int stride = (iterations + perChain - 1) / perChain;
        int[] used = new int[(iterations + stride - 1) / stride];
        for (int u = 0; u < used.length; u++) {
            used[u] = u * stride;
        }
        return used;
    }

    /**
     * Seed of draw (chain, iteration) under {@code seed} through the SplitMix64 finaliser
     * (Steele, Lea & Flood 2014, OOPSLA), as the chains' own streams are seeded.
     */
    static long[] drawSeed(long seed, int chain, int iteration) {
        long a = mix(mix(seed + 0x9E3779B97F4A7C15L * (2L * chain + 1)) + 0xBF58476D1CE4E5B9L * (2L * iteration + 1));
        long b = mix(a ^ 0xD1B54A32D192ED03L);
        return new long[] {a, b};
    }

    private static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    /** Runs {@code worker} on {@code workers} threads at once and waits for all of them. */
    static void run(Runnable worker, int workers) {
        if (workers == 1) {
            worker.run();
            return;
        }
        ExecutorService pool = Executors.newFixedThreadPool(workers, task -> {
            Thread t = new Thread(task, "derived-quantities");
            t.setDaemon(true);
            return t;
        });
        try {
            List<Future<?>> futures = new ArrayList<>();
            for (int w = 0; w < workers; w++) {
                futures.add(pool.submit(worker));
            }
            for (Future<?> f : futures) {
                f.get();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while computing derived quantities", e);
        } catch (ExecutionException e) {
            Throwable cause = e.getCause();
            if (cause instanceof RuntimeException) {
                throw (RuntimeException) cause;
            }
            if (cause instanceof Error) {
                throw (Error) cause;
            }
            throw new IllegalStateException(cause);
        } finally {
            pool.shutdownNow();
        }
    }
}
