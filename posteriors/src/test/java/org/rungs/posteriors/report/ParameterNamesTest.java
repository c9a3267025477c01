package org.rungs.posteriors.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Names of the parameters as ParameterLayout (models) writes them, and the README's table of their meaning. */
class ParameterNamesTest {
    @TempDir
    Path tmp;

    @Test
    void aNameIsReadFromItsEndsSoGroupLabelsWithDotsOrNumbersStayGroups() {
        assertEquals("threshold.<k>", ParameterNames.of("threshold.3").pattern());
        assertEquals("threshold.<k>", ParameterNames.of("threshold.-2").pattern(), "a scale below zero");
        assertEquals("threshold.<group>.<k>", ParameterNames.of("threshold.St. Ives.3").pattern());
        assertEquals("threshold.<group>.<k>", ParameterNames.of("threshold.2024.3").pattern(), "a group labelled by a number");
        assertEquals("attraction.<j>", ParameterNames.of("attraction.7").pattern());
        assertEquals("attraction.<group>.<j>", ParameterNames.of("attraction.Eastmarch.7").pattern());
        assertEquals("style_group.<group>", ParameterNames.of("style_group.Eastmarch").pattern());
        assertEquals("style.<covariate>", ParameterNames.of("style.education.tertiary").pattern());
        assertEquals("level.<covariate>.per_unit", ParameterNames.of("level.income.per_unit").pattern());
        assertEquals("level.<covariate>", ParameterNames.of("level.income").pattern());
        assertEquals("group.<group>", ParameterNames.of("group.Eastmarch").pattern());
        assertEquals("attraction_sd", ParameterNames.of("attraction_sd").pattern());
        assertNull(ParameterNames.of("lp__"), "a name outside the model's families gets no guess");
    }

    /** Every name in the page's tables of the worst parameters is explained on the page, by its family. */
    @Test
    void thePageExplainsEveryFamilyOfNameItsTablesShow() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), false, 13);
        String html = Files.readString(Report.write(dir));
        String convergence = html.substring(html.indexOf("<section id=\"convergence\">"), html.indexOf("<h3>Trace and rank"));
        int shown = 0;
        for (String cell : convergence.split("<tr><td><code>")) {
            if (cell.startsWith("<")) {
                continue;
            }
            String name = cell.substring(0, cell.indexOf("</code>"));
            ParameterNames.Family family = ParameterNames.of(name);
            assertTrue(family != null && convergence.contains("<li><code>" + Html.escape(family.pattern()) + "</code>: "),
                    name);
            shown++;
        }
        assertEquals(2 * ConvergenceSection.WORST_ROWS, shown, "both tables read");
    }
}
