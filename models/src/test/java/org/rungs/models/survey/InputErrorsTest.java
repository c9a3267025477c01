package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.Arrays;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Every problem the reading rules list stops with a {@link SurveyInputException} naming file, row
 * (1-based line, header = 1) and column, and saying what was expected.
 */
class InputErrorsTest {

    @TempDir
    Path dir;

    private static final Scale ZERO_TEN = new Scale(0, 10);
    private static final SurveySpec RATING_REGION = SurveySpec.of("rating", "region", ZERO_TEN);
    private static final SurveySpec WITH_X = SurveySpec.builder("rating", ZERO_TEN).group("region").level("x").build();

    private Path file;

    private SurveyInputException failure(String content, SurveySpec spec) {
        return failure(content.getBytes(StandardCharsets.UTF_8), spec);
    }

    private SurveyInputException failure(byte[] content, SurveySpec spec) {
        file = SurveyFiles.write(dir, "survey.csv", content);
        return assertThrows(SurveyInputException.class, () -> SurveyReader.read(file, spec));
    }

    private void assertAbout(SurveyInputException e, long row, String column, String fragment) {
        assertEquals(file, e.file());
        assertEquals(row, e.row(), e.getMessage());
        assertEquals(column, e.column(), e.getMessage());
        assertTrue(e.getMessage().contains(fragment), e.getMessage());
    }

    @Test
    void theMessageNamesFileRowAndColumnThenWhatWasExpected() {
        SurveyInputException e = failure("rating,region\n5,A\n7.5,B\n", RATING_REGION);
        assertEquals(file + ", row 3, column \"rating\": \"7.5\" is not an integer rating; expected an integer"
                + " rating on the scale 0..10, an empty cell, NA or a declared missing code", e.getMessage());
    }

    @Test
    void aMissingColumnListsTheColumnsThatExist() {
        SurveyInputException e = failure("rating,region,age\n5,A,30\n", WITH_X);
        assertAbout(e, 1, "x", ", row 1, column \"x\": no such column in the header; expected one of the columns"
                + " \"rating\", \"region\" and \"age\"");
    }

    @Test
    void duplicateColumnNames() {
        SurveyInputException e = failure("rating,region,x,x\n5,A,1,2\n", RATING_REGION);
        assertAbout(e, 1, "x", "the header names this column twice (columns 3 and 4); expected distinct column names");
    }

    @Test
    void aNonIntegerRating() {
        assertAbout(failure("rating,region\n5,A\n7a,B\n", RATING_REGION), 3, "rating",
                "\"7a\" is not an integer rating; expected an integer rating on the scale 0..10");
        assertAbout(failure("rating;region\n7,5;B\n", RATING_REGION), 2, "rating",
                "\"7,5\" is not an integer rating (it looks like a decimal comma");
    }

    @Test
    void aRatingOutsideTheScaleSaysItMeansAWrongScaleOrAnUndeclaredCode() {
        SurveyInputException e = failure("rating,region\n5,A\n6,A\n12,B\n", RATING_REGION);
        assertAbout(e, 4, "rating", ", row 4, column \"rating\": the rating 12 is outside the scale 0..10 and is not"
                + " a declared missing code; reading stops because this means a wrong scale or an undeclared missing"
                + " code; expected an integer in 0..10 (check the scale, or declare 12 as a missing code)");
    }

    @Test
    void aDecimalCommaInANumericCovariate() {
        SurveyInputException e = failure("rating;region;x\n5;A;3.5\n6;B;4\n7;B;3,5\n", WITH_X);
        assertAbout(e, 4, "x", "\"3,5\" is not a number: it looks like a decimal comma or a thousands separator;"
                + " expected numbers with a decimal point (e.g. 3.5) in this numeric covariate, or declare it categorical");
    }

