package org.rungs.models.survey;

import com.code_intelligence.jazzer.junit.FuzzTest;

/**
 * Coverage-guided fuzzing of the reader (Jazzer 0.24.0, JUnit integration): arbitrary bytes give a
 * survey or a clean {@link SurveyInputException}, never another exception (see {@link ReaderProperty}).
 *
 * <p>A plain {@code mvn verify} runs this in regression mode: only the seeds in
 * {@code src/test/resources/org/rungs/models/survey/SurveyReaderFuzzTestInputs/readsOrRejectsCleanly/}
 * (and any crash found earlier, saved there) are replayed. To fuzz, for at most {@code maxDuration}:
 * {@code JAZZER_FUZZ=1 mvn -B -pl models test -Dtest=SurveyReaderFuzzTest}. CI's bounded random
 * search is {@link ReaderMutationTest}.
 */
class SurveyReaderFuzzTest {

    /** Columns of the seeds: a rating, a group, a covariate; 99 is a declared missing code. */
    private static final SurveySpec SPEC = SurveySpec.builder("rating", new Scale(0, 10)).group("region").level("x")
            .missingCodes("99").build();

    @FuzzTest(maxDuration = "30s")
    void readsOrRejectsCleanly(byte[] content) {
        ReaderProperty.check(content, SPEC);
    }
}
