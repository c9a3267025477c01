package org.rungs.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A fit run as a child process, killed with SIGKILL (twice: once in warm-up, once while
 * sampling, at a pseudo-random moment) or stopped with SIGINT, then continued with
 * {@code fit --resume DIR}, writes a {@code draws.csv} identical byte for byte to that of the same
 * fit run without interruption. Exact equality is the contract, so there is no tolerance.
 */
final class ResumeTest {
    /** Long enough that the kills land mid-run; short enough for a few seconds per run. */
    private static final String[] SETTINGS = {"--chains", "2", "--warmup", "1500", "--draws", "3000", "--seed", "31",
            "--checkpoint-seconds", "0.1"};
    private static final long TIMEOUT_SECONDS = 60;

    @TempDir
    static Path shared;
    static Path survey;
    static byte[] referenceDraws;
    static boolean referenceConverged;

    /** 6 invented regions of 80 respondents on 0..10, about a third of them heaped on 0, 5 and 10. */
    @BeforeAll
    static void uninterruptedFit() throws IOException {
        SplittableRandom random = new SplittableRandom(5L);
        StringBuilder csv = new StringBuilder("region,rating\n");
        for (int i = 0; i < 480; i++) {
            int g = i % 6;
            double latent = 5 + 0.4 * g - 1 + 2 * gaussian(random);
            long rating = Math.max(0, Math.min(10, Math.round(latent)));
            if (random.nextDouble() < 0.3) {
                rating = 5 * Math.round(rating / 5.0);
            }
            csv.append("Region").append((char) ('A' + g)).append(',').append(rating).append('\n');
        }
        survey = Files.writeString(shared.resolve("survey.csv"), csv.toString(), StandardCharsets.UTF_8);
        Path out = shared.resolve("reference");
        CommandLineTest.Run r = CommandLineTest.rungs(fitArguments(out));
        assertEquals(0, r.exit(), r.err());
        referenceDraws = Files.readAllBytes(out.resolve("draws.csv"));
        referenceConverged = !r.out().contains("The chains have not converged");
        assertEquals(!referenceConverged, Files.exists(out.resolve(".checkpoint")),
                "a finished fit keeps its checkpoint only when it has not converged");
    }

    /** Box-Muller, so the survey does not depend on anything but this seed. */
    private static double gaussian(SplittableRandom random) {
        return Math.sqrt(-2 * Math.log(1 - random.nextDouble())) * Math.cos(2 * Math.PI * random.nextDouble());
    }

    private static String[] fitArguments(Path out) {
        List<String> args = new ArrayList<>(List.of("fit", survey.toString(), "--rating", "rating", "--group", "region",
                "--out", out.toString()));
        args.addAll(List.of(SETTINGS));
        return args.toArray(new String[0]);
    }

    /** Starts {@code rungs args} in a child JVM, its output going to files in {@code logs}. */
    private static Process start(Path logs, String name, String... args) throws IOException {
        List<String> command = new ArrayList<>();
        if (defaultSignalSupported()) {
            // a child of a background job may inherit SIGINT ignored; restore its default action
            command.addAll(List.of("env", "--default-signal=INT"));
        }
        command.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        command.addAll(List.of("-cp", System.getProperty("java.class.path"), Main.class.getName()));
        command.addAll(List.of(args));
        return new ProcessBuilder(command)
                .redirectOutput(logs.resolve(name + ".out").toFile())
                .redirectError(logs.resolve(name + ".err").toFile())
                .start();
    }

