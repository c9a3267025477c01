package org.rungs.posteriors.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import javax.xml.parsers.DocumentBuilderFactory;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.w3c.dom.Element;

/** The report page as text: contents per section, escaping, self-containment, sizes from 1 to 150 groups. */
class ReportTest {
    static final String HOSTILE = "<b>x</b> & \"Co\", Ltd";
    private static final Pattern SVG = Pattern.compile("<svg\\b.*?</svg>", Pattern.DOTALL);
    private static final Pattern SVG_ID = Pattern.compile("<svg\\b[^>]*\\sid=['\"]([^'\"]+)['\"]");
    private static final Pattern SVG_HEIGHT = Pattern.compile("viewBox=['\"][-0-9.]+ [-0-9.]+ [0-9.]+ ([0-9.]+)['\"]");

    @TempDir
    Path tmp;

    static Path copyOfOneGroup(Path target) throws IOException, URISyntaxException {
        Path source = Path.of(ReportTest.class.getResource("/report/one-group/run.json").toURI()).getParent();
        Files.createDirectories(target);
        try (Stream<Path> files = Files.list(source)) {
            for (Path file : files.toList()) {
                Files.copy(file, target.resolve(file.getFileName()));
            }
        }
        return target;
    }

    /** The chart ids a complete fixture folder of {@link FitFolderFixture} must show. */
    static List<String> expectedChartIds(int groups, int plottedParameters) {
        List<String> ids = new ArrayList<>();
        for (int p = 1; p <= plottedParameters; p++) {
            ids.add("trace-" + p);
            ids.add("rank-" + p);
        }
        for (int g = 1; g <= groups; g++) {
            ids.add("dist-" + g);
        }
        ids.addAll(List.of("means", "coarse-groups", "coarse-1"));
        for (int g = 1; g <= groups + 1; g++) {
            ids.add("attraction-" + g);
        }
        for (int c = 1; c <= FitFolderFixture.COVARIATES.size(); c++) {
            ids.add("coefficient-" + c);
        }
        return ids;
    }

    /** Ids of the page's {@code <svg>} elements, in order. */
    static List<String> chartIds(String html) {
        return SVG_ID.matcher(html).results().map(m -> m.group(1)).toList();
    }

