package org.rungs.validation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The replication records of both studies: which files count, and a damaged record named with its line. */
class ReplicationRecordsTest {
    private static final String HEADER = "name,value";

    private static List<Double> values(Path file, int index) throws IOException {
        List<Double> values = new ArrayList<>();
        ReplicationRecords.rows(file, HEADER, 2, f -> values.add(Double.parseDouble(f[1])));
        return values;
    }

    @Test
    void onlyRecordFilesAreReadInIndexOrder(@TempDir Path dir) throws IOException {
        ReplicationRecords.write(dir, ReplicationRecords.FOLDER + "/" + ReplicationRecords.fileName(12), HEADER + "\na,1.5\n");
        ReplicationRecords.write(dir, ReplicationRecords.FOLDER + "/" + ReplicationRecords.fileName(3), HEADER + "\na,2\nb,3\n");
        Files.writeString(dir.resolve(ReplicationRecords.FOLDER).resolve("notes.csv"), "not a record");
        Map<Integer, List<Double>> finished = ReplicationRecords.finished(dir, ReplicationRecordsTest::values);
        assertEquals(List.of(3, 12), List.copyOf(finished.keySet()));
        assertEquals(List.of(2.0, 3.0), finished.get(3));
        assertEquals("r0000012.csv", ReplicationRecords.fileName(12));
    }

    @Test
    void aNoteLineIsNotARow(@TempDir Path dir) throws IOException {
        ReplicationRecords.write(dir, "r.csv", HEADER + "\na,1\n" + ReplicationRecords.NOTE + "about the fit, in words\nb,2\n");
        List<String> notes = new ArrayList<>();
        List<String> names = new ArrayList<>();
        ReplicationRecords.rows(dir.resolve("r.csv"), HEADER, 2, f -> names.add(f[0]), notes::add);
        assertEquals(List.of("a", "b"), names);
        assertEquals(List.of("about the fit, in words"), notes);
    }

    @Test
    void aMissingFolderHasNoRecords(@TempDir Path dir) {
        assertTrue(ReplicationRecords.finished(dir.resolve("none"), ReplicationRecordsTest::values).isEmpty());
    }

    @Test
    void aDamagedRecordIsNamedWithItsLine(@TempDir Path dir) {
        Path file = dir.resolve(ReplicationRecords.FOLDER).resolve(ReplicationRecords.fileName(0));
        for (String[] damage : new String[][] {
                {"quantity,value\na,1\n", "is not a replication record (header name,value)"},
                {HEADER + "\na,1\nb,2,3\n", ": line 3 has 3 fields, not 2"},
                {HEADER + "\na,x\n", ": line 2: "},
                {HEADER + "\na,1\n" + ReplicationRecords.NOTE + "a note where none is read\n", ": line 3 has 1 fields, not 2"}}) {
            ReplicationRecords.write(dir, ReplicationRecords.FOLDER + "/" + file.getFileName(), damage[0]);
            UncheckedIOException e = assertThrows(UncheckedIOException.class,
                    () -> ReplicationRecords.finished(dir, ReplicationRecordsTest::values));
            assertTrue(e.getMessage().contains(file + (damage[1].startsWith(":") ? "" : " ") + damage[1]), e.getMessage());
        }
    }
}