    @Test
    void aCovariateValueThatIsNotFiniteOrTooLargeToSquare() {
        assertAbout(failure("rating,region,x\n5,A,1\n6,B,Inf\n", WITH_X), 3, "x",
                "\"Inf\" is not a finite number; expected finite numbers in this numeric covariate");
        assertAbout(failure("rating,region,x\n5,A,1\n6,B,2\n7,B,1e400\n", WITH_X), 4, "x",
                "\"1e400\" is not a finite number");
        assertAbout(failure("rating,region,x\n5,A,1\n6,B,-2e150\n", WITH_X), 3, "x",
                "-2e150 exceeds 1.0E150 in magnitude, so squaring it would overflow; expected numbers of magnitude at"
                        + " most 1.0E150");
    }

    @Test
    void aConstantCovariate() {
        assertAbout(failure("rating,region,x\n5,A,2\n6,B,2.0\n7,B,2\n", WITH_X), 0, "x",
                "covariate \"x\" is constant (the single value 2 in the rows used), so its coefficient cannot be told"
                        + " apart from the intercept; expected a covariate that varies");
        SurveySpec categorical = SurveySpec.builder("rating", ZERO_TEN).group("region").style("x").build();
        assertAbout(failure("rating,region,x\n5,A,urban\n6,B,urban\n", categorical), 0, "x",
                "covariate \"x\" is constant (the single level \"urban\" in the rows used)");
    }

    @Test
    void exactlyCollinearCovariatesAreNamed() {
        SurveySpec spec = SurveySpec.builder("rating", ZERO_TEN).level("a", "b", "c").build();
        SurveyInputException e = failure("rating,a,b,c\n1,1,5,6\n2,2,3,5\n3,4,1,5\n4,0,0,0\n", spec);
        assertAbout(e, 0, "c", "covariates \"a\", \"b\" and \"c\" are exactly collinear: with the intercept, \"c\" is"
                + " a linear combination of \"a\" and \"b\"");
        assertTrue(e.getMessage().endsWith("expected linearly independent covariates; drop one of the named columns"));
    }

    @Test
    void aGroupWithNoUsableRows() {
        SurveyInputException e = failure("rating,region,x\n5,A,1\n6,B,\n7,B,NA\n8,A,2\n", WITH_X);
        assertAbout(e, 0, "region", "the group \"B\" has no usable rows: all its 2 rows (the first on row 3) miss a"
                + " value in another used column; expected at least one complete row in every group");
    }

    @Test
    void anEmptyFile() {
        assertAbout(failure(new byte[0], RATING_REGION), 0, null,
                "survey.csv: the file is empty (0 bytes); expected a header row naming the columns and at least one data row");
        assertAbout(failure("rating,region\n", RATING_REGION), 0, null,
                "survey.csv: the file has a header row but no data rows; expected at least one data row");
        assertAbout(failure("\n\n", RATING_REGION), 0, null, "the file has no header row");
    }

    @Test
    void allRowsExcludedSaysHowManyAndWhy() {
        SurveyInputException e = failure("rating,region\nNA,A\n,B\n5,\n", RATING_REGION);
        assertAbout(e, 0, null, "survey.csv: all 3 data rows were excluded for missing values (Read 3 rows; used 0 and"
                + " excluded 3 for missing values (2 missing \"rating\", 1 missing \"region\"; a row missing several"
                + " columns is counted under each).); expected at least one row with every used column present");
    }

    @Test
    void aRaggedRowSaysHowManyFieldsItHas() {
        assertAbout(failure("rating,region\n5,A\n6,B,extra\n", RATING_REGION), 3, null,
                ", row 3: the row has 3 fields; expected 2 fields separated by commas, as many as the header has");
        assertAbout(failure("rating,region\n5,A\n6\n", RATING_REGION), 3, null, "the row has 1 field; expected 2 fields");
    }

    @Test
    void anUnterminatedQuoteNamesTheRowWhereItOpened() {
        SurveyInputException e = failure("rating,region\n5,A\n6,\"B\n7,C\n8,D\n", RATING_REGION);
        assertAbout(e, 3, null, ", row 3: a quote opened on this row is never closed; expected a closing quote");
    }

    @Test
    void textAfterAClosingQuote() {
        assertAbout(failure("rating,region\n5,\"A\"x\n", RATING_REGION), 2, null,
                "a quoted field is followed by \"x\" instead of a delimiter or the end of the line");
    }

