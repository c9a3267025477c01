package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.RoundingChannel;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.priors.Priors;

/**
 * Stopping a fit at a pseudo-random iteration and resuming it from its checkpoint gives draws
 * identical, bit for bit, to those of the uninterrupted fit, with the coarse class on (every
 * stateful update in the sweep), once, twice, and after a simulated kill that leaves the draws
 * file ahead of the saved state. Exact equality is the contract, so there is no tolerance.
 */
final class CheckpointTest {
    /** 2 chains in 2 threads, so the chains stop at different iterations. */
    private static final SamplerSettings SETTINGS = new SamplerSettings(2, 30, 40, 17L, 2);
    private static final int TOTAL = 70;
    /** Long enough that only the saves at a stop or at the end happen, unless a test asks for more. */
    private static final double RARELY = 3600;

    @TempDir
    Path dir;

    private static Survey survey() {
        Survey plain = FitterTest.smallSurvey(11L, 40);
        Covariates style = Covariates.fromNumeric(List.of("w"), List.of(plain.level().column(0).clone()));
        return Survey.of(plain.scale(), plain.category(), plain.group(), List.of("north", "south", "east", "west"),
                plain.level(), style, null);
    }

    private static ModelSpec spec() {
        return new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.coarse(null));
    }

    /** A listener that sets {@code stop} once chain 0 has finished {@code at} iterations. */
    private static ProgressListener stopAt(int at, AtomicBoolean stop) {
        return (chain, done, total, warmingUp) -> {
            if (chain == 0 && done == at) {
                stop.set(true);
            }
        };
    }

    private static FitResult fit(ProgressListener progress, AtomicBoolean stop, Checkpoints checkpoints) {
        return Fitter.fit(survey(), spec(), SETTINGS, progress, stop, checkpoints);
    }

    /**
     * Thinned: 30 warm-up iterations, then 15 draws kept one in 3. Stopped after 40 iterations
     * (between kept draws) and resumed, the chains give the uninterrupted fit's draws.
     */
    @Test
    void resumingAThinnedFitReproducesItsDraws() {
        SamplerSettings thinned = new SamplerSettings(2, 30, 15, 17L, 2, 3);
        Draws reference = Fitter.fit(survey(), spec(), thinned, ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none()).draws();
        assertEquals(15, reference.iterations());
        Path here = dir.resolve("thinned");
        AtomicBoolean stop = new AtomicBoolean();
        assertTrue(Fitter.fit(survey(), spec(), thinned, stopAt(40, stop), stop, Checkpoints.start(here, RARELY)).interrupted());
        FitResult resumed = Fitter.fit(survey(), spec(), thinned, ProgressListener.NONE, new AtomicBoolean(),
                Checkpoints.resume(here, RARELY));
        assertSameDraws(reference, resumed.draws());
    }

    /**
     * Under number attraction the sweep holds {@link BoundedRedrawSteps}, which saves its counters
     * and its steps' state: stopped at iteration 45 (while sampling) and resumed, the chains give the
     * uninterrupted fit's draws and the same share of skipped sweeps.
     */
    @Test
    void resumingAnAttractionFitReproducesItsDraws() {
        assertAttractionFitResumes(45);
    }

    /**
     * Stopped in warm-up between the joint step's build (iteration 15) and its last refit (26),
     * where under attraction it has kept warm-up states for the refit and its change of variables
     * ({@link CoordinateWarp}): resumed, the chains give the uninterrupted fit's draws.
     */
    @Test
    void resumingAnAttractionFitStoppedInWarmupReproducesItsDraws() {
        assertAttractionFitResumes(24);
    }

    /**
     * 100 groups of 4 on 0..10 with the coarse class: 1,112 coordinates, so the joint step's
     * metric is an {@link ArrowMetric}. Stopped in warm-up after the build (15) and before the
     * refits (22 and 26), or between them, and resumed, the chains give the uninterrupted fit's
     * draws.
     */
    @Test
    void resumingAFitOfManyGroupsReproducesItsDraws() {
        Survey survey = FitterTest.manyGroups(100, 4, 23L);
        ChainState state = new ChainState(SurveyOrder.of(survey), true,
                RoundingChannel.of(survey.scale(), RoundingChannel.defaultPoints(survey.scale())), new int[0]);
        assertTrue(JointHamiltonianUpdate.of(state, Priors.defaults(), 30, org.apache.commons.rng.simple.RandomSource.XO_RO_SHI_RO_128_PP.create(1L)).sparseMetric());
        Draws reference = Fitter.fit(survey, spec(), SETTINGS, ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none()).draws();
        for (int at : new int[] {20, 24}) {
            Path here = dir.resolve("many-groups-" + at);
            AtomicBoolean stop = new AtomicBoolean();
            assertTrue(Fitter.fit(survey, spec(), SETTINGS, stopAt(at, stop), stop, Checkpoints.start(here, RARELY)).interrupted());
            FitResult resumed = Fitter.fit(survey, spec(), SETTINGS, ProgressListener.NONE, new AtomicBoolean(),
                    Checkpoints.resume(here, RARELY));
            assertSameDraws(reference, resumed.draws());
        }
    }

    /**
     * 40 groups of 30 drawn alike, 240 warm-up sweeps: {@link CollapsedSpreadUpdate} keeps the
     * log spreads of sweeps 135 to 179 and, at 180, starts the moves of the slow ones. Stopped in
     * that window (150) or after it (200) and resumed, the chains give the uninterrupted fit's
     * draws and the same moves.
     */
    @Test
    void resumingAFitWhoseSpreadMovesStartInWarmupReproducesItsDraws() {
        Survey survey = FitterTest.manyGroups(40, 30, 3L);
        SamplerSettings settings = new SamplerSettings(2, 240, 20, 17L, 2);
        FitResult reference = Fitter.fit(survey, spec(), settings, ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none());
        assertTrue(java.util.Arrays.stream(reference.spreadMoves()).anyMatch(moved -> !moved.equals("none")),
                String.join("; ", reference.spreadMoves()));
        for (int at : new int[] {150, 200}) {
            Path here = dir.resolve("spread-moves-" + at);
            AtomicBoolean stop = new AtomicBoolean();
            assertTrue(Fitter.fit(survey, spec(), settings, stopAt(at, stop), stop, Checkpoints.start(here, RARELY)).interrupted());
            FitResult resumed = Fitter.fit(survey, spec(), settings, ProgressListener.NONE, new AtomicBoolean(),
                    Checkpoints.resume(here, RARELY));
            assertSameDraws(reference.draws(), resumed.draws());
            assertArrayEquals(reference.spreadMoves(), resumed.spreadMoves());
        }
    }

    /** An attraction fit stopped after chain 0's iteration {@code at} and resumed gives the uninterrupted fit's draws. */
    private void assertAttractionFitResumes(int at) {
        ModelSpec attraction = spec().withAttraction(NumberAttraction.of(2, 4));
        Draws reference = Fitter.fit(survey(), attraction, SETTINGS, ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none()).draws();
        Path here = dir.resolve("attraction-" + at);
        AtomicBoolean stop = new AtomicBoolean();
        assertTrue(Fitter.fit(survey(), attraction, SETTINGS, stopAt(at, stop), stop, Checkpoints.start(here, RARELY)).interrupted());
        FitResult resumed = Fitter.fit(survey(), attraction, SETTINGS, ProgressListener.NONE, new AtomicBoolean(),
                Checkpoints.resume(here, RARELY));
        assertSameDraws(reference, resumed.draws());
    }

    /**
     * The same with a 0/1 style covariate, whose two rows put the sweep on the counted class moves
     * without probit latents and on the force's tables per row (ChainState.styleRows); on one
     * thread too, the same draws.
     */
    @Test
    void resumingAnAttractionFitWithACategoricalStyleCovariateReproducesItsDraws() {
        Survey plain = survey();
        double[] w = new double[plain.size()];
        for (int i = 0; i < w.length; i++) {
            w[i] = i % 3 == 0 ? 1 : 0;
        }
        Survey survey = Survey.of(plain.scale(), plain.category(), plain.group(), List.of("north", "south", "east", "west"),
                plain.level(), Covariates.fromNumeric(List.of("w"), List.of(w)), null);
        int[] numbers = {2, 4};
        ChainState state = new ChainState(SurveyOrder.of(survey, true), true,
                RoundingChannel.of(survey.scale(), RoundingChannel.defaultPoints(survey.scale())), numbers);
        assertEquals(2, state.styleRows.count());
        ModelSpec attraction = spec().withAttraction(NumberAttraction.of(numbers));
        Draws reference = Fitter.fit(survey, attraction, SETTINGS, ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none()).draws();
        SamplerSettings oneThread = new SamplerSettings(2, 30, 40, 17L, 1);
        assertSameDraws(reference, Fitter.fit(survey, attraction, oneThread, ProgressListener.NONE, new AtomicBoolean(),
                Checkpoints.none()).draws());
        Path here = dir.resolve("categorical");
        AtomicBoolean stop = new AtomicBoolean();
        assertTrue(Fitter.fit(survey, attraction, SETTINGS, stopAt(45, stop), stop, Checkpoints.start(here, RARELY)).interrupted());
        FitResult resumed = Fitter.fit(survey, attraction, SETTINGS, ProgressListener.NONE, new AtomicBoolean(),
                Checkpoints.resume(here, RARELY));
        assertSameDraws(reference, resumed.draws());
    }

    private static void assertSameDraws(Draws expected, Draws actual) {
        assertEquals(expected.names(), actual.names());
        assertEquals(expected.iterations(), actual.iterations());
        for (int p = 0; p < expected.parameterCount(); p++) {
            for (int c = 0; c < expected.chains(); c++) {
                assertArrayEquals(expected.chainsOf(p)[c], actual.chainsOf(p)[c], expected.names().get(p) + ", chain " + c);
            }
        }
    }

    @Test
    void resumingAfterOneOrTwoStopsReproducesTheUninterruptedDraws() {
        Draws reference = fit(ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none()).draws();
        SplittableRandom random = new SplittableRandom(20261202L);
        for (int stops = 1; stops <= 2; stops++) {
            Path here = dir.resolve("stops-" + stops);
            int first = 1 + random.nextInt(TOTAL - 2);
            AtomicBoolean stop = new AtomicBoolean();
            FitResult part = fit(stopAt(first, stop), stop, Checkpoints.start(here, RARELY));
            assertTrue(part.interrupted(), "stopped at iteration " + first);
            if (stops == 2) {
                int second = first + 1 + random.nextInt(TOTAL - first - 1);
                AtomicBoolean again = new AtomicBoolean();
                assertTrue(fit(stopAt(second, again), again, Checkpoints.resume(here, RARELY)).interrupted(),
                        "stopped again at iteration " + second);
            }
            FitResult resumed = fit(ProgressListener.NONE, new AtomicBoolean(), Checkpoints.resume(here, RARELY));
            assertFalse(resumed.interrupted());
            assertSameDraws(reference, resumed.draws());
            assertArrayEquals(fit(ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none()).thresholdAcceptance(),
                    resumed.thresholdAcceptance(), "acceptance counters are part of the state");
        }
    }

    /**
     * A kill leaves the state of the last save and a draws file that may hold later draws: the
     * state files are copied when chain 0 reaches a pseudo-random iteration (saving at every
     * iteration), the fit runs on to the end, then the copies are put back as a kill would have left them.
     */
    @Test
    void resumingAfterAKillDropsTheDrawsPastTheSavedState() throws IOException {
        Draws reference = fit(ProgressListener.NONE, new AtomicBoolean(), Checkpoints.none()).draws();
        Path snapshot = Files.createDirectories(dir.resolve("snapshot"));
        Path here = dir.resolve("killed");
        int at = 31 + new SplittableRandom(7L).nextInt(TOTAL - 32);
        ProgressListener copyAt = (chain, done, total, warmingUp) -> {
            if (chain == 0 && done == at) {
                try {
                    for (int c = 0; c < SETTINGS.chains(); c++) {
                        Path saved = here.resolve("chain-" + c + ".bin");
                        if (Files.exists(saved)) {
                            Files.copy(saved, snapshot.resolve(saved.getFileName()), StandardCopyOption.REPLACE_EXISTING);
                        }
                    }
                } catch (IOException e) {
                    throw new UncheckedIOException(e);
                }
            }
        };
        assertFalse(fit(copyAt, new AtomicBoolean(), Checkpoints.start(here, 0)).interrupted());
        assertTrue(Files.exists(snapshot.resolve("chain-0.bin")), "chain 0 had saved before iteration " + at);
        for (int c = 0; c < SETTINGS.chains(); c++) {
            Path copy = snapshot.resolve("chain-" + c + ".bin");
            Path saved = here.resolve("chain-" + c + ".bin");
            if (Files.exists(copy)) {
                Files.copy(copy, saved, StandardCopyOption.REPLACE_EXISTING);
            } else {
                Files.delete(saved);
            }
        }
        assertTrue(Files.size(here.resolve("draws-0.bin")) > (long) (at - 1 - SETTINGS.warmup()) * reference.parameterCount() * Double.BYTES,
                "the draws file ran ahead of the restored state");
        assertSameDraws(reference, fit(ProgressListener.NONE, new AtomicBoolean(), Checkpoints.resume(here, RARELY)).draws());
    }

    /**
     * A chain restored finished shows as done from the first progress line, though its thread
     * reaches it only after the other chain: chain 1 saved at iteration 10 and chain 2 finished
     * (its files copied from a whole fit), resumed on one thread that runs chain 1 through first.
     */
    @Test
    void aChainRestoredFinishedIsShownDoneFromTheStart() throws IOException {
        SamplerSettings oneThread = new SamplerSettings(2, 30, 40, 17L, 1);
        Path partial = dir.resolve("partial");
        Path whole = dir.resolve("whole");
        AtomicBoolean stop = new AtomicBoolean();
        Fitter.fit(survey(), spec(), oneThread, stopAt(10, stop), stop, Checkpoints.start(partial, RARELY), Long.MAX_VALUE);
        Fitter.fit(survey(), spec(), oneThread, ProgressListener.NONE, new AtomicBoolean(), Checkpoints.start(whole, RARELY), Long.MAX_VALUE);
        for (String file : List.of("chain-1.bin", "draws-1.bin")) {
            Files.copy(whole.resolve(file), partial.resolve(file), StandardCopyOption.REPLACE_EXISTING);
        }
        ByteArrayOutputStream lines = new ByteArrayOutputStream();
        ConsoleProgress progress = new ConsoleProgress(new PrintStream(lines, true, StandardCharsets.UTF_8), 2, RARELY);
        assertFalse(Fitter.fit(survey(), spec(), oneThread, progress, new AtomicBoolean(), Checkpoints.resume(partial, RARELY),
                Long.MAX_VALUE).interrupted());
        String first = lines.toString(StandardCharsets.UTF_8).lines().findFirst().orElse("");
        assertEquals("chain 1 done 70/70 | chain 2 done 70/70", first);
    }

    /**
     * A finished fit continued with a multiple of its thin (40 draws of every iteration, then of
     * every fourth) gives the draws of a fit started with that thin, also when a kill came between
     * the rewriting of the draws file and the save of the state with the new thin: that state's
     * copy is put back after a continuation stopped before its first iteration. A thin that is not
     * a multiple is refused.
     */
    @Test
    void aFinishedFitContinuedWithMoreThinningGivesTheThinnedDraws() throws IOException {
        SamplerSettings everyFourth = new SamplerSettings(2, 30, 40, 17L, 2, 4);
        Draws reference = Fitter.fit(survey(), spec(), everyFourth, ProgressListener.NONE, new AtomicBoolean(),
                Checkpoints.none()).draws();
        Path here = dir.resolve("continued");
        assertFalse(fit(ProgressListener.NONE, new AtomicBoolean(), Checkpoints.start(here, RARELY)).interrupted());
        Path snapshot = Files.createDirectories(dir.resolve("snapshot"));
        for (int c = 0; c < SETTINGS.chains(); c++) {
            Files.copy(here.resolve("chain-" + c + ".bin"), snapshot.resolve("chain-" + c + ".bin"));
        }
        assertTrue(Fitter.fit(survey(), spec(), everyFourth, ProgressListener.NONE, new AtomicBoolean(true),
                Checkpoints.resume(here, RARELY)).interrupted());
        long rows = Files.size(here.resolve("draws-0.bin")) / ((long) reference.parameterCount() * Double.BYTES);
        assertEquals(10, rows, "the draws file holds every fourth of the 40 draws");
        UncheckedIOException refused = assertThrows(UncheckedIOException.class, () -> Fitter.fit(survey(), spec(),
                new SamplerSettings(2, 30, 40, 17L, 2, 6), ProgressListener.NONE, new AtomicBoolean(true),
                Checkpoints.resume(here, RARELY)));
        assertTrue(refused.getMessage().contains("another fit"), refused.getMessage());
        for (int c = 0; c < SETTINGS.chains(); c++) {
            Files.copy(snapshot.resolve("chain-" + c + ".bin"), here.resolve("chain-" + c + ".bin"),
                    StandardCopyOption.REPLACE_EXISTING);
        }
        assertSameDraws(reference, Fitter.fit(survey(), spec(), everyFourth, ProgressListener.NONE, new AtomicBoolean(),
                Checkpoints.resume(here, RARELY)).draws());
    }

    /**
     * A finished fit of 40 draws per chain continued to 60 gives the draws of a fit started with
     * 60; fewer draws than the saved fit's are refused.
     */
    @Test
    void aFinishedFitContinuedToMoreDrawsGivesTheLongerFitsDraws() {
        SamplerSettings longer = new SamplerSettings(2, 30, 60, 17L, 2);
        Draws reference = Fitter.fit(survey(), spec(), longer, ProgressListener.NONE, new AtomicBoolean(),
                Checkpoints.none()).draws();
        Path here = dir.resolve("longer");
        assertFalse(fit(ProgressListener.NONE, new AtomicBoolean(), Checkpoints.start(here, RARELY)).interrupted());
        UncheckedIOException refused = assertThrows(UncheckedIOException.class, () -> Fitter.fit(survey(), spec(),
                new SamplerSettings(2, 30, 30, 17L, 2), ProgressListener.NONE, new AtomicBoolean(true),
                Checkpoints.resume(here, RARELY)));
        assertTrue(refused.getMessage().contains("another fit"), refused.getMessage());
        assertSameDraws(reference, Fitter.fit(survey(), spec(), longer, ProgressListener.NONE, new AtomicBoolean(),
                Checkpoints.resume(here, RARELY)).draws());
    }

    @Test
    void aCheckpointOfAnotherFitIsRefused() {
        Path here = dir.resolve("other");
        AtomicBoolean stop = new AtomicBoolean();
        fit(stopAt(10, stop), stop, Checkpoints.start(here, RARELY));
        SamplerSettings otherSeed = new SamplerSettings(2, 30, 40, 18L, 2);
        UncheckedIOException e = assertThrows(UncheckedIOException.class, () -> Fitter.fit(survey(), spec(), otherSeed,
                ProgressListener.NONE, new AtomicBoolean(), Checkpoints.resume(here, RARELY)));
        assertTrue(e.getMessage().contains("another fit"), e.getMessage());
    }
}
