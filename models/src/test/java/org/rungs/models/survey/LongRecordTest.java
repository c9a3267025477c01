package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Arrays;
import org.junit.jupiter.api.Test;

/**
 * A 2 GiB line, made on the fly by a stream that is never stored, stops the reading at
 * {@link SurveyReader#MAX_RECORD_BYTES} without reading the rest; a record of exactly that length
 * still reads.
 */
class LongRecordTest {

    private static final Path NAME = Path.of("stream.csv");
    private static final SurveySpec SPEC = SurveySpec.of("rating", "region", new Scale(0, 10));
    private static final long TWO_GIB = 2L << 30;
    /** The reader buffers 64 KiB twice (its stream and its tokenizer); 1 MiB of slack covers both. */
    private static final long SLACK = 1 << 20;
    /** Generous for reading 64 MiB from memory; a reader that went on to 2 GiB or hung would exceed it. */
    private static final Duration TIME_LIMIT = Duration.ofSeconds(30);

    /** {@code prefix}, then {@code filler} bytes up to {@code length}, then {@code suffix}; counts what was read. */
    static final class GeneratedStream extends InputStream {
        private final byte[] prefix;
        private final byte filler;
        private final long fillerEnd;
        private final byte[] suffix;
        private final long length;
        long served;

        GeneratedStream(String prefix, byte filler, long length, String suffix) {
            this.prefix = prefix.getBytes(StandardCharsets.UTF_8);
            this.filler = filler;
            this.suffix = suffix.getBytes(StandardCharsets.UTF_8);
            this.length = length;
            this.fillerEnd = length - this.suffix.length;
        }

        @Override
        public int read() {
            byte[] one = new byte[1];
            return read(one, 0, 1) < 0 ? -1 : one[0] & 0xFF;
        }

        @Override
        public int read(byte[] b, int off, int len) {
            if (served == length) {
                return -1;
            }
            int n = (int) Math.min(len, length - served);
            for (int i = 0; i < n; i++) {
                long at = served + i;
                b[off + i] = at < prefix.length ? prefix[(int) at]
                        : at < fillerEnd ? filler : suffix[(int) (at - fillerEnd)];
            }
            served += n;
            return n;
        }
    }

    private static SurveyInputException failure(GeneratedStream in, SurveySpec spec) {
        return assertTimeoutPreemptively(TIME_LIMIT,
                () -> assertThrows(SurveyInputException.class, () -> SurveyReader.read(in, NAME, spec)));
    }

    private static String tooLong(int row) {
        return "stream.csv, row " + row + ": the row is longer than 64 MiB (reading stops there; a quote that is never"
                + " closed or a file that is not delimited text can cause this); expected rows of at most 64 MiB"
                + " (67108864 bytes)";
    }

    @Test
    void aTwoGibDataLineStopsAtTheLimit() {
        GeneratedStream in = new GeneratedStream("rating,region\n5,", (byte) 'A', TWO_GIB, "\n");
        assertEquals(tooLong(2), failure(in, SPEC).getMessage());
        assertTrue(in.served < SurveyReader.MAX_RECORD_BYTES + SLACK, in.served + " bytes read");
    }

    @Test
    void aTwoGibHeaderWithoutLineBreakStopsAtTheLimit() {
        GeneratedStream in = new GeneratedStream("rating,region", (byte) 'x', TWO_GIB, "");
        assertEquals(tooLong(1), failure(in, SPEC).getMessage());
        assertTrue(in.served < SurveyReader.MAX_RECORD_BYTES + SLACK, in.served + " bytes read");
    }

    @Test
    void aQuoteNeverClosedOverTwoGibOfLinesStopsAtTheLimit() {
        GeneratedStream in = new GeneratedStream("rating,region\n5,\"", (byte) '\n', TWO_GIB, "");
        assertEquals(tooLong(2), failure(in, SPEC).getMessage());
        assertTrue(in.served < SurveyReader.MAX_RECORD_BYTES + SLACK, in.served + " bytes read");
    }

    @Test
    void manyShortRowsAreNotOneLongRecord() throws Exception {
        // 80 MiB of blank lines between two rows: blank lines belong to no record
        GeneratedStream in = new GeneratedStream("rating,region\n5,A\n", (byte) '\n', 80L << 20, "6,B\n");
        Survey survey = assertTimeoutPreemptively(TIME_LIMIT, () -> SurveyReader.read(in, NAME, SPEC));
        assertEquals(2, survey.size());
    }

    @Test
    void aRecordOfExactlyTheLimitReadsAndOneByteMoreDoesNot() throws Exception {
        SurveySpec spec = SurveySpec.of("rating", null, new Scale(0, 10));
        String header = "rating,note\n";
        String start = "5,";
        // the record is "5," and the note, without its line end
        long record = SurveyReader.MAX_RECORD_BYTES;
        GeneratedStream exact = new GeneratedStream(header + start, (byte) 'n', header.length() + record + 1, "\n");
        Survey survey = assertTimeoutPreemptively(TIME_LIMIT, () -> SurveyReader.read(exact, NAME, spec));
        assertEquals(1, survey.size());
        GeneratedStream over = new GeneratedStream(header + start, (byte) 'n', header.length() + record + 2, "\n");
        assertEquals(tooLong(2), failure(over, spec).getMessage());
    }

    @Test
    void aHeaderOfTooManyColumnsStops() {
        byte[] commas = new byte[SurveyReader.MAX_COLUMNS + 1];
        Arrays.fill(commas, (byte) ',');
        GeneratedStream in = new GeneratedStream("rating" + new String(commas, StandardCharsets.US_ASCII),
                (byte) '\n', 7 + commas.length + 1, "");
        assertEquals("stream.csv, row 1: the header has more than 100000 columns; expected at most 100000 columns"
                + " (is this a survey file with a header row?)", failure(in, SPEC).getMessage());
    }
}
