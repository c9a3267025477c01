package org.rungs.posteriors.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** CSV with RFC 4180 quoting, read by column name. */
class CsvTableTest {
    @TempDir
    Path tmp;

    @Test
    void readsQuotedFieldsWithCommasQuotesAndLineBreaks() throws IOException {
        Path file = tmp.resolve("t.csv");
        Files.writeString(file, "group,value\r\n\"a, \"\"b\"\"\nc\",1.5\r\nplain,NaN\nempty,\n");
        CsvTable table = CsvTable.read(file);
        assertEquals(3, table.size());
        assertEquals("a, \"b\"\nc", table.text(0, "group"));
        assertEquals(1.5, table.number(0, "value"));
        assertTrue(Double.isNaN(table.number(1, "value")));
        assertTrue(Double.isNaN(table.number(2, "value")), "an empty entry is no number");
        assertTrue(Double.isNaN(table.number(0, "absent")), "an absent column is no number");
        assertFalse(table.has("absent"));
    }

    @Test
    void refusesARecordWithTheWrongNumberOfFields() throws IOException {
        Path file = tmp.resolve("t.csv");
        Files.writeString(file, "a,b\n1,2\n3\n");
        IOException e = assertThrows(IOException.class, () -> CsvTable.read(file));
        assertTrue(e.getMessage().contains("record 3 has 1 fields"), e.getMessage());
    }

    @Test
    void anAbsentFileIsNull() throws IOException {
        assertNull(CsvTable.readIfPresent(tmp.resolve("none.csv")));
    }
}
