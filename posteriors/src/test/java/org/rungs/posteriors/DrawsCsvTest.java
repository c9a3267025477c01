package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.SplittableRandom;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class DrawsCsvTest {
    @TempDir
    Path folder;

    @Test
    void roundTripIsExact() throws IOException {
        List<String> names = List.of("alpha", "beta[1,2]", "say \"hi\"", "line\nbreak", "Ährenfeld");
        Draws draws = new Draws(names, 3, 40);
        SplittableRandom random = new SplittableRandom(31);
        double[] special = {0.0, -0.0, Double.MIN_VALUE, -Double.MAX_VALUE, 1e-310, 0.1, 1.0 / 3,
            Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, Double.NaN, 123456789.123456789};
        for (int p = 0; p < names.size(); p++) {
            for (int c = 0; c < 3; c++) {
                for (int i = 0; i < 40; i++) {
                    double v = (p + c + i) % 4 == 0 ? special[(p * 7 + c * 3 + i) % special.length]
                            : Math.scalb(random.nextGaussian(), random.nextInt(-60, 60));
                    draws.set(p, c, i, v);
                }
            }
        }
        Path file = folder.resolve("draws.csv");
        DrawsCsv.write(draws, file);
        Draws back = DrawsCsv.read(file);

        assertEquals(names, back.names());
        assertEquals(3, back.chains());
        assertEquals(40, back.iterations());
        for (int p = 0; p < names.size(); p++) {
            for (int c = 0; c < 3; c++) {
                for (int i = 0; i < 40; i++) {
                    assertEquals(Double.doubleToLongBits(draws.get(p, c, i)), Double.doubleToLongBits(back.get(p, c, i)),
                            names.get(p) + " chain " + c + " iteration " + i);
                }
            }
        }
    }

    @Test
    void headerAndRowsFollowTheLayout() throws IOException {
        Draws draws = new Draws(List.of("a", "b,c"), 2, 2);
        draws.putRow(1, 0, new double[] {0.5, 2});
        Path file = folder.resolve("small.csv");
        DrawsCsv.write(draws, file);
        assertEquals(List.of("chain,iteration,a,\"b,c\"", "1,1,0.0,0.0", "1,2,0.0,0.0", "2,1,0.5,2.0", "2,2,0.0,0.0"),
                Files.readAllLines(file));
    }

    @Test
    void writeReplacesAtomicallyAndLeavesNoTemporaryFile() throws IOException {
        Path file = folder.resolve("draws.csv");
        Files.writeString(file, "old content");
        DrawsCsv.write(new Draws(List.of("a"), 1, 1), file);
        assertEquals("chain,iteration,a", Files.readAllLines(file).get(0));
        try (Stream<Path> entries = Files.list(folder)) {
            assertEquals(List.of(file), entries.toList());
        }
    }

    @Test
    void rowsMayComeInAnyOrder() throws IOException {
        Draws draws = DrawsCsv.read(write("chain,iteration,x\n2,1,3\n1,2,2\n1,1,1\r\n2,2,4\n"));
        assertEquals(List.of(1.0, 2.0, 3.0, 4.0),
                List.of(draws.get(0, 0, 0), draws.get(0, 0, 1), draws.get(0, 1, 0), draws.get(0, 1, 1)));
    }

    @Test
    void malformedInputIsReportedWithLineAndColumn() throws IOException {
        assertMessage("chain,iteration,a,b\n1,1,0.5,1\n1,2,0.5,oops\n", "line 3: column 4 (b): 'oops' is not a number");
        assertMessage("chain,iteration,a\n1,1,0.5\n1,2\n", "line 3: expected 3 fields, got 2");
        assertMessage("chain,iteration,a\n0,1,0.5\n", "line 2: column 1 (chain): '0' is not a positive integer");
        assertMessage("chain,iteration,a\n1,x,0.5\n", "line 2: column 2 (iteration): 'x' is not a positive integer");
        assertMessage("iteration,chain,a\n", "line 1: the header must start with chain,iteration");
        assertMessage("chain,iteration,a,a\n1,1,1,1\n", "line 1: column 4: duplicate parameter name 'a'");
        assertMessage("chain,iteration,\"a\n1,1,1\n", "a quoted field is not closed");
        assertMessage("chain,iteration,a\n1,1,1\n1,1,2\n", "line 3: chain 1 iteration 1 appears twice");
        assertMessage("chain,iteration,a\n1,1,1\n2,2,2\n", "2 rows cannot fill the grid of 2 chains x 2 iterations");
        assertMessage("chain,iteration,a\n", "no draws after the header");
        assertMessage("", "the file is empty");
    }

    private void assertMessage(String content, String expected) throws IOException {
        Path file = write(content);
        IOException e = assertThrows(IOException.class, () -> DrawsCsv.read(file));
        assertTrue(e.getMessage().contains(expected), e.getMessage());
        assertTrue(e.getMessage().startsWith(file.toString()), e.getMessage());
    }

    private Path write(String content) throws IOException {
        Path file = Files.createTempFile(folder, "input", ".csv");
        Files.writeString(file, content);
        return file;
    }
}
