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
    void keepsLabelsAsWrittenInsideIncludingMarkupTabsAndSpaces() throws Exception {
        String html = "<b>North & \"South\"</b>";
        String tab = "tab\there";
        String inner = "Lake  Shore";
        Path file = SurveyFiles.write(dir, "labels.csv", "rating,region\n1,\"" + html.replace("\"", "\"\"") + "\"\n2,\""
                + tab + "\"\n3," + inner + "\n4,Lake Shore\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertEquals(List.of(html, tab, inner, "Lake Shore"), survey.groupLabels());
    }

    /**
     * Our rule, after an audit where "Dunsellow " (a trailing space) became a group of its own that
     * looked like "Dunsellow" in every table: spaces, tabs and invisible characters (no-break
     * space U+00A0, zero-width space U+200B, zero-width non-joiner and joiner U+200C and U+200D, word
     * joiner U+2060, byte-order mark U+FEFF, ideographic space U+3000) at
     * either end of a label are cut before the label is compared.
     */
    @Test
    void lookAlikeLabelsJoinTheirGroup() throws Exception {
        String[] lookAlikes = {"Dunsellow ", " Dunsellow", "Dunsellow\u00A0", "\u00A0Dunsellow", "Dunsellow\u200B",
            "\u200BDunsellow", "\uFEFFDunsellow", "Dunsellow\uFEFF", "\tDunsellow\t", "\u3000Dunsellow \u00A0\u200B",
            "Dunsellow\u2060", "\u200CDunsellow\u200D"};
        StringBuilder content = new StringBuilder("rating,region\n1,Dunsellow\n2,Carrow\n");
        for (String label : lookAlikes) {
            content.append("3,\"").append(label).append("\"\n");
        }
        Path file = SurveyFiles.write(dir, "lookalike.csv", content.toString());
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertEquals(List.of("Dunsellow", "Carrow"), survey.groupLabels());
        assertArrayEquals(new int[] {1 + lookAlikes.length, 1}, survey.groupSizes());
    }

    @Test
    void aLabelOfOnlyInvisibleCharactersIsAnEmptyCell() throws Exception {
        Path file = SurveyFiles.write(dir, "blank.csv", "rating,region\n1,West\n2,\"\u00A0\u200B \"\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertEquals(List.of("West"), survey.groupLabels());
        assertEquals(1L, survey.exclusions().missingByColumn().get("region"));
    }

    @Test
    void lookAlikeLevelsOfACategoricalCovariateAreOneLevel() throws Exception {
        Path file = SurveyFiles.write(dir, "levels.csv", "rating,area\n1,urban\n2,\"urban\u00A0\"\n3, rural\n"
                + "4,\"\uFEFFrural\"\n5,urban\n");
        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).level("area").build());
        assertEquals(1, survey.level().count());
        assertEquals("area=rural", survey.level().name(0));
        assertEquals("urban", survey.level().referenceLevel(0));
        assertArrayEquals(new double[] {0, 0, 1, 1, 0}, survey.level().column(0), 0.0);
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