    private static boolean defaultSignalSupported() {
        try {
            Process p = new ProcessBuilder("env", "--default-signal=INT", "true").redirectErrorStream(true).start();
            return p.waitFor(10, TimeUnit.SECONDS) && p.exitValue() == 0;
        } catch (IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    /** Waits until {@code file} exists with more than {@code bytes} bytes, or the process ended. */
    private static void awaitFile(Process p, Path file, long bytes) throws IOException, InterruptedException {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(TIMEOUT_SECONDS);
        while (!(Files.exists(file) && Files.size(file) > bytes)) {
            assertTrue(p.isAlive(), "the fit ended before " + file + " reached " + bytes + " bytes");
            assertTrue(System.nanoTime() < deadline, "timed out waiting for " + file);
            Thread.sleep(5);
        }
    }

    private static int finish(Process p) throws InterruptedException {
        assertTrue(p.waitFor(TIMEOUT_SECONDS, TimeUnit.SECONDS), "the fit did not end");
        return p.exitValue();
    }

    private static String read(Path file) throws IOException {
        return Files.readString(file, StandardCharsets.UTF_8);
    }

    @Test
    void killedTwiceThenResumedGivesTheUninterruptedDraws(@TempDir Path dir) throws Exception {
        Path out = dir.resolve("fit");
        Path checkpoint = out.resolve(".checkpoint");
        SplittableRandom random = new SplittableRandom(8L);

        Process first = start(dir, "first", fitArguments(out));
        awaitFile(first, checkpoint.resolve("chain-0.bin"), 0);
        Thread.sleep(random.nextInt(150));
        first.destroyForcibly();
        finish(first);
        assertFalse(Files.exists(out.resolve("draws.csv")), "a killed fit wrote no final files");

        long keptBefore = Files.exists(checkpoint.resolve("draws-0.bin")) ? Files.size(checkpoint.resolve("draws-0.bin")) : 0;
        Process second = start(dir, "second", "fit", "--resume", out.toString(), "--checkpoint-seconds", "0.1");
        // killed once it has kept draws of its own, after the first run's
        awaitFile(second, checkpoint.resolve("draws-0.bin"), keptBefore);
        Thread.sleep(random.nextInt(150));
        second.destroyForcibly();
        finish(second);
        assertTrue(read(dir.resolve("second.err")).contains("resuming"), read(dir.resolve("second.err")));

        Process third = start(dir, "third", "fit", "--resume", out.toString());
        assertEquals(0, finish(third), read(dir.resolve("third.err")));
        assertArrayEquals(referenceDraws, Files.readAllBytes(out.resolve("draws.csv")), "draws.csv, byte for byte");
        assertEquals(!referenceConverged, Files.exists(checkpoint), "the finished fit keeps its checkpoint only unconverged");
    }

    @Test
    void ctrlCSavesAndReportsThenResumes(@TempDir Path dir) throws Exception {
        Path out = dir.resolve("fit");
        Process fit = start(dir, "fit", fitArguments(out));
        for (int c = 0; c < 2; c++) {
            // every chain has kept a draw, so there is something to summarise
            awaitFile(fit, out.resolve(".checkpoint").resolve("draws-" + c + ".bin"), 0);
        }
        Process signal = new ProcessBuilder("kill", "-INT", Long.toString(fit.pid())).start();
        assertEquals(0, finish(signal));
        assertEquals(Main.INTERRUPTED, finish(fit), read(dir.resolve("fit.err")));
        String err = read(dir.resolve("fit.err"));
        assertTrue(err.contains("fit --resume " + out), err);
        assertTrue(read(dir.resolve("fit.out")).contains("Files written to"), "the summary of what exists is printed");
        assertTrue(Files.exists(out.resolve("summary.csv")));
        assertTrue(Files.exists(out.resolve(".checkpoint").resolve("chain-1.bin")));

        CommandLineTest.Run refused = CommandLineTest.rungs(fitArguments(out));
        assertEquals(Main.INPUT_ERROR, refused.exit());
        assertTrue(refused.err().contains("holds the checkpoint of a fit that was interrupted"), refused.err());

        CommandLineTest.Run resumed = CommandLineTest.rungs("fit", "--resume", out.toString());
        assertEquals(0, resumed.exit(), resumed.err());
        assertArrayEquals(referenceDraws, Files.readAllBytes(out.resolve("draws.csv")), "draws.csv, byte for byte");
    }

    /**
     * A fit that ends without converging (short chains kept every second iteration) says how to
     * continue its chains; 'fit --resume DIR --thin K' refuses a K that is not a multiple of 2 and
     * with 4 writes the draws.csv of a fit started with --thin 4, byte for byte; a copy of the fit
     * refuses fewer --draws, and with more writes the draws.csv of a fit started with them.
     */
    @Test
    void anUnconvergedFitContinuesWithMoreThinning(@TempDir Path dir) throws Exception {
        List<String> shortChains = List.of("--chains", "2", "--warmup", "60", "--draws", "100", "--seed", "31");
        Path everyFourth = dir.resolve("every-fourth");
        List<String> fresh = new ArrayList<>(List.of("fit", survey.toString(), "--rating", "rating", "--group", "region",
                "--out", everyFourth.toString(), "--thin", "4"));
        fresh.addAll(shortChains);
        assertEquals(0, CommandLineTest.rungs(fresh.toArray(new String[0])).exit());

        Path out = dir.resolve("fit");
        List<String> first = new ArrayList<>(List.of("fit", survey.toString(), "--rating", "rating", "--group", "region",
                "--out", out.toString(), "--thin=2"));
        first.addAll(shortChains);
        CommandLineTest.Run unconverged = CommandLineTest.rungs(first.toArray(new String[0]));
        assertEquals(0, unconverged.exit(), unconverged.err());
        assertTrue(unconverged.out().contains("'rungs fit --resume " + out + " --thin "), unconverged.out());

        Path copy = dir.resolve("fit-copy");
        copyFolder(out, copy);
        CommandLineTest.Run three = CommandLineTest.rungs("fit", "--resume", out.toString(), "--thin", "3");
        assertEquals(Main.INPUT_ERROR, three.exit());
        assertTrue(three.err().contains("--thin 3 is not a multiple of the fit's --thin 2"), three.err());

        CommandLineTest.Run four = CommandLineTest.rungs("fit", "--resume", out.toString(), "--thin", "4");
        assertEquals(0, four.exit(), four.err());
        assertTrue(four.err().contains("continuing the fit in " + out + " to 100 draws per chain, one iteration in 4 kept"),
                four.err());
        assertArrayEquals(Files.readAllBytes(everyFourth.resolve("draws.csv")), Files.readAllBytes(out.resolve("draws.csv")),
                "draws.csv, byte for byte");

        // the copy, continued to more draws instead
        CommandLineTest.Run fewer = CommandLineTest.rungs("fit", "--resume", copy.toString(), "--draws", "90");
        assertEquals(Main.INPUT_ERROR, fewer.exit());
        assertTrue(fewer.err().contains("--draws 90 is fewer than the fit's --draws 100"), fewer.err());
        CommandLineTest.Run more = CommandLineTest.rungs("fit", "--resume", copy.toString(), "--draws", "160");
        assertEquals(0, more.exit(), more.err());
        Path longer = dir.resolve("longer");
        assertEquals(0, CommandLineTest.rungs("fit", survey.toString(), "--rating", "rating", "--group", "region", "--out",
                longer.toString(), "--thin", "2", "--chains", "2", "--warmup", "60", "--draws", "160", "--seed", "31").exit());
        assertArrayEquals(Files.readAllBytes(longer.resolve("draws.csv")), Files.readAllBytes(copy.resolve("draws.csv")),
                "draws.csv of the copy continued to 160 draws, byte for byte");
    }

    /** Copies an output folder with its checkpoint, as a user might before trying a continuation. */
    private static void copyFolder(Path from, Path to) throws IOException {
        try (var paths = Files.walk(from)) {
            for (Path p : (Iterable<Path>) paths::iterator) {
                Files.copy(p, to.resolve(from.relativize(p).toString()));
            }
        }
    }

    @Test
    void resumeRefusesOtherOptionsAndAChangedFile(@TempDir Path dir) throws Exception {
        Path out = dir.resolve("fit");
        Path copy = Files.copy(survey, dir.resolve("survey.csv"));
        List<String> args = new ArrayList<>(List.of(fitArguments(out)));
        args.set(1, copy.toString());
        Process fit = start(dir, "fit", args.toArray(new String[0]));
        awaitFile(fit, out.resolve(".checkpoint").resolve("chain-0.bin"), 0);
        fit.destroyForcibly();
        finish(fit);

        CommandLineTest.Run other = CommandLineTest.rungs("fit", "--resume", out.toString(), "--seed", "2");
        assertEquals(Main.INPUT_ERROR, other.exit());
        assertTrue(other.err().contains("--seed"), other.err());

        Files.writeString(copy, "\n", StandardCharsets.UTF_8, StandardOpenOption.APPEND);
        CommandLineTest.Run changed = CommandLineTest.rungs("fit", "--resume", out.toString());
        assertEquals(Main.INPUT_ERROR, changed.exit());
        assertTrue(changed.err().contains("has changed"), changed.err());

        CommandLineTest.Run nothing = CommandLineTest.rungs("fit", "--resume", dir.toString());
        assertEquals(Main.INPUT_ERROR, nothing.exit());
        assertTrue(nothing.err().contains("no checkpoint"), nothing.err());
    }
}