    @Test
    void invalidUtf8NamesTheRow() {
        byte[] latin1 = "rating,region\n5,A\n6,M\u00e4rz\n".getBytes(StandardCharsets.ISO_8859_1);
        assertAbout(failure(latin1, RATING_REGION), 3, null,
                ", row 3: the text is not valid UTF-8 (byte 0xE4 is not followed by a valid continuation byte"
                        + " (found 0x72)); expected a UTF-8 text file");
        byte[] overlong = "rating,region\n5,A\n6,X\n".getBytes(StandardCharsets.US_ASCII);
        byte[] withOverlong = Arrays.copyOf(overlong, overlong.length + 3);
        withOverlong[overlong.length - 1] = (byte) 0xC0; // overlong encoding of '/', never valid
        withOverlong[overlong.length] = (byte) 0xAF;
        withOverlong[overlong.length + 1] = '\n';
        withOverlong[overlong.length + 2] = '\n';
        assertAbout(failure(withOverlong, RATING_REGION), 3, null, "byte 0xC0 cannot start a character");
        byte[] utf16 = {(byte) 0xFF, (byte) 0xFE, 'r', 0};
        assertAbout(failure(utf16, RATING_REGION), 1, null, "the file starts with a UTF-16 byte-order mark");
    }

    @Test
    void aTruncatedOrCorruptGzipStream() {
        StringBuilder text = new StringBuilder("rating,region\n");
        for (int i = 0; i < 5000; i++) {
            text.append(i % 11).append(",region-").append(i % 37).append('\n');
        }
        byte[] gz = SurveyFiles.gzip(text.toString().getBytes(StandardCharsets.UTF_8));
        assertAbout(failure(Arrays.copyOf(gz, gz.length / 2), RATING_REGION), 0, null,
                "survey.csv: the gzip stream is truncated or corrupt (");
        byte[] corrupt = gz.clone();
        for (int i = 20; i < 60; i++) {
            corrupt[i] ^= (byte) 0x5A;
        }
        assertAbout(failure(corrupt, RATING_REGION), 0, null, "the gzip stream is truncated or corrupt (");
        assertAbout(failure(Arrays.copyOf(gz, 5), RATING_REGION), 0, null, "the gzip stream is truncated or corrupt (");
        SurveyInputException e = failure(Arrays.copyOf(gz, gz.length / 2), RATING_REGION);
        assertTrue(e.getMessage().endsWith("; expected a complete gzip file (compress the file again)"));
    }

    @Test
    void aNegativeOrNonFiniteWeight() {
        SurveySpec weighted = SurveySpec.builder("rating", ZERO_TEN).group("region").weight("w").build();
        assertAbout(failure("rating,region,w\n5,A,1\n6,B,-0.5\n", weighted), 3, "w",
                "the weight -0.5 is negative; expected a finite non-negative number");
        assertAbout(failure("rating,region,w\n5,A,1\n6,B,NaN\n", weighted), 3, "w", "the weight \"NaN\" is not finite");
        assertAbout(failure("rating,region,w\n5,A,1\n6,B,inf\n", weighted), 3, "w", "the weight \"inf\" is not finite");
        assertAbout(failure("rating;region;w\n5;A;0,8\n", weighted), 2, "w",
                "the weight \"0,8\" is not a number (it looks like a decimal comma");
        assertAbout(failure("rating,region,w\n5,A,1\n6,B,0\n", weighted), 0, "w",
                "the weights of the group \"B\" sum to zero in the rows used; expected a positive total weight");
    }

    @Test
    void controlCharactersInValuesAreEscapedInMessages() {
        SurveyInputException e = failure("rating,region\n\"7\u0007\",A\n", RATING_REGION);
        assertAbout(e, 2, "rating", "\"7\\u0007\" is not an integer rating");
    }

    @Test
    void aFileThatDoesNotExist() {
        Path missing = dir.resolve("nowhere.csv");
        SurveyInputException e = assertThrows(SurveyInputException.class, () -> SurveyReader.read(missing, RATING_REGION));
        assertEquals(missing + ": the file does not exist; expected an existing survey file", e.getMessage());
        assertNull(e.column());
    }
}
