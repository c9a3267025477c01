package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The checkpoint's {@code fit.properties}: what is written is read back, and a damaged file is
 * refused with a message naming the file, the key and what was expected (our rule for every
 * message on bad input), with no raw control character in it.
 */
class SavedFitTest {
    private static final SavedFit SAVED = new SavedFit(Path.of("/data/survey.csv"), "0123abcd", -7L,
            List.of("fit", "/data/survey.csv", "--rating", "rating"));

    @Test
    void readsBackWhatItWrote(@TempDir Path out) {
        SAVED.write(out);
        assertEquals(SAVED, SavedFit.read(out));
    }

    @Test
    void aDamagedFileIsRefusedNamingTheFileTheKeyAndWhatWasExpected(@TempDir Path out) throws IOException {
        SAVED.write(out);
        Path file = out.resolve(SavedFit.FOLDER).resolve("fit.properties");
        String written = Files.readString(file, StandardCharsets.UTF_8);
        String where = file.toAbsolutePath() + ": the key ";

        assertRefused(out, written.replace("seed=-7", "seed=abc"),
                where + "\"seed\" holds \"abc\"; expected the seed, a whole number");
        assertRefused(out, written.replace("seed=-7", "seed=1\u0007"), where + "\"seed\" holds \"1\\u0007\"");
        assertRefused(out, written.replace("seed=-7\n", ""), where + "\"seed\" is missing; expected the seed");
        assertRefused(out, written.replace("arguments=4", "arguments=-1"), where + "\"arguments\" holds \"-1\"; expected the"
                + " number of the fit's arguments, a whole number 0 or more");
        assertRefused(out, written.replace("arguments=4\n", ""), where + "\"arguments\" is missing");
        assertRefused(out, written.replace("arguments=4", "arguments=5"), where + "\"argument.4\" is missing; expected the"
                + " fit's argument 5 of 5");
        assertRefused(out, written.replace("sha256=0123abcd\n", ""), where + "\"sha256\" is missing");
        assertRefused(out, written + "file=\\u00zz\n", file.toAbsolutePath() + ": expected the properties a fit writes");
    }

    private static void assertRefused(Path out, String content, String expected) throws IOException {
        Files.writeString(out.resolve(SavedFit.FOLDER).resolve("fit.properties"), content, StandardCharsets.UTF_8);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SavedFit.read(out));
        assertTrue(e.getMessage().contains(expected), () -> "expected '" + expected + "' in:\n" + e.getMessage());
        assertTrue(e.getMessage().contains("start the fit again"), e.getMessage());
        assertFalse(e.getMessage().chars().anyMatch(Character::isISOControl), e.getMessage());
    }
}
