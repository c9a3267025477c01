package org.rungs.posteriors.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/** The small JSON reader on the constructs of RFC 8259 that run.json uses. */
class JsonTest {
    @Test
    void readsNestedObjectsArraysNumbersAndLiterals() throws IOException {
        Object root = Json.parse("{\"a\": {\"b\": [1, -2.5e3, true, null], \"c\": \"x\\\"y\\u00e9\\n\"}, \"d\": false}");
        assertEquals(List.of(1.0, -2500.0, true), ((List<?>) Json.at(root, "a.b")).subList(0, 3));
        assertNull(((List<?>) Json.at(root, "a.b")).get(3));
        assertEquals("x\"y\u00e9\n", Json.at(root, "a.c"));
        assertEquals(false, Json.at(root, "d"));
        assertNull(Json.at(root, "a.missing"));
        assertNull(Json.at(root, "d.deeper"));
    }

    @Test
    void keepsTheOrderOfKeys() throws IOException {
        Map<?, ?> map = (Map<?, ?>) Json.parse("{\"z\": 1, \"a\": 2, \"m\": 3}");
        assertEquals(List.of("z", "a", "m"), List.copyOf(map.keySet()));
    }

    @Test
    void rejectsMalformedTextWithItsPosition() {
        IOException unclosed = assertThrows(IOException.class, () -> Json.parse("{\"a\": [1, 2}"));
        assertTrue(unclosed.getMessage().contains("expected ']'"), unclosed.getMessage());
        IOException trailing = assertThrows(IOException.class, () -> Json.parse("{} x"));
        assertTrue(trailing.getMessage().contains("row 1, column 4"), trailing.getMessage());
        IOException second = assertThrows(IOException.class, () -> Json.parse("{\"a\": 1,\n \"b\" 2}"));
        assertTrue(second.getMessage().contains("row 2, column 6: expected ':'"), second.getMessage());
        assertThrows(IOException.class, () -> Json.parse("\"open"));
        assertThrows(IOException.class, () -> Json.parse("{\"a\": tru}"));
    }

    @Test
    void quotesTextForMessagesWithoutRawControlCharacters() {
        assertEquals("\"a\\u0007b\\t\\\"c\\\\\"", Json.quote("a\u0007b\t\"c\\"));
        assertEquals("x".repeat(60) + "...", Json.escape("x".repeat(61)));
    }
}
