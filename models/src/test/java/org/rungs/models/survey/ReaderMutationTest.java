package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HexFormat;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;

/**
 * A bounded random search that runs in every build: 20,000 inputs from a fixed seed, mutations of
 * the corpus files (byte flips, truncations, insertions of quotes, delimiters, line breaks, 0xFF and
 * other bytes, splices of two files) and random bytes, each read with its manifest spec, must give
 * a survey or a clean {@link SurveyInputException} (see {@link ReaderProperty}). A failure prints
 * the input in hex so that it can be added to the corpus.
 */
class ReaderMutationTest {

    private static final int INPUTS = 20_000;
    private static final long SEED = 20_261_202L;
    private static final byte[] SPECIAL = {'"', ',', ';', '\t', '\n', '\r', (byte) 0xFF, (byte) 0xC3, (byte) 0xEF, 0,
        '.', 'e', '-', '9', ' '};

    private record Seed(String name, byte[] content, SurveySpec spec) {
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void mutatedCorpusFilesAreReadOrRejectedCleanly() throws IOException {
        Path corpus = SurveyFiles.resource("corpus");
        List<Seed> seeds = new ArrayList<>();
        for (CorpusTest.Case c : CorpusTest.manifest()) {
            seeds.add(new Seed(c.file(), Files.readAllBytes(corpus.resolve(c.file())), CorpusTest.spec(c.spec())));
        }
        SplittableRandom random = new SplittableRandom(SEED);
        int read = 0;
        long start = System.nanoTime();
        for (int i = 0; i < INPUTS; i++) {
            Seed seed = seeds.get(random.nextInt(seeds.size()));
            byte[] input = i % 10 == 9 ? randomBytes(random) : mutate(seed.content(), seeds, random);
            try {
                if (ReaderProperty.check(input, seed.spec())) {
                    read++;
                }
            } catch (Throwable e) {
                fail("input " + i + " (a mutation of " + seed.name() + "): " + HexFormat.of().formatHex(input), e);
            }
        }
        System.out.printf("ReaderMutationTest: %d inputs (%d read, the rest rejected) in %.1f s%n", INPUTS, read,
                (System.nanoTime() - start) / 1e9);
        // the mutations must leave some files readable, or they only test the first check
        assertTrue(read > INPUTS / 50, read + " inputs read");
    }

    @Test
    void theMutationsAreReproducibleFromTheSeed() {
        byte[] content = "rating,region\n5,North\n".getBytes(java.nio.charset.StandardCharsets.UTF_8);
        List<Seed> one = List.of(new Seed("x", content, null));
        byte[] a = mutate(content, one, new SplittableRandom(SEED));
        byte[] b = mutate(content, one, new SplittableRandom(SEED));
        assertEquals(HexFormat.of().formatHex(a), HexFormat.of().formatHex(b));
    }

    private static byte[] randomBytes(SplittableRandom random) {
        byte[] out = new byte[random.nextInt(200)];
        for (int i = 0; i < out.length; i++) {
            out[i] = (byte) random.nextInt(256);
        }
        return out;
    }

    /** One to four edits of {@code content}. */
    private static byte[] mutate(byte[] content, List<Seed> seeds, SplittableRandom random) {
        byte[] out = content;
        int edits = 1 + random.nextInt(4);
        for (int e = 0; e < edits; e++) {
            int at = out.length == 0 ? 0 : random.nextInt(out.length + 1);
            switch (random.nextInt(7)) {
                case 0 -> {
                    if (at < out.length) {
                        out = out.clone();
                        out[at] ^= (byte) (1 << random.nextInt(8));
                    }
                }
                case 1 -> out = Arrays.copyOf(out, at);
                case 2 -> out = insert(out, at, new byte[] {SPECIAL[random.nextInt(SPECIAL.length)]});
                case 3 -> out = insert(out, at, new byte[] {(byte) random.nextInt(256)});
                case 4 -> {
                    if (at < out.length) {
                        int end = at + 1 + random.nextInt(Math.min(16, out.length - at));
                        byte[] cut = new byte[out.length - (end - at)];
                        System.arraycopy(out, 0, cut, 0, at);
                        System.arraycopy(out, end, cut, at, out.length - end);
                        out = cut;
                    }
                }
                case 5 -> {
                    // repeat a slice, e.g. a row or a run of quotes
                    if (at < out.length) {
                        int end = at + 1 + random.nextInt(Math.min(64, out.length - at));
                        out = insert(out, at, Arrays.copyOfRange(out, at, end));
                    }
                }
                default -> {
                    byte[] other = seeds.get(random.nextInt(seeds.size())).content();
                    int from = other.length == 0 ? 0 : random.nextInt(other.length);
                    out = insert(Arrays.copyOf(out, at), at, Arrays.copyOfRange(other, from, other.length));
                }
            }
        }
        return out;
    }

    private static byte[] insert(byte[] content, int at, byte[] piece) {
        byte[] out = new byte[content.length + piece.length];
        System.arraycopy(content, 0, out, 0, at);
        System.arraycopy(piece, 0, out, at, piece.length);
        System.arraycopy(content, at, out, at + piece.length, content.length - at);
        return out;
    }
}
