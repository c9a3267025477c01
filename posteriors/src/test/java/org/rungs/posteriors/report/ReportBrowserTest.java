package org.rungs.posteriors.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The report in a real browser: headless Chromium from Debian's packages (.ci/run installs it)
 * loads the page, and the test fails on a JavaScript error or on a chart missing from the
 * rendered DOM, and keeps a screenshot in target/. Without Chromium the test is skipped on a
 * developer's machine but fails when the environment variable CI is set, so CI cannot skip it.
 */
class ReportBrowserTest {
    private static final Path CHROMIUM = Path.of("/usr/bin/chromium");
    private static final Pattern SVG_ELEMENT = Pattern.compile("<svg\\b[^>]*\\sid=\"([^\"]+)\".*?</svg>", Pattern.DOTALL);

    @TempDir
    Path tmp;

    record Run(String stdout, String stderr) {
    }

    @BeforeAll
    static void requireChromium() {
        if (!Files.isExecutable(CHROMIUM)) {
            if (System.getenv("CI") != null) {
                fail(CHROMIUM + " is missing but CI is set: .ci/run must install Debian's chromium package");
            }
            Assumptions.abort(CHROMIUM + " is not installed (apt-get install chromium); browser test skipped outside CI");
        }
    }

    @Test
    void theDemoReportRendersWithEveryChartAndNoScriptError() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("demo"), FitFolderFixture.demoRegions(), true, 20261202);
        Path report = Report.write(dir);
        Run dom = chromium("--dump-dom", "--enable-logging=stderr", "--v=0", report.toUri().toString());
        assertNoScriptError(dom);
        assertChartsRendered(dom.stdout(), ReportTest.expectedChartIds(12,
                ConvergenceSection.PLOTTED_BY_RHAT + ConvergenceSection.PLOTTED_BY_ESS));
        Path screenshot = tmp.resolve("report.png");
        chromium("--screenshot=" + screenshot, "--window-size=1280,2000", report.toUri().toString());
        BufferedImage image = ImageIO.read(screenshot.toFile());
        assertEquals(1280, image.getWidth());
        assertEquals(2000, image.getHeight());
        Path kept = Path.of("target", "report-screenshot.png");
        Files.createDirectories(kept.getParent());
        Files.copy(screenshot, kept, StandardCopyOption.REPLACE_EXISTING);
    }

    @Test
    void aHundredAndFiftyGroupsRenderEveryChart() throws Exception {
        Path dir = FitFolderFixture.write(tmp.resolve("many"), FitFolderFixture.numberedRegions(150), false, 150);
        Run dom = chromium("--dump-dom", "--enable-logging=stderr", "--v=0", Report.write(dir).toUri().toString());
        assertNoScriptError(dom);
        assertChartsRendered(dom.stdout(), ReportTest.expectedChartIds(150,
                ConvergenceSection.PLOTTED_BY_RHAT + ConvergenceSection.PLOTTED_BY_ESS));
    }

    @Test
    void theScriptErrorCheckCatchesAnError() throws Exception {
        // The check must be able to fail: a page that throws is caught by the same test.
        Path page = tmp.resolve("broken.html");
        Files.writeString(page, "<!DOCTYPE html><html><body><p>x</p><script>undefinedFunction();</script></body></html>");
        Run dom = chromium("--dump-dom", "--enable-logging=stderr", "--v=0", page.toUri().toString());
        assertTrue(scriptErrors(dom).size() > 0, "the thrown error shows on the console log: " + dom.stderr());
    }

    private static void assertNoScriptError(Run run) {
        assertEquals(List.of(), scriptErrors(run), "console messages or script errors while loading the report");
        assertTrue(run.stdout().contains("</html>"), "Chromium printed the DOM");
    }

    /** Console lines of the page (Chromium logs each console message and uncaught error as CONSOLE). */
    private static List<String> scriptErrors(Run run) {
        List<String> errors = new ArrayList<>();
        for (String line : run.stderr().split("\n")) {
            if (line.contains("CONSOLE") || line.contains("Uncaught")) {
                errors.add(line);
            }
        }
        return errors;
    }

    private static void assertChartsRendered(String dom, List<String> expectedIds) {
        List<String> seen = new ArrayList<>();
        Matcher svg = SVG_ELEMENT.matcher(dom);
        while (svg.find()) {
            String id = svg.group(1);
            String element = svg.group();
            assertTrue(element.contains("<text") && (element.contains("<path") || element.contains("<line")
                    || element.contains("<rect")), "chart " + id + " has axes and marks");
            seen.add(id);
        }
        assertEquals(expectedIds, seen, "charts in the rendered page");
        assertFalse(dom.contains("<b>x</b>"));
    }

    private Run chromium(String... arguments) throws IOException, InterruptedException {
        List<String> command = new ArrayList<>(List.of(CHROMIUM.toString(), "--headless", "--no-sandbox", "--disable-gpu",
                "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update",
                "--disable-sync", "--user-data-dir=" + Files.createTempDirectory(tmp, "profile")));
        command.addAll(List.of(arguments));
        Path out = Files.createTempFile(tmp, "stdout", ".txt");
        Path err = Files.createTempFile(tmp, "stderr", ".txt");
        Process process = new ProcessBuilder(command).redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        if (!process.waitFor(90, TimeUnit.SECONDS)) {
            process.destroyForcibly();
            fail("Chromium did not finish within 90 s: " + command);
        }
        Run run = new Run(Files.readString(out, StandardCharsets.UTF_8), Files.readString(err, StandardCharsets.UTF_8));
        assertEquals(0, process.exitValue(), "Chromium failed: " + run.stderr());
        return run;
    }
}
