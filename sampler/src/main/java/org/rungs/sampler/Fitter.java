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
 * Fits the model of MODEL.md to a survey: runs the chains, each on its own random stream, on a
 * pool of threads that take turns on them in stretches ({@link Turns}), and collects their kept
 * draws. The number of threads never changes a draw.
 */
public final class Fitter {
    /** How long a thread runs one chain before it turns to the chain furthest behind. */
    private static final long STRETCH_NANOS = 500_000_000L;

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
        return fit(survey, spec, settings, progress, stop, checkpoints, STRETCH_NANOS);
    }

    /** As above, a thread turning to another chain after {@code stretchNanos} on one (tests: 0, every iteration). */
    static FitResult fit(Survey survey, ModelSpec spec, SamplerSettings settings, ProgressListener progress,
                         AtomicBoolean stop, Checkpoints checkpoints, long stretchNanos) {
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
        String[] spreads = new String[settings.chains()];
        long start = System.nanoTime();
        int threads = Math.min(settings.threads(), settings.chains());
        ChainRun[] runs = new ChainRun[settings.chains()];
        ChainCheckpoint[] opened = new ChainCheckpoint[settings.chains()];
        Turns turns = new Turns(settings.chains());
        progress.threads(threads);
        if (Chain.hasJointStep(spec, survey.scale()) && settings.warmup() >= 2) {
            progress.dearerFrom(JointHamiltonianUpdate.buildAt(settings.warmup()));
        }
        for (int chain = 0; chain < settings.chains(); chain++) {
            // every resumed chain's position is shown from the start, a finished one as done,
            // though a thread may reach it only after a stretch of the others
            opened[chain] = checkpoints.open(chain, settings, layout.size());
            try {
                ChainCheckpoint.Position saved = opened[chain] == null ? null : opened[chain].saved();
                if (saved != null && saved.iterations() > 0) {
                    progress.resumed(chain, saved.iterations(), settings.iterations(), saved.iterations() <= settings.warmup());
                }
            } catch (IOException e) {
                throw new UncheckedIOException("checkpoint of chain " + (chain + 1) + ": " + e.getMessage(), e);
            }
        }
        ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "rungs-chain");
            t.setDaemon(true);
            return t;
        });
        try {
            List<Future<?>> futures = new ArrayList<>();
            for (int w = 0; w < threads; w++) {
                futures.add(pool.submit(() -> {
                    for (int chain = turns.take(runs); chain >= 0; chain = turns.take(runs)) {
                        boolean ended = false;
                        try {
                            if (runs[chain] == null) {
                                RestorableUniformRandomProvider rng = ChainSeeds.stream(settings.seed(), chain);
                                Chain c = Chain.of(order, spec, byGroup, settings.warmup(), rng);
                                runs[chain] = new ChainRun(c, chain, settings, layout, draws, progress, opened[chain]);
                            }
                            ChainRun run = runs[chain];
                            if (!run.advance(stop, stretchNanos) || stop.get()) {
                                ended = true;
                                run.end();
                                closeCheckpoint(opened[chain]);
                                Chain c = run.chain();
                                kept[chain] = run.kept();
                                acceptance[chain] = c.thresholdAcceptance();
                                joint[chain] = c.jointAcceptance();
                                leapfrogSteps[chain] = c.jointLeapfrogSteps();
                                walls[chain] = c.jointWallShare();
                                skipped[chain] = c.latentStepsSkipped();
                                spreads[chain] = c.spreadMoves();
                            }
                        } catch (IOException e) {
                            ended = true;
                            fail(stop, turns, opened[chain]);
                            throw new UncheckedIOException("checkpoint of chain " + (chain + 1) + ": " + e.getMessage(), e);
                        } catch (RuntimeException | Error e) {
                            ended = true;
                            fail(stop, turns, opened[chain]);
                            throw e;
                        } finally {
                            turns.release(chain, ended);
                        }
                    }
                    return null;
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
                spreads, interrupted);
    }

    /**
     * Which chain a free thread runs next: of the chains neither running nor ended, the one with
     * the fewest iterations done (one not yet begun first). Chains then advance together and end
     * at about the same time, however much their sweeps' costs differ, so no thread idles while
     * one slow chain finishes; and no more chains run at once than there are threads.
     */
    private static final class Turns {
        private final boolean[] running;
        private final boolean[] ended;
        private boolean failed;

        Turns(int chains) {
            running = new boolean[chains];
            ended = new boolean[chains];
        }

        /** The chain to run next, now marked running, or -1 when none is free. */
        synchronized int take(ChainRun[] runs) {
            int next = -1;
            int fewest = Integer.MAX_VALUE;
            for (int c = 0; c < running.length; c++) {
                if (running[c] || ended[c] || failed && runs[c] == null) {
                    continue;
                }
                int done = runs[c] == null ? -1 : runs[c].iterations();
                if (done < fewest) {
                    next = c;
                    fewest = done;
                }
            }
            if (next >= 0) {
                running[next] = true;
            }
            return next;
        }

        synchronized void release(int chain, boolean end) {
            running[chain] = false;
            ended[chain] |= end;
        }

        /** A chain failed: the chains begun end (saving their checkpoints); the others never begin. */
        synchronized void fail() {
            failed = true;
        }
    }

    private static void closeCheckpoint(ChainCheckpoint checkpoint) throws IOException {
        if (checkpoint != null) {
            checkpoint.close();
        }
    }

    /**
     * A chain failed: the chains begun end at their next iteration, the others never begin, and
     * its checkpoint is closed unsaved.
     */
    private static void fail(AtomicBoolean stop, Turns turns, ChainCheckpoint checkpoint) {
        turns.fail();
        stop.set(true);
        if (checkpoint != null) {
            try {
                checkpoint.close();
            } catch (IOException ignored) {
                // the failure being reported says more
            }
        }
    }
}
