package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

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
    void keepsLabelsExactlyAsWrittenIncludingMarkupTabsAndSpaces() throws Exception {
        String html = "<b>North & \"South\"</b>";
        String tab = "tab\there";
        String padded = " West ";
        Path file = SurveyFiles.write(dir, "labels.csv", "rating,region\n1,\"" + html.replace("\"", "\"\"") + "\"\n2,\""
                + tab + "\"\n3," + padded + "\n4,West\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertEquals(List.of(html, tab, padded, "West"), survey.groupLabels());
    }

    @Test
    void rejectsControlCharactersOtherThanTabInLabels() {
        SurveySpec groups = SurveySpec.of("rating", "region", ZERO_TEN);
        String[] labels = {"bell\u0007", "\u001b[31mred", "Lake\nShore", "del\u007f", "c1\u0085", "nul\u0000"};
        String[] shown = {"U+0007", "U+001B", "U+000A", "U+007F", "U+0085", "U+0000"};
        for (int i = 0; i < labels.length; i++) {
            Path file = SurveyFiles.write(dir, "control.csv", "rating,region\n1,West\n2,\"" + labels[i] + "\"\n");
            SurveyInputException e = assertThrows(SurveyInputException.class, () -> SurveyReader.read(file, groups));
            assertEquals(3, e.row());
            assertEquals("region", e.column());
            assertEquals("the group label " + Text.quote(labels[i]) + " contains the control character " + shown[i],
                    e.problem());
        }
        SurveySpec levels = SurveySpec.builder("rating", ZERO_TEN).level("x").build();
        Path file = SurveyFiles.write(dir, "level.csv", "rating,x\n1,urban\n2,\"rural\u0007\"\n");
        SurveyInputException e = assertThrows(SurveyInputException.class, () -> SurveyReader.read(file, levels));
        assertEquals(file + ", row 3, column \"x\": the level \"rural\\u0007\" contains the control character U+0007;"
                + " expected labels without control characters other than tab (remove them from the file)", e.getMessage());
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
