package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Group numbering and labels. */
class GroupsTest {

    @TempDir
    Path dir;

    private static final Scale ZERO_TEN = new Scale(0, 10);

    @Test
    void numbersGroupsInOrderOfFirstAppearance() throws Exception {
        Path file = SurveyFiles.write(dir, "g.csv", "rating,region\n1,West\n2,East\n3,West\n4,North\n5,East\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertEquals(List.of("West", "East", "North"), survey.groupLabels());
        assertArrayEquals(new int[] {0, 1, 0, 2, 1}, survey.group());
        assertArrayEquals(new int[] {2, 2, 1}, survey.groupSizes());
        assertEquals(3, survey.groupCount());
    }

    @Test
    void keepsLabelsExactlyAsWrittenIncludingMarkupAndControlCharacters() throws Exception {
        String html = "<b>North & \"South\"</b>";
        String control = "tab\there\u0007bell";
        String padded = " West ";
        Path file = SurveyFiles.write(dir, "labels.csv", "rating,region\n1,\"" + html.replace("\"", "\"\"") + "\"\n2,\""
                + control + "\"\n3," + padded + "\n4,West\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertEquals(List.of(html, control, padded, "West"), survey.groupLabels());
    }

    @Test
    void withoutAGroupColumnEveryoneIsInTheGroupAll() throws Exception {
        Path file = SurveyFiles.write(dir, "one.csv", "rating,region\n1,West\n2,East\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", null, ZERO_TEN));
        assertEquals(List.of("all"), survey.groupLabels());
        assertArrayEquals(new int[] {0, 0}, survey.group());
    }

    @Test
    void keepsTheOrderOfManyGroups() throws Exception {
        StringBuilder text = new StringBuilder("rating,region\n");
        List<String> expected = new ArrayList<>();
        for (int g = 0; g < 1000; g++) {
            String label = "region-" + ((g * 7919) % 1000);
            expected.add(label);
            text.append(g % 11).append(',').append(label).append('\n');
        }
        for (int g = 0; g < 1000; g++) {
            text.append(3).append(',').append(expected.get(999 - g)).append('\n');
        }
        Survey survey = SurveyReader.read(SurveyFiles.write(dir, "many.csv", text.toString()),
                SurveySpec.of("rating", "region", ZERO_TEN));
        assertEquals(expected, survey.groupLabels());
        for (int i = 0; i < 1000; i++) {
            assertEquals(i, survey.group()[i]);
            assertEquals(999 - i, survey.group()[1000 + i]);
        }
    }
}
