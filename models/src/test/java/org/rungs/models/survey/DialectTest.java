package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Delimiters, quoting, line ends, byte-order mark and gzip, as the reading rules require. */
class DialectTest {

    @TempDir
    Path dir;

    private static final Scale ZERO_TEN = new Scale(0, 10);

    @Test
    void readsAByteOrderMarkAndCrlfLineEnds() throws Exception {
        Path file = SurveyFiles.resource("bom-crlf.csv");
        byte[] bytes = Files.readAllBytes(file);
        assertEquals(0xEF, bytes[0] & 0xFF, "fixture starts with the UTF-8 byte-order mark");
        assertTrue(new String(bytes, StandardCharsets.UTF_8).contains("\r\n"), "fixture has CRLF line ends");

        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).group("country").level("age").build());

        assertArrayEquals(new int[] {7, 10, 0}, SurveyFiles.ratings(survey));
        assertEquals(List.of("Northmark", "South \"Vale\""), survey.groupLabels());
        assertArrayEquals(new int[] {0, 1, 0}, survey.group());
        assertEquals(3, survey.exclusions().rowsRead());
    }

    @Test
    void readsTabSeparatedWithCommasInsideFields() throws Exception {
        Survey survey = SurveyReader.read(SurveyFiles.resource("tabs.tsv"),
                SurveySpec.builder("rating", ZERO_TEN).group("region").build());
        assertArrayEquals(new int[] {3, 5}, SurveyFiles.ratings(survey));
        assertEquals(List.of("Lake, East", "Highland"), survey.groupLabels());
    }

    @Test
    void readsSemicolonSeparatedWhenTheHeaderHasNoComma() throws Exception {
        Survey survey = SurveyReader.read(SurveyFiles.resource("semicolon.csv"),
                SurveySpec.builder("rating", ZERO_TEN).group("region").level("income").build());
        assertArrayEquals(new int[] {4, 6}, SurveyFiles.ratings(survey));
        assertEquals(1000.25, survey.level().centre(0), 0.0);
    }

    @Test
    void readsQuotedDelimitersDoubledQuotesAndLineBreaksInsideQuotes() throws Exception {
        Path file = SurveyFiles.resource("quoted-multiline.csv");
        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).group("region").build());
        assertArrayEquals(new int[] {8, 3, 5}, SurveyFiles.ratings(survey));
        assertEquals(List.of("Lake Shore", "Upland"), survey.groupLabels());
        assertArrayEquals(new int[] {0, 1, 0}, survey.group());
    }

    @Test
    void countsRowsAsLinesOfTheFileWhenQuotedFieldsSpanLines() throws Exception {
        // records start on lines 2, 4 and 5; the bad rating is on the record starting at line 5
        Path file = SurveyFiles.write(dir, "lines.csv", "rating,note\n1,\"a\nb\"\n2,x\n11,y\n");
        SurveyInputException e = org.junit.jupiter.api.Assertions.assertThrows(SurveyInputException.class,
                () -> SurveyReader.read(file, SurveySpec.of("rating", null, ZERO_TEN)));
        assertEquals(5, e.row());
    }

    @Test
    void readsGzipByMagicBytesNotByName() throws Exception {
        String text = "rating,region\n4,Upland\n9,Lake\n";
        Path gzipNamedCsv = SurveyFiles.write(dir, "data.csv", SurveyFiles.gzip(text.getBytes(StandardCharsets.UTF_8)));
        Path plainNamedGz = SurveyFiles.write(dir, "data.csv.gz", text);
        SurveySpec spec = SurveySpec.of("rating", "region", ZERO_TEN);
        for (Path file : List.of(gzipNamedCsv, plainNamedGz)) {
            Survey survey = SurveyReader.read(file, spec);
            assertArrayEquals(new int[] {4, 9}, SurveyFiles.ratings(survey), file.toString());
            assertEquals(List.of("Upland", "Lake"), survey.groupLabels());
        }
    }

    @Test
    void readsGzipOfATabFileWithBomAndCrlf() throws Exception {
        byte[] text = "\uFEFFrating\tregion\r\n2\tUpland\r\n\"3\"\tLake\r\n".getBytes(StandardCharsets.UTF_8);
        Path file = SurveyFiles.write(dir, "data.tsv.gz", SurveyFiles.gzip(text));
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertArrayEquals(new int[] {2, 3}, SurveyFiles.ratings(survey));
    }

    @Test
    void skipsEmptyLinesAndReadsALastLineWithoutLineEnd() throws Exception {
        Path file = SurveyFiles.write(dir, "blank.csv", "rating,region\n\n1,A\r\n\r\n2,B");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertArrayEquals(new int[] {1, 2}, SurveyFiles.ratings(survey));
        assertEquals(2, survey.exclusions().rowsRead());
    }

    @Test
    void readsOldMacCrLineEnds() throws Exception {
        Path file = SurveyFiles.write(dir, "cr.csv", "rating,region\r1,A\r2,B\r");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "region", ZERO_TEN));
        assertArrayEquals(new int[] {1, 2}, SurveyFiles.ratings(survey));
    }

    @Test
    void readsAQuotedHeaderAndSpacesAroundNumbers() throws Exception {
        Path file = SurveyFiles.write(dir, "quoted-header.csv", "\"rating\",\"the, region\"\n 6 ,A\n\" 7\",B\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "the, region", ZERO_TEN));
        assertArrayEquals(new int[] {6, 7}, SurveyFiles.ratings(survey));
    }

    @Test
    void acceptsIntegralDecimalsAndExponentsAsRatings() throws Exception {
        Path file = SurveyFiles.write(dir, "decimals.csv", "rating\n7.0\n1e1\n+3\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", null, ZERO_TEN));
        assertArrayEquals(new int[] {7, 10, 3}, SurveyFiles.ratings(survey));
    }

    @Test
    void readsNonAsciiUtf8Labels() throws Exception {
        Path file = SurveyFiles.write(dir, "utf8.csv", "rating,région\n1,Åland-Süd\n2,東部\n3,\uD83C\uDF0A coast\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", "région", ZERO_TEN));
        assertEquals(List.of("Åland-Süd", "東部", "\uD83C\uDF0A coast"), survey.groupLabels());
    }

    @Test
    void readsMultiByteCharactersAcrossBufferBoundaries() throws Exception {
        // 30000 rows of 2- to 4-byte characters: some straddle the 64 KiB read buffer
        String[] labels = {"Åland-ö", "東部", "\uD83C\uDF0A", "Zürich-Süd"};
        StringBuilder text = new StringBuilder("rating,région\n");
        for (int i = 0; i < 30_000; i++) {
            text.append(i % 11).append(',').append(i % 2 == 0 ? labels[i % 4] : "\"" + labels[i % 4] + "\"").append('\n');
        }
        Survey survey = SurveyReader.read(SurveyFiles.write(dir, "wide.csv", text.toString()),
                SurveySpec.of("rating", "région", ZERO_TEN));
        assertEquals(List.of(labels), survey.groupLabels());
        assertArrayEquals(new int[] {7500, 7500, 7500, 7500}, survey.groupSizes());
    }
}
