package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The warnings about the data a fit prints before sampling. */
class DataWarningsTest {

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
                DataWarnings.of(SurveyReader.read(file, SurveySpec.of("rating", null, ONE_FOUR))));
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
                DataWarnings.of(SurveyReader.read(file(), spec)));
    }

    @Test
    void aGroupWhoseRespondentsAllGaveOneRatingIsNamed() throws Exception {
        Path file = Files.writeString(dir.resolve("g.csv"), "region,rating\n"
                + "North,1\nNorth,2\nNorth,3\nNorth,4\n".repeat(10) + "South,4\n".repeat(40));
        List<String> warnings = DataWarnings.of(SurveyReader.read(file,
                SurveySpec.builder("rating", ONE_FOUR).group("region").build()));
        assertEquals(List.of("every respondent of group South answered 4; its level and thresholds cannot be told"
                + " apart, so they rest on the priors and on the other groups"), warnings);
    }

    /**
     * Our rule: more than {@link DataWarnings#MAX_NAMED} unanswered ratings or small groups are
     * one warning each kind, not one line apiece (an audit got 150 lines for 150 groups of 15,
     * and dozens on a scale of 0..100); five or fewer keep a line each, as above.
     */
    @Test
    void manyUnansweredRatingsAndSmallGroupsAreOneWarningEach() throws Exception {
        StringBuilder content = new StringBuilder("region,rating\n");
        content.append("Big,1\nBig,2\nBig,12\n".repeat(20));
        for (int g = 1; g <= 7; g++) {
            content.append(("G" + g + ",1\nG" + g + ",12\n").repeat(g));
        }
        Path file = Files.writeString(dir.resolve("many.csv"), content);
        List<String> warnings = DataWarnings.of(SurveyReader.read(file,
                SurveySpec.builder("rating", new Scale(1, 12)).group("region").build()));
        assertEquals(List.of("nobody answered 9 of the 12 ratings (3, 4, 5, 6, 7, 8, 9, 10, 11); the thresholds around"
                        + " them rest on the prior and on their neighbours",
                "7 of the 8 groups have fewer than 30 respondents (G1 2, G2 4, G3 6, G4 8, G5 10 and 2 more);"
                        + " their estimates lean on the other groups"), warnings);
    }

    /**
     * Our rule: a level of a categorical covariate held by fewer than {@link DataWarnings#RARE_LEVEL}
     * respondents is named with its parameter (an audit fitted a level of one respondent without a
     * word); a numeric covariate and a well-filled level are not.
     */
    @Test
    void aCategoryOfFewRespondentsIsNamed() throws Exception {
        StringBuilder content = new StringBuilder("rating,job,age\n");
        for (int i = 0; i < 40; i++) {
            content.append(1 + i % 4).append(i % 2 == 0 ? ",clerk," : ",farmer,").append(20 + i).append('\n');
        }
        content.append("2,pilot,33\n3,pilot,50\n");
        Path file = Files.writeString(dir.resolve("jobs.csv"), content);
        SurveySpec spec = SurveySpec.builder("rating", ONE_FOUR).level("job", "age").build();
        assertEquals(List.of("only 2 respondents have job=pilot (level.job=pilot); its coefficient rests mostly on the prior"),
                DataWarnings.of(SurveyReader.read(file, spec)));
    }

    /**
     * Our rule: with one group there are no other groups to lean on, so the warnings say what the
     * estimates do rest on (an audit found a survey of one respondent told to lean on others).
     */
    /** Every group at one rating: one warning for the survey, not one per group that points to the others (our rule). */
    @Test
    void aSurveyAtOneRatingGetsOneWarning() throws Exception {
        Path fours = Files.writeString(dir.resolve("all-fours.csv"), "rating,region\n" + "4,North\n4,South\n4,East\n".repeat(40));
        List<String> warnings = DataWarnings.of(SurveyReader.read(fours, SurveySpec.of("rating", "region", ONE_FOUR)));
        assertEquals(List.of("nobody answered 1; the thresholds around it rest on the prior and on their neighbours",
                "nobody answered 2; the thresholds around it rest on the prior and on their neighbours",
                "nobody answered 3; the thresholds around it rest on the prior and on their neighbours",
                "every respondent of every group answered 4; the levels and thresholds cannot be told apart, so they rest"
                        + " on the priors"), warnings);
    }

    @Test
    void aSingleGroupIsNotToldToLeanOnOthers() throws Exception {
        Path one = Files.writeString(dir.resolve("one.csv"), "rating\n4\n");
        assertEquals(List.of("nobody answered 1; the thresholds around it rest on the prior and on their neighbours",
                "nobody answered 2; the thresholds around it rest on the prior and on their neighbours",
                "nobody answered 3; the thresholds around it rest on the prior and on their neighbours",
                "the survey has only 1 respondent; its estimates rest mostly on the priors"),
                DataWarnings.of(SurveyReader.read(one, SurveySpec.of("rating", null, ONE_FOUR))));
        Path same = Files.writeString(dir.resolve("same.csv"), "rating\n" + "2\n".repeat(40) + "1\n3\n4\n");
        Path fours = Files.writeString(dir.resolve("fours.csv"), "rating\n" + "4\n".repeat(40));
        assertEquals(List.of(), DataWarnings.of(SurveyReader.read(same, SurveySpec.of("rating", null, ONE_FOUR))));
        assertEquals(List.of("nobody answered 1; the thresholds around it rest on the prior and on their neighbours",
                "nobody answered 2; the thresholds around it rest on the prior and on their neighbours",
                "nobody answered 3; the thresholds around it rest on the prior and on their neighbours",
                "every respondent answered 4; the level and thresholds cannot be told apart, so they rest on the priors"),
                DataWarnings.of(SurveyReader.read(fours, SurveySpec.of("rating", null, ONE_FOUR))));
    }
}
