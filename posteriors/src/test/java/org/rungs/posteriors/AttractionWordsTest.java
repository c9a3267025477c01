package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.function.UnaryOperator;
import org.junit.jupiter.api.Test;

/** The sentences on number attraction, for fabricated attraction profiles. */
class AttractionWordsTest {
    private static final String HEAD = "Numbers liked or avoided (P(a > 0) above 0.95 or below 0.05; "
            + "1x = as often as the latent level implies):";

    /** As the console shows a label (the sampler's Printable): a tab becomes a visible escape. */
    private static final UnaryOperator<String> SHOWN = label -> label.replace("\t", "\\u0009");

    private static AttractionWords.Term row(String group, boolean common, int rating, double exp, double low, double high,
            double positive, double sdRatio) {
        return new AttractionWords.Term(group, common, rating, exp, low, high, positive, sdRatio);
    }

    private static List<String> lines(String text) {
        return List.of(text.split("\\R"));
    }

    @Test
    void perGroupTheCrediblyLikedAndAvoidedNumbersInWords() {
        List<AttractionWords.Term> rows = List.of(
                // common terms: listed among the weak terms, never as a group's words
                row("all", true, 1, 3.0, 2.0, 4.0, 0.999, 0.9),
                row("all", true, 4, 1.0, 0.8, 1.2, 0.5, 0.5),
                row("all", true, 7, 2.0, 1.5, 2.5, 0.99, 0.3),
                row("Eastmarch", false, 1, 1.1, 0.7, 1.6, 0.6, 0.5),
                row("Eastmarch", false, 4, 0.6, 0.4, 0.8, 0.01, 0.4),
                row("Eastmarch", false, 7, 2.2, 1.6, 3.0, 0.99, 0.3),
                // P(a > 0) of exactly 0.95 is not above 0.95
                row("Vale\tEnd", false, 1, 1.3, 0.9, 1.9, 0.95, 0.85),
                row("Vale\tEnd", false, 4, 0.9, 0.7, 1.1, 0.2, 0.81),
                row("Vale\tEnd", false, 7, 1.2, 0.9, 1.6, 0.9, 0.8));
        List<String> lines = lines(AttractionWords.format(rows, List.of("Eastmarch", "Vale\tEnd"), SHOWN));
        assertEquals(List.of(HEAD,
                "  Eastmarch: 4 is avoided: chosen 0.6x as often (0.4x to 0.8x); "
                        + "7 is chosen 2.2x as often as expected (90% interval 1.6x to 3.0x)",
                "  Vale\\u0009End: no number credibly liked or avoided",
                "Hardly identified by the data (posterior sd above 0.8 x prior sd; sd_ratio in attraction.csv): "
                        + "3 of 9 attraction terms: common terms 1; Vale\\u0009End 1, 4."), lines);
    }

    @Test
    void oneGroupSpeaksOfTheCommonTermsUnderItsLabel() {
        List<AttractionWords.Term> rows = List.of(
                row("all", true, 3, 0.043, 0.02, 0.09, 0.001, 0.2),
                row("all", true, 7, 1.6, 1.2, 2.1, 0.97, 0.2));
        assertEquals(List.of(HEAD,
                "  all: 3 is avoided: chosen 0.043x as often (0.020x to 0.090x); "
                        + "7 is chosen 1.6x as often as expected (90% interval 1.2x to 2.1x)",
                "Every attraction term is informed by the data (posterior sd above 0.8 x prior sd for none)."),
                lines(AttractionWords.format(rows, List.of("all"), SHOWN)));
    }

    @Test
    void manyGroupsWithWeakTermsAreCountedAfterSix() {
        List<AttractionWords.Term> rows = new ArrayList<>();
        List<String> labels = new ArrayList<>();
        for (int g = 0; g < 8; g++) {
            labels.add("G" + g);
            rows.add(row("G" + g, false, 2, 1, 0.5, 2, 0.5, 0.9));
        }
        List<String> lines = lines(AttractionWords.format(rows, labels, SHOWN));
        assertEquals(10, lines.size());
        assertEquals("Hardly identified by the data (posterior sd above 0.8 x prior sd; sd_ratio in attraction.csv): "
                + "8 of 8 attraction terms: G0 2; G1 2; G2 2; G3 2; G4 2; G5 2; and 2 more groups.", lines.get(9));
    }
}