    @Test
    void oneGroupShowsTheGroupLabelAsTextAndSaysWhichComponentsWereOff() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        Path report = Report.write(dir);
        assertEquals(dir.resolve("report.html").toAbsolutePath(), report);
        String html = Files.readString(report);
        assertFalse(html.contains("<b>x</b>"), "a label from the data must never become markup");
        assertFalse(html.contains("<b>pilot</b>"), "the file name must be escaped too");
        assertTrue(html.contains("&lt;b&gt;x&lt;/b&gt; &amp; &quot;Co&quot;, Ltd"), "the label shows as text");
        assertTrue(chartIds(html).containsAll(List.of("trace-1", "rank-1", "dist-1", "means")), chartIds(html).toString());
        assertTrue(html.contains("coarse-responder class was off"));
        assertTrue(html.contains("Number attraction was off in this model"));
        assertTrue(html.contains("No covariate effects were computed"));
        assertTrue(html.contains("All 5 parameters pass the checks"));
        assertTrue(html.contains("rows excluded</td><td>4"), "rows excluded from run.json");
        assertTrue(html.contains("missing in <code>rating</code></td><td>3"), "excluded by reason");
        assertTrue(html.contains("0.4 s"), "time taken");
        assertTrue(html.contains("iterations per kept draw</td><td>1"), "no thin in run.json: every iteration");
        assertFalse(html.contains("joint step:"), "the plain model has no joint step");
    }

    @Test
    void everySvgIsWellFormedXmlSoLabelsInsideChartsAreEscapedToo() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        String html = Files.readString(Report.write(dir));
        Matcher svg = SVG.matcher(html);
        int count = 0;
        DocumentBuilderFactory factory = DocumentBuilderFactory.newInstance();
        factory.setNamespaceAware(true);
        while (svg.find()) {
            // A parse error here means raw '<' or '&' from the data inside a chart.
            Element root = factory.newDocumentBuilder()
                    .parse(new ByteArrayInputStream(svg.group().getBytes(StandardCharsets.UTF_8))).getDocumentElement();
            assertEquals("svg", root.getLocalName());
            count++;
        }
        // 5 parameters: trace and rank plots for all 5, then one distribution and the means chart.
        assertEquals(12, count);
        assertTrue(html.contains("&lt;b&gt;x&lt;/b&gt;") && SVG.matcher(html).results()
                .anyMatch(m -> m.group().contains("id='means'") && m.group().contains("&lt;b&gt;x")),
                "the means chart labels its row with the escaped group label");
    }

    @Test
    void theReportNeedsNothingFromOutsideTheFile() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 11);
        String html = Files.readString(Report.write(dir));
        assertFalse(html.toLowerCase().contains("<script"), "no JavaScript");
        assertFalse(html.contains("<link"), "no external style sheet");
        assertFalse(html.contains("src="), "no external image or script");
        assertFalse(Pattern.compile("url\\(\\s*['\"]?http").matcher(html).find(), "no external resource from CSS");
        assertFalse(Pattern.compile("href=\"(?!#)").matcher(html).find(), "links point inside the page only");
    }

    @Test
    void aCompleteFolderShowsEveryChartAndSection() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        String html = Files.readString(Report.write(dir));
        assertEquals(expectedChartIds(12, ConvergenceSection.PLOTTED_BY_RHAT + ConvergenceSection.PLOTTED_BY_ESS), chartIds(html));
        for (String region : FitFolderFixture.demoRegions()) {
            assertTrue(html.contains(region), region);
        }
        assertTrue(html.contains("naive least squares"));
        assertTrue(html.contains("<b>female</b> (column <code>sex</code>)"), "covariate with its source column");
        assertTrue(html.contains("secondary"), "coarse share per level of education");
        assertTrue(html.contains("not causal"), "cautions");
        assertTrue(html.contains("iterations per kept draw</td><td>2"), "the thinning from run.json");
        assertTrue(html.contains("joint step: leapfrog steps per chain</td><td>6.053, 8.058, 11.699, 6.003"), "joint step from run.json");
        assertTrue(html.contains("joint step: stopped on a wall per chain</td><td>0.272, 0.240, 0.239, 0.317"), "walls from run.json");
        assertTrue(html.contains("spreads moved with their deviations per chain</td><td>none; style_sd; threshold_sd, style_sd; none"),
                "spread moves from run.json");
        assertTrue(html.contains("The plain ordered probit's chains (4 of 1000 warm-up and 1000 kept iterations): All 153 "
                + "quantities converged"), "the comparison fit's own verdict from run.json");
        assertFalse(html.contains("has not converged"));
        assertTrue(html.contains("elpd_loo (se)</td><td>-33,438.5 (97.6)"), "cross-validation from run.json");
        assertTrue(html.contains("Pareto k above 0.7</td><td>3 of 18,000"), "bad and very bad k counted together");
    }

    @Test
    void aFitThatDidNotConvergeSaysSoAtTheTopInPlainWords() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), false, 13);
        String html = Files.readString(Report.write(dir));
        int verdict = html.indexOf("This fit has not converged");
        assertTrue(verdict > 0);
        assertTrue(verdict < html.indexOf("<h2>1. What was fitted"), "the verdict comes before any result");
        assertTrue(html.contains("R-hat, bulk ESS, tail ESS"), "failed checks in the table of worst parameters");
    }

    /**
     * One parameter flagged for R-hat alone: within chance when summary.csv gives R-hat's chance
     * (0.3, so 1 - 0.7^n for the family), not converged when the file predates that column.
     */
    @Test
    void anRhatFlagWithinChanceLeavesTheFitReadable() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        Path summary = dir.resolve("summary.csv");
        List<String> lines = Files.readAllLines(summary);
        List<String> withChance = new ArrayList<>();
        withChance.add(lines.get(0) + ",rhat_chance");
        for (int i = 1; i < lines.size(); i++) {
            String[] f = lines.get(i).split(",");
            if (i == 3) {
                f[6] = "1.012";
                f[10] = "rhat>1.01";
            }
            withChance.add(String.join(",", f) + (i == 3 ? ",0.3" : ",0.6"));
        }
        Files.write(summary, withChance);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("This fit has converged within chance: 1 of " + (lines.size() - 1) + " parameters has an R-hat"), "verdict");
        assertTrue(html.contains("<td>1.012</td><td>0.300</td>"), "R-hat and its chance in the table of the worst");
        // 1 - 0.7^n is above 0.995 for the fixture's n, which %.2f showed as a certain 1.00
        assertTrue(html.contains("among " + (lines.size() - 1) + " parameters with probability &gt; 0.99, so"), "family chance");
        assertFalse(html.contains("probability 1.00"));
        assertFalse(html.contains("has not converged"));
        assertFalse(html.contains("should be relied on yet"), "no caution about convergence");

        List<String> without = new ArrayList<>();
        for (String line : withChance) {
            without.add(line.substring(0, line.lastIndexOf(',')));
        }
        Files.write(summary, without);
        assertTrue(Files.readString(Report.write(dir)).contains("This fit has not converged: 1 of"), "an older summary.csv");
    }

    /** Fewer than 100 kept draws per chain cannot give 100 effective draws: the verdict says to keep more. */
    @Test
    void aFitWithTooFewDrawsIsToldToKeepMore() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        Path summary = dir.resolve("summary.csv");
        List<String> lines = new ArrayList<>(Files.readAllLines(summary));
        lines.set(1, lines.get(1).replace(",ok", ",ess_bulk<100"));
        Files.write(summary, lines);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("This fit has not converged"), "the flagged row makes it unconverged");
        assertTrue(html.contains("With 8 kept draws per chain no quantity can reach 100 effective draws per chain: keep at"
                + " least 100 (--draws)."), "the advice for the fixture's 8 draws per chain");
        Path run = dir.resolve("run.json");
        Files.writeString(run, Files.readString(run).replace("\"kept_draws\": 8", "\"kept_draws\": 1000"));
        assertFalse(Files.readString(Report.write(dir)).contains("kept draws per chain no quantity"), "enough draws");
    }

    /**
     * The corrected means, shares and ranks on the page are derived quantities: their own verdict
     * (run.json's warning, as FitJob writes it) joins the top verdict, which turns to an alarm
     * when they have not converged and stays calm when their flags are within chance (our rule;
     * an audit found a green verdict above figures whose chains had not converged).
     */
    @Test
    void theDerivedQuantitiesVerdictJoinsTheTopVerdict() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        Path run = dir.resolve("run.json");
        String original = Files.readString(run);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<p id=\"verdict\" class=\"ok\">"), "the fixture converged");
        assertFalse(html.contains("have their own check"), "no derived warning, no sentence");
        Files.writeString(run, original.replace("\"warnings\": [", "\"warnings\": [\"derived quantities: Not converged: 2 of 9"
                + " derived quantities flagged: intended_share.0, intended_mean.\", "));
        html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<p id=\"verdict\" class=\"alarm\">"), "not converged: an alarm");
        assertTrue(html.contains("have their own check: Not converged: 2 of 9 derived quantities flagged: intended_share.0,"
                + " intended_mean."), "the derived verdict in the top verdict");
        Files.writeString(run, original.replace("\"warnings\": [", "\"warnings\": [\"derived quantities: Converged within"
                + " chance: 1 of 9 derived quantities has an R-hat a little above 1.01.\", "));
        html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<p id=\"verdict\" class=\"ok\">"), "within chance: readable");
        assertTrue(html.contains("have their own check: Converged within chance"), html);
        // run.json since the forty-second session: the verdict always, so a converged one is said too
        Files.writeString(run, original.replace("\"warnings\": [", "\"derived_verdict\": \"All 9 derived quantities"
                + " converged (R-hat <= 1.01, bulk and tail ESS >= 100 per chain).\", \"warnings\": ["));
        html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<p id=\"verdict\" class=\"ok\">"), html);
        assertTrue(html.contains("have their own check: All 9 derived quantities converged"), html);
        Files.writeString(run, original.replace("\"warnings\": [", "\"derived_verdict\": \"Not converged: 1 of 9"
                + " derived quantities flagged: intended_mean.\", \"warnings\": ["));
        html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<p id=\"verdict\" class=\"alarm\">"), html);
    }

    @Test
    void anInterruptedRunSaysHowManyDrawsWereKept() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        Path run = dir.resolve("run.json");
        Files.writeString(run, Files.readString(run).replace("\"kept_draws\": 8", "\"kept_draws\": 5")
                .replace("\"interrupted\": false", "\"interrupted\": true"));
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("The run was interrupted: only 5 of 8 draws per chain were kept."));
    }

    /** A fit that kept its chains (run.json's "continuable", as FitJob writes it) is told how to run them on. */
    @Test
    void aFitThatKeptItsChainsSaysHowToContinueThem() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        String continuation = Html.escape("'rungs fit --resume DIR --thin K', with K a multiple of this fit's thin (1), runs them on");
        assertFalse(Files.readString(Report.write(dir)).contains(continuation), "the fixture kept no chains");
        Path run = dir.resolve("run.json");
        Files.writeString(run, Files.readString(run).replace("\"finished\":", "\"continuable\": true, \"finished\":"));
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains(continuation), html);
        assertTrue(html.contains(Html.escape("as does --draws N with N above its draws per chain (8).")), html);
    }

    @Test
    void aHundredAndFiftyGroupsGetOneChartEachAndRoomForEveryLabel() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.numberedRegions(150), true, 14);
        String html = Files.readString(Report.write(dir));
        assertEquals(expectedChartIds(150, ConvergenceSection.PLOTTED_BY_RHAT + ConvergenceSection.PLOTTED_BY_ESS), chartIds(html));
        String meansTag = SVG.matcher(html).results().map(m -> m.group()).filter(s -> s.matches("(?s)<svg[^>]*id='means'.*"))
                .findFirst().orElseThrow().substring(0, 600);
        Matcher height = SVG_HEIGHT.matcher(meansTag);
        assertTrue(height.find(), meansTag);
        assertTrue(Double.parseDouble(height.group(1)) >= 150 * DotPlot.ROW_HEIGHT, "one row of height per group label");
        // the report's time is measured by bench/demos (BENCHMARKS.md), not here
    }

    @Test
    void theReportIsWrittenAtomicallyWithoutLeavingTemporaryFiles() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        Report.write(dir);
        Report.write(dir);
        try (Stream<Path> files = Files.list(dir)) {
            assertEquals(List.of(), files.map(f -> f.getFileName().toString()).filter(n -> n.endsWith(".tmp")).toList());
        }
    }

    @Test
    void aFolderWithoutRunJsonIsRefusedWithAMessageNamingTheFile() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        Files.delete(dir.resolve("run.json"));
        IOException e = assertThrows(IOException.class, () -> Report.write(dir));
        assertTrue(e.getMessage().contains("run.json is missing"), e.getMessage());
        assertFalse(Files.exists(dir.resolve("report.html")));
    }

    @Test
    void aMalformedRunJsonIsNamedByItsFullPathRowAndColumn() throws Exception {
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        // a control character where a value belongs: the message shows it escaped, never raw
        Files.writeString(dir.resolve("run.json"), "{\n  \"input\": \u0007}");
        IOException e = assertThrows(IOException.class, () -> Report.write(dir));
        String full = dir.resolve("run.json").toAbsolutePath().toString();
        assertTrue(e.getMessage().startsWith(full + ", row 2, column 12: "), e.getMessage());
        assertTrue(e.getMessage().contains("\\u0007"), e.getMessage());
        assertFalse(e.getMessage().contains("\u0007"), "no raw control character in the message");
        assertFalse(Files.exists(dir.resolve("report.html")));
    }

    @Test
    void aRunJsonWithoutItsInputSaysTheRowsExcludedAreUnknown() throws Exception {
        // our rule: a fact run.json does not hold is shown as unknown, never as a guess such as 0
        Path dir = copyOfOneGroup(tmp.resolve("fit"));
        String run = Files.readString(dir.resolve("run.json"));
        int from = run.indexOf("  \"input\"");
        int to = run.indexOf("  \"model\"");
        Files.writeString(dir.resolve("run.json"), run.substring(0, from) + run.substring(to));
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("rows excluded</td><td>" + Report.NOT_RECORDED), html);
        assertTrue(html.contains("rows read</td><td>" + Report.NOT_RECORDED), html);
    }

    @Test
    void absentDerivedFilesAreNamedInOneSentenceEach() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 15);
        for (String file : List.of("groups.csv", "distributions.csv", "coarse_shares.csv", "coefficients.csv", "attraction.csv")) {
            Files.delete(dir.resolve(file));
        }
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("Rating distributions were not computed for this fit (no distributions.csv"));
        assertTrue(html.contains("Group means were not computed for this fit (no groups.csv"));
        assertTrue(html.contains("The attraction profile was not computed for this fit (no attraction.csv"),
                "attraction was on in run.json, so the file is missing rather than the component off");
        assertFalse(chartIds(html).contains("dist-1"));
        assertTrue(chartIds(html).contains("trace-1"));
    }
    /**
     * groups.csv's rank_change is the posterior mean intended rank minus the rank by reported mean
     * (DerivedTables, sampler): a group reported third and intended first has -2 and moves up.
     */
    @Test
    void theRankChangeIsExplainedWithTheSignGroupsCsvGivesIt() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        CsvTable groups = CsvTable.read(dir.resolve("groups.csv"));
        int moved = -1;
        for (int r = 0; r < groups.size(); r++) {
            if (groups.number(r, "rank_change") < 0) {
                moved = r;
            }
        }
        assertTrue(moved >= 0, "the fixture has a group that moves up");
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("Rank change: intended rank (posterior mean) minus rank by reported mean; a negative change "
                + "means the group moves up"), "the sentence states groups.csv's sign");
        String row = html.substring(html.indexOf("<tr><td>" + groups.text(moved, "group") + "</td>"));
        row = row.substring(0, row.indexOf("</tr>"));
        assertTrue(row.contains("<td>" + Html.number(groups.number(moved, "rank_change"), 0) + "</td>"), row);
    }

    /**
     * groups.csv's P(top 3) is a share of draws (DerivedTables): 0.997 is not certain and must not
     * read 1.00, and exactly 1 means no draw outside the top 3, not certainty (our rule).
     */
    @Test
    void aProbabilityThatRoundsToOneOrZeroIsNotShownAsCertain() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        Path file = dir.resolve("groups.csv");
        List<String> lines = new ArrayList<>(Files.readAllLines(file));
        int column = List.of(lines.get(0).split(",")).indexOf("p_top3_intended");
        String[] shares = {"0.997", "1.0", "0.002", "0.0", "0.6412"};
        List<String> groups = new ArrayList<>();
        for (int i = 0; i < shares.length; i++) {
            String[] fields = lines.get(i + 1).split(",");
            fields[column] = shares[i];
            lines.set(i + 1, String.join(",", fields));
            groups.add(fields[0]);
        }
        Files.write(file, lines);
        String html = Files.readString(Report.write(dir));
        String[] shown = {"&gt; 0.99", "all draws", "&lt; 0.01", "no draw", "0.64"};
        for (int i = 0; i < shares.length; i++) {
            String row = html.substring(html.indexOf("<tr><td>" + groups.get(i) + "</td>"));
            row = row.substring(0, row.indexOf("</tr>"));
            assertTrue(row.endsWith("<td>" + shown[i] + "</td>"), shares[i] + ": " + row);
        }
        assertTrue(html.contains("P(top 3): the share of the posterior draws (the 1,000 of derived_draws.csv) in which"),
                "the note reads the shares, with run.json's derived_draws");
        assertTrue(html.contains("&ldquo;all draws&rdquo; and &ldquo;no draw&rdquo; a share of exactly 1 or 0"));
    }

    /** R-hat's chance is computed, never certain: one that rounds to 0 at three decimals reads "< 0.001" (our rule). */
    @Test
    void anRhatChanceThatRoundsToZeroReadsBelowTheLastDecimal() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), false, 13);
        Path summary = dir.resolve("summary.csv");
        List<String> lines = Files.readAllLines(summary);
        List<String> withChance = new ArrayList<>(List.of(lines.get(0) + ",rhat_chance"));
        for (int i = 1; i < lines.size(); i++) {
            withChance.add(lines.get(i) + (lines.get(i).contains("rhat>1.01") ? ",2.4e-9" : ",0.6"));
        }
        Files.write(summary, withChance);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<td>&lt; 0.001</td>"), "the chance of a stuck chain's R-hat");
        assertFalse(html.contains("<td>0.000</td>"));
    }

    /** Our rule: a rank change that rounds to zero shows no sign ("0.0", never "+0.0" or "-0.0"). */
    @Test
    void aRankChangeThatRoundsToZeroHasNoSign() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        Path file = dir.resolve("groups.csv");
        List<String> lines = new ArrayList<>(Files.readAllLines(file));
        for (int i = 1; i < lines.size(); i++) {
            String line = lines.get(i);
            lines.set(i, line.substring(0, line.lastIndexOf(',') + 1) + (i % 2 == 0 ? "0.04" : "-0.04"));
        }
        Files.write(file, lines);
        String html = Files.readString(Report.write(dir));
        assertFalse(html.contains("<td>+0.0</td>"), "no plus sign on zero");
        assertFalse(html.contains("<td>-0.0</td>"), "no minus sign on zero");
        assertTrue(html.contains("<td>0.0</td>"));
    }

    /** draws.csv numbers the kept draws: with --thin 2 (the fixture's run.json) the trace's axis counts kept draws. */
    @Test
    void theTracePlotsAxisCountsKeptDrawsWhenTheChainsWereThinned() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        String html = Files.readString(Report.write(dir));
        String trace = SVG.matcher(html).results().map(m -> m.group()).filter(s -> s.contains("id='trace-1'")).findFirst()
                .orElseThrow();
        assertTrue(trace.contains("Kept draw after warm-up (one every 2 iterations)"), "thin 2 from run.json");
        assertFalse(trace.contains("Iteration after warm-up"));
        Path plain = copyOfOneGroup(tmp.resolve("plain"));
        assertTrue(Files.readString(Report.write(plain)).contains("Iteration after warm-up"), "no thin: every iteration is kept");
    }

    /** summary.csv's ESS is over all chains; the flag asks 100 per chain (ParameterSummary), 400 for 4 chains. */
    @Test
    void theEssColumnsSayTheyCountAllChainsAgainstTheLimitForThisManyChains() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<th>bulk ESS (all chains)</th><th>tail ESS (all chains)</th>"), "headers");
        assertTrue(html.contains("the check asks for 100 per chain, so 400 for these 4 chains"), "the limit for 4 chains");
    }

    /** MODEL.md 4b: exp(a) is the odds multiplier of reporting j rather than the other numbers, not a share's factor. */
    @Test
    void theAttractionNoteReadsExpAAsAnOddsMultiplier() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("exp(a) is the odds multiplier of answering a number rather than another"));
        assertFalse(html.contains("multiplies the chance of answering"), "the probabilities are renormalised (MODEL.md 4b)");
    }

    /**
     * elpd_loo, p_loo and the Pareto k count are read in plain words beside run.json's figures
     * (Vehtari, Gelman & Gabry 2017), with the number of parameters when run.json gives it.
     */
    @Test
    void theLeaveOneOutFiguresAreExplainedBesideThem() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<td>elpd_loo (se)</td><td>-33,438.5 (97.6)</td>"), "the figures");
        assertTrue(html.contains("elpd_loo is the expected log predictive density, estimated by leave-one-out cross-validation "
                + "with Pareto-smoothed importance sampling (PSIS-LOO; Vehtari, Gelman &amp; Gabry 2017)"), "what it is");
        assertTrue(html.contains("Higher (nearer 0) is better, but only between fits of the same ratings"), "how to read it");
        assertTrue(html.contains("p_loo is the effective number of parameters"));
        assertTrue(html.contains("in a fit that works it stays below the number of parameters. Pareto k"), "no count in the fixture");
        assertTrue(html.contains("above 0.7 the shortcut that spares refitting without that respondent is unreliable"));
        Path run = dir.resolve("run.json");
        Files.writeString(run, Files.readString(run).replace("\"model\": {", "\"model\": {\"parameters\": 270, "));
        assertTrue(Files.readString(Report.write(dir)).contains("below the number of parameters (270 in this model)."));

        Path plain = copyOfOneGroup(tmp.resolve("plain"));
        String without = Files.readString(Report.write(plain));
        assertFalse(without.contains("elpd_loo"), "no cross-validation, no words on it");
    }

    /** Every prior run.json lists (the ten names of --prior) says on the page what it is the prior of. */
    @Test
    void everyPriorSaysWhatItIsThePriorOf() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        String html = Files.readString(Report.write(dir));
        String priors = html.substring(html.indexOf("<h3>Priors</h3>"), html.indexOf("</table>", html.indexOf("<h3>Priors</h3>")));
        assertTrue(priors.contains("normal(m, s) is a normal distribution with mean m and standard deviation s; half-normal(s) its "
                + "half above 0, for a spread."), "how a prior is written");
        assertTrue(priors.contains("<th>parameter</th><th>prior</th><th>the prior of</th>"));
        // Priors.NAMES in the priors module, which the report does not depend on
        for (String key : List.of("level", "group_mean", "group_sd", "threshold", "threshold_sd", "style", "style_mean",
                "style_sd", "attraction_mean", "attraction_sd")) {
            Matcher row = Pattern.compile("<tr><td><code>" + key + "</code></td><td>[^<]+</td><td>([^<]*)</td></tr>").matcher(priors);
            assertTrue(row.find(), key);
            assertTrue(row.group(1).length() > 10 && !row.group(1).equals("&ndash;"), key + ": " + row.group(1));
        }
        assertTrue(priors.contains("<tr><td><code>threshold_sd</code></td><td>half-normal(0.5)</td><td>spread of the groups' "
                .replace("'", "&#39;") + "thresholds around the common ones</td></tr>"), priors);
        assertTrue(priors.contains("<tr><td><code>level</code></td><td>normal(0.0, 1.0)</td><td>each effect of a covariate on the "
                + "latent level, per standard deviation of a numeric column or per 0/1 indicator</td></tr>"), priors);
        Path run = dir.resolve("run.json");
        Files.writeString(run, Files.readString(run).replace("\"level\": \"normal(0.0, 1.0)\"", "\"lambda\": \"normal(0.0, 1.0)\""));
        assertTrue(Files.readString(Report.write(dir)).contains("<tr><td><code>lambda</code></td><td>normal(0.0, 1.0)</td>"
                + "<td>&ndash;</td></tr>"), "a key the report does not know gets no guess");
    }

    /** Sets one row of attraction.csv (the fixture's columns) to exp(a)'s mean and interval and P(a > 0). */
    private static void setAttraction(Path dir, String group, int rating, double exp, double low, double high, double positive)
            throws IOException {
        Path file = dir.resolve("attraction.csv");
        List<String> lines = new ArrayList<>(Files.readAllLines(file));
        List<String> header = List.of(lines.get(0).split(","));
        boolean found = false;
        for (int i = 1; i < lines.size(); i++) {
            String[] f = lines.get(i).split(",");
            if (f[0].equals(group) && f[1].equals(Integer.toString(rating))) {
                f[header.indexOf("exp_a_mean")] = Double.toString(exp);
                f[header.indexOf("exp_a_q5")] = Double.toString(low);
                f[header.indexOf("exp_a_q95")] = Double.toString(high);
                f[header.indexOf("p_positive")] = Double.toString(positive);
                lines.set(i, String.join(",", f));
                found = true;
            }
        }
        assertTrue(found, group + " " + rating);
        Files.write(file, lines);
    }

    /**
     * The console's words on attraction (AttractionWords, shared) on the page, from attraction.csv:
     * P(a > 0) above 0.95 liked, below 0.05 avoided, exactly 0.95 neither; with several groups the
     * common terms are not spoken of, as on the console.
     */
    @Test
    void theNumbersCrediblyLikedOrAvoidedAreSaidAsOnTheConsole() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        String before = Files.readString(Report.write(dir));
        assertTrue(before.contains("<li>Eastmarch, Brackenreach, Corrowmere, Dunsellow, Glimmerford, Quillhaven, Tarnwhistle, "
                + "Vellanmoor, Orrinsdale, Saltergrim, Lowenfurrow, Mistlecombe: no number credibly liked or avoided</li>"),
                "the fixture's P(a > 0) are 0.9 and 0.3");
        setAttraction(dir, "Eastmarch", 5, 1.6, 1.2, 2.1, 0.97);
        setAttraction(dir, "Eastmarch", 10, 0.6, 0.4, 0.8, 0.01);
        setAttraction(dir, "Brackenreach", 0, 1.3, 0.9, 1.9, 0.95);
        setAttraction(dir, "all", 5, 2.0, 1.5, 2.5, 0.99);
        String html = Files.readString(Report.write(dir));
        String section = html.substring(html.indexOf("<section id=\"attraction\">"), html.indexOf("<section id=\"coefficients\">"));
        assertTrue(section.contains("<p>Numbers liked or avoided (P(a &gt; 0) "
                + "above 0.95 or below 0.05; 1x = as often as the latent level implies):</p>"), "the rule");
        assertTrue(section.contains("<li><b>Eastmarch</b>: 5 is chosen 1.6x as often as expected (90% interval 1.2x to 2.1x); "
                + "10 is avoided: chosen 0.6x as often (0.4x to 0.8x)</li>"), section);
        assertTrue(section.contains("<li>Brackenreach, Corrowmere, "), "P(a > 0) of exactly 0.95 is not above 0.95");
        assertFalse(section.contains("<li><b>all</b>"), "the common terms are not a group's words");
    }

    /**
     * The console's line on weakly identified attraction terms (posterior sd above 0.8 x prior
     * sd, AttractionWords.WEAK) on the page too, from attraction.csv's sd_ratio; a folder whose
     * file has no sd_ratio gets no such line rather than a false "every term is informed".
     */
    @Test
    void theHardlyIdentifiedTermsAreNamedAsOnTheConsole() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        assertTrue(Files.readString(Report.write(dir)).contains("<p>Every attraction term is informed by the data "
                + "(posterior sd above 0.8 x prior sd for none).</p>"), "the fixture's sd ratios are 0.4");
        Path file = dir.resolve("attraction.csv");
        List<String> lines = new ArrayList<>(Files.readAllLines(file));
        for (int i = 1; i < lines.size(); i++) {
            String[] f = lines.get(i).split(",");
            if ((f[0].equals("all") && f[1].equals("0")) || (f[0].equals("Corrowmere") && !f[1].equals("5"))) {
                f[f.length - 1] = "0.81";
                lines.set(i, String.join(",", f));
            }
        }
        Files.write(file, lines);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<p>Hardly identified by the data (posterior sd above 0.8 x prior sd; sd_ratio in "
                + "attraction.csv): 3 of 39 attraction terms: common terms 0; Corrowmere 0, 10.</p>"), html);
        List<String> without = new ArrayList<>();
        for (String line : lines) {
            without.add(line.substring(0, line.lastIndexOf(',')));
        }
        Files.write(file, without);
        String old = Files.readString(Report.write(dir));
        assertFalse(old.contains("Hardly identified") || old.contains("Every attraction term"), "no sd_ratio column, no line");
    }

    /** With one group attraction.csv holds only the common terms, and the words are theirs (as on the console). */
    @Test
    void oneGroupsWordsAreThoseOfTheCommonTerms() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), List.of("Eastmarch"), true, 12);
        Path file = dir.resolve("attraction.csv");
        List<String> lines = Files.readAllLines(file);
        Files.write(file, lines.subList(0, 1 + FitFolderFixture.ATTRACTING.length));
        setAttraction(dir, "all", 10, 0.043, 0.02, 0.09, 0.001);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<li><b>all</b>: 10 is avoided: chosen 0.043x as often (0.020x to 0.090x)</li>"), html);
    }

    /** A group labelled "all" follows the common terms, whose numbers increase: its rows stay a group's. */
    @Test
    void aGroupLabelledAllIsNotTakenForTheCommonTerms() throws Exception {
        Path file = tmp.resolve("attraction.csv");
        Files.writeString(file, """
                group,rating,exp_a_mean,exp_a_q5,exp_a_q95,p_positive,sd_ratio
                all,3,1,1,1,0.5,0.5
                all,7,1,1,1,0.5,0.5
                all,3,1,1,1,0.5,0.5
                all,7,1,1,1,0.5,0.5
                Vale,3,1,1,1,0.5,0.5
                Vale,7,1,1,1,0.5,0.5
                """);
        assertEquals(List.of(true, true, false, false, false, false),
                AttractionSection.terms(CsvTable.read(file)).stream().map(t -> t.common()).toList());
    }

    /** At most about one count in ten lies outside a 90% interval by chance: the page says how many did, against that. */
    @Test
    void theRatingsOutsideTheirPredictiveIntervalAreCountedAgainstChance() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        CsvTable table = CsvTable.read(dir.resolve("distributions.csv"));
        int outside = 0;
        for (int r = 0; r < table.size(); r++) {
            outside += table.text(r, "outside_90").equals("true") ? 1 : 0;
        }
        assertTrue(outside > 0, "the fixture marks some");
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains(outside + " of the " + table.size() + " ratings of all groups do so. By chance alone at most "
                + "about one in ten (" + Math.round(0.1 * table.size()) + " here) would"), "count from distributions.csv");
        assertFalse(html.contains("which the model does not explain"));
    }

    /** Every table has named header cells, not hidden from assistive technology by display:none. */
    @Test
    void everyHeaderCellHasANameAndNoneIsHiddenFromScreenReaders() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        String html = Files.readString(Report.write(dir));
        assertFalse(html.contains("<th></th>"), "an empty header cell");
        assertFalse(Pattern.compile("thead\\s*\\{[^}]*display:\\s*none").matcher(html).find(), "display:none hides headers from screen readers");
        assertTrue(html.contains("<th>parameter</th><th>prior</th>"));
    }
    /**
     * Our rule: each covariate's row keeps three significant digits of its largest effect. The
     * rows are the attraction demo's coefficients.csv (seed 1): per year of age the effects are
     * near 0.004, which four fixed decimals cut to two digits and the bias to one.
     */
    @Test
    void smallEffectsPerUnitKeepThreeSignificantDigits() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("fit"), FitFolderFixture.demoRegions(), true, 12);
        Files.writeString(dir.resolve("coefficients.csv"), """
                covariate,kind,ame_mean,ame_q5,ame_q95,ame_per_unit_mean,ame_per_unit_q5,ame_per_unit_q95,naive_ols_per_unit,plain_probit_per_unit_mean,plain_probit_per_unit_q5,plain_probit_per_unit_q95,naive_bias
                income,numeric,0.345210,0.305448,0.386087,0.205138,0.181510,0.229429,0.192956,0.200274,0.186022,0.213444,-0.0121826
                age,numeric,-0.0644459,-0.0890901,-0.0401277,-0.00429603,-0.00593884,-0.00267495,-0.00415431,-0.00409610,-0.00561542,-0.00261776,0.000141726
                """);
        String html = Files.readString(Report.write(dir));
        assertTrue(html.contains("<tr><td>income</td><td>numeric</td><td>0.193</td><td>0.205 <span class=\"int\">[0.182, 0.229]</span>"
                + "</td><td>0.200 <span class=\"int\">[0.186, 0.213]</span></td><td>-0.012</td></tr>"), "income");
        assertTrue(html.contains("<tr><td>age</td><td>numeric</td><td>-0.00415</td><td>-0.00430 <span class=\"int\">[-0.00594, "
                + "-0.00267]</span></td><td>-0.00410 <span class=\"int\">[-0.00562, -0.00262]</span></td><td>0.00014</td></tr>"), "age");
    }
}
