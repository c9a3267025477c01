package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;

/**
 * What any input must give: a {@link Survey} that holds together, or a {@link SurveyInputException}
 * whose message is one printable line about the file. Anything else thrown (a runtime exception,
 * an error) escapes to the caller as a failure.
 */
final class ReaderProperty {
    static final Path NAME = Path.of("fuzzed.csv");

    private ReaderProperty() {
    }

    /** True when the input was read, false when it was rejected cleanly. */
    static boolean check(byte[] content, SurveySpec spec) {
        Survey survey;
        try {
            survey = SurveyReader.read(new ByteArrayInputStream(content), NAME, spec);
        } catch (SurveyInputException e) {
            String message = e.getMessage();
            assertTrue(message.startsWith(NAME + ": ") || message.startsWith(NAME + ", "), message);
            assertFalse(e.problem().isBlank(), message);
            assertFalse(e.expected().isBlank(), message);
            // printable on a terminal: file text reaches messages escaped only
            for (int i = 0; i < message.length(); i++) {
                assertFalse(Character.isISOControl(message.charAt(i)), message);
            }
            return false;
        }
        int n = survey.size();
        assertTrue(n > 0);
        assertEquals(n, survey.exclusions().rowsUsed());
        for (byte c : survey.category()) {
            assertTrue(c >= 0 && c < survey.scale().categories());
        }
        int[] sizes = survey.groupSizes();
        for (int size : sizes) {
            assertTrue(size > 0);
        }
        for (String label : survey.groupLabels()) {
            byte[] bytes = label.getBytes(StandardCharsets.UTF_8);
            assertEquals(-1, SurveyReader.controlCharacter(bytes, 0, bytes.length), label);
        }
        CorpusTest.assertFinite(survey.level());
        CorpusTest.assertFinite(survey.style());
        if (survey.weight() != null) {
            for (double w : survey.weight()) {
                assertTrue(w >= 0 && Double.isFinite(w));
            }
        }
        return true;
    }
}
