package org.rungs.sampler;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import org.apache.commons.rng.RestorableUniformRandomProvider;
import org.rungs.models.ModelSpec;
import org.rungs.models.ParameterLayout;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;

/**
 * Fits the model of MODEL.md to a survey: runs the chains, each on its own random stream, in a
 * pool of threads, and collects their kept draws. The number of threads never changes a draw.
 */
public final class Fitter {
    private Fitter() {
    }

    /**
     * The survey with its rows in the order the chains read them (by group, then reported
     * category). Respondents are exchangeable, so nothing else changes; fitting a survey already
     * in this order makes no second copy of its columns.
     */
    public static Survey sorted(Survey survey) {
        return SurveyOrder.of(survey).survey();
    }

    /**
     * Runs the chains of {@code settings} on {@code survey}.
     *
     * @param stop set it to end every chain after its current iteration; the draws kept so far
     *             (the same number for every chain) are returned
     */
    public static FitResult fit(Survey survey, ModelSpec spec, SamplerSettings settings,
                                ProgressListener progress, AtomicBoolean stop) {
        return fit(survey, spec, settings, progress, stop, Checkpoints.none());
    }

    /**
     * Waits until every chain has stopped, so that no chain writes a draw or a checkpoint after the
     * fit has returned or thrown (a failed or interrupted fit must leave nothing being written).
     */
    private static void awaitChains(ExecutorService pool) {
        boolean interrupted = false;
        while (!pool.isTerminated()) {
            try {
                pool.awaitTermination(1, TimeUnit.SECONDS); // chains check the stop flag once per iteration
            } catch (InterruptedException e) {
                interrupted = true;
            }
        }
        if (interrupted) {
            Thread.currentThread().interrupt();
        }
    }

    /**
     * As {@link #fit(Survey, ModelSpec, SamplerSettings, ProgressListener, AtomicBoolean)}, saving
     * each chain to {@code checkpoints} (and resuming from it when asked).
     *
     * @throws UncheckedIOException when a checkpoint cannot be written, or read back on resume
     */
    public static FitResult fit(Survey survey, ModelSpec spec, SamplerSettings settings,
                                ProgressListener progress, AtomicBoolean stop, Checkpoints checkpoints) {
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        SurveyOrder order = SurveyOrder.of(survey, spec.attraction().on());
        boolean byGroup = spec.effectiveThresholdMode(survey.groupCount()) == ThresholdMode.BY_GROUP;
        Draws draws = new Draws(layout.names(), settings.chains(), settings.draws());
        int[] kept = new int[settings.chains()];
        double[] acceptance = new double[settings.chains()];
        double[] joint = new double[settings.chains()];
        double[] leapfrogSteps = new double[settings.chains()];
        double[] walls = new double[settings.chains()];
        double[] skipped = new double[settings.chains()];
        long start = System.nanoTime();
        ExecutorService pool = Executors.newFixedThreadPool(Math.min(settings.threads(), settings.chains()), r -> {
            Thread t = new Thread(r, "rungs-chain");
            t.setDaemon(true);
            return t;
        });
        try {
            List<Future<?>> futures = new ArrayList<>();
            for (int c = 0; c < settings.chains(); c++) {
                int chain = c;
                futures.add(pool.submit(() -> {
                    RestorableUniformRandomProvider rng = ChainSeeds.stream(settings.seed(), chain);
                    Chain run = Chain.of(order, spec, byGroup, settings.warmup(), rng);
                    try (ChainCheckpoint checkpoint = checkpoints.open(chain, settings, layout.size())) {
                        kept[chain] = run.run(chain, settings, layout, draws, progress, stop, checkpoint);
                    } catch (IOException e) {
                        throw new UncheckedIOException("checkpoint of chain " + (chain + 1) + ": " + e.getMessage(), e);
                    }
                    acceptance[chain] = run.thresholdAcceptance();
                    joint[chain] = run.jointAcceptance();
                    leapfrogSteps[chain] = run.jointLeapfrogSteps();
                    walls[chain] = run.jointWallShare();
                    skipped[chain] = run.latentStepsSkipped();
                }));
            }
            for (Future<?> f : futures) {
                f.get();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            stop.set(true);
        } catch (ExecutionException e) {
            stop.set(true); // the other chains end at their next iteration
            Throwable cause = e.getCause();
            if (cause instanceof RuntimeException) {
                throw (RuntimeException) cause;
            }
            throw new IllegalStateException(cause);
        } finally {
            pool.shutdownNow();
            awaitChains(pool);
        }
        int common = settings.draws();
        for (int k : kept) {
            common = Math.min(common, k);
        }
        boolean interrupted = common < settings.draws();
        Draws result = interrupted ? draws.withIterations(common) : draws;
        return new FitResult(result, layout, settings, (System.nanoTime() - start) / 1e9, acceptance, joint, leapfrogSteps, walls, skipped,
                interrupted);
    }
}
