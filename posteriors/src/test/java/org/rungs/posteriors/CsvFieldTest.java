package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Fields are quoted as RFC 4180, section 2, rules 6 and 7, says. */
class CsvFieldTest {
    @Test
    void quotesOnlyWhatNeedsIt() {
        assertEquals("Saltergrim", CsvField.quote("Saltergrim"));
        assertEquals("", CsvField.quote(""));
        assertEquals("\"North, upper\"", CsvField.quote("North, upper"));
        assertEquals("\"the \"\"old\"\" town\"", CsvField.quote("the \"old\" town"));
        assertEquals("\"two\nlines\"", CsvField.quote("two\nlines"));
        assertEquals("\"two\r\nlines\"", CsvField.quote("two\r\nlines"));
    }
}
