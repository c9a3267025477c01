package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Duration;
import org.junit.jupiter.api.Test;

/**
 * Group labels chosen so that a fixed polynomial hash gives all of them the same value (each of
 * 16 blocks is "Aa" or "BB", which are equal under {@code 31 * h + b}) must not make interning
 * quadratic: 65,536 such labels would take minutes with one long probe chain.
 */
class HashFloodingTest {

    @Test
    void labelsThatCollideUnderAFixedHashReadFast() {
        int blocks = 16;
        int labels = 1 << blocks;
        StringBuilder text = new StringBuilder("rating,region\n");
        for (int k = 0; k < labels; k++) {
            text.append(k % 11).append(',');
            for (int b = 0; b < blocks; b++) {
                text.append((k >> b & 1) == 0 ? "Aa" : "BB");
            }
            text.append('\n');
        }
        byte[] content = text.toString().getBytes(StandardCharsets.UTF_8);
        SurveySpec spec = SurveySpec.of("rating", "region", new Scale(0, 10));
        // reading 1.2 MB takes well under a second; 20 s only fails a quadratic interner
        Survey survey = assertTimeoutPreemptively(Duration.ofSeconds(20),
                () -> SurveyReader.read(new ByteArrayInputStream(content), Path.of("colliding.csv"), spec));
        assertEquals(labels, survey.groupCount());
    }
}
