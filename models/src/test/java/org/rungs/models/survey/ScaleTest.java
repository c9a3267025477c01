package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class ScaleTest {

    @Test
    void parsesTheUsualScales() {
        assertEquals(new Scale(0, 10), Scale.parse("0..10"));
        assertEquals(new Scale(1, 7), Scale.parse("1..7"));
        assertEquals(new Scale(0, 100), Scale.parse("0..100"));
        assertEquals(new Scale(-3, 3), Scale.parse(" -3 .. 3 "));
    }

    @Test
    void printsWhatItParses() {
        assertEquals("0..10", new Scale(0, 10).toString());
        assertEquals(new Scale(1, 10), Scale.parse(new Scale(1, 10).toString()));
    }

    @Test
    void mapsRatingsToPositionsAndBack() {
        Scale scale = new Scale(1, 7);
        assertEquals(7, scale.categories());
        assertTrue(scale.contains(1));
        assertTrue(scale.contains(7));
        assertFalse(scale.contains(0));
        assertFalse(scale.contains(8));
        assertEquals(0, scale.position(1));
        assertEquals(6, scale.position(7));
        assertEquals(4, scale.rating(3));
        assertThrows(IllegalArgumentException.class, () -> scale.position(8));
        assertThrows(IllegalArgumentException.class, () -> scale.rating(7));
    }

    @ParameterizedTest
    @ValueSource(strings = {"0-10", "0..", "..10", "a..b", "10..0", "5..5", "0..127", "0..10.5", "", "1...7"})
    void rejectsWhatIsNotAScaleWithAClearMessage(String text) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Scale.parse(text));
        assertTrue(e.getMessage().startsWith("\"" + text + "\" is not a rating scale ("), e.getMessage());
        assertTrue(e.getMessage().endsWith("expected LOWEST..HIGHEST with integers, e.g. 0..10, 1..7 or 0..100"));
    }

    @Test
    void allowsAtMost127Categories() {
        assertEquals(127, new Scale(0, 126).categories());
        assertThrows(IllegalArgumentException.class, () -> new Scale(0, 127));
        assertThrows(IllegalArgumentException.class, () -> new Scale(3, 3));
        assertThrows(IllegalArgumentException.class, () -> new Scale(Integer.MIN_VALUE, Integer.MAX_VALUE));
    }
}
