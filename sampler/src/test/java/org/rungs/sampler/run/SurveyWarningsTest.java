package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.SurveyReader;
import org.rungs.models.survey.SurveySpec;

/** The warnings about the data a fit prints before sampling. */
class SurveyWarningsTest {

    @TempDir
    Path dir;

    private static final Scale ONE_FOUR = new Scale(1, 4);

    private Path file() throws IOException {
        StringBuilder content = new StringBuilder("rating\n");
        for (int i = 0; i < 10; i++) {
            content.append("1\n2\n4\n");
        }
        content.append("3\n3.0\n");
        return Files.writeString(dir.resolve("s.csv"), content);
    }

    @Test
    void aRatingNobodyAnsweredIsNamed() throws Exception {
        Path file = Files.writeString(dir.resolve("n.csv"), "rating\n" + "1\n2\n4\n".repeat(10));
        assertEquals(List.of("nobody answered 3; the thresholds around it rest on the prior and on their neighbours"),
                SurveyWarnings.of(SurveyReader.read(file, SurveySpec.of("rating", null, ONE_FOUR))));
    }

    /**
     * Our rule, after an audit where answers of 5 declared missing were later reported as "nobody
     * answered 5", which was false: the warning says they were declared missing, and how many.
     */
    @Test
    void answersDeclaredMissingAreCountedNotCalledUnanswered() throws Exception {
        SurveySpec spec = SurveySpec.builder("rating", ONE_FOUR).missingCodesFor("rating", "3").build();
        assertEquals(List.of("every answer of 3 was declared missing (2 answers, by a missing code of the rating column);"
                + " the thresholds around it rest on the prior and on their neighbours"),
                SurveyWarnings.of(SurveyReader.read(file(), spec)));
    }
}
