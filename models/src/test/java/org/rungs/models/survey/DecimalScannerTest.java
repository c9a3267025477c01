package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** Numbers are read to the correctly rounded double; reference: the JDK's {@link Double#parseDouble}. */
class DecimalScannerTest {

    private final DecimalScanner scanner = new DecimalScanner();

    private DecimalScanner.Kind scan(String text) {
        byte[] bytes = text.getBytes(StandardCharsets.UTF_8);
        return scanner.scan(bytes, 0, bytes.length);
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "0|0", "7|7", "-3|-3", "+4|4", "3.25|3.25", ".5|0.5", "5.|5", "1e3|1000", "1E-3|0.001", "-0.0|-0.0",
        "' 12 '|12", "0.1|0.1", "123456789012345678901234567890|1.2345678901234568E29",
        "9007199254740993|9007199254740992", "2.2250738585072011e-308|2.225073858507201E-308",
        "0.000000000000000000000000001|1e-27", "1e150|1e150", "1e-400|0"})
    void readsNumbersToTheCorrectlyRoundedDouble(String text, double expected) {
        assertEquals(DecimalScanner.Kind.NUMBER, scan(text));
        assertEquals(expected, scanner.value(), 0.0);
        assertEquals(Double.doubleToLongBits(expected), Double.doubleToLongBits(scanner.value()));
    }

    @Test
    void agreesWithParseDoubleOnRandomDecimals() {
        SplittableRandom random = new SplittableRandom(11L);
        for (int k = 0; k < 40_000; k++) {
            String text;
            switch (k % 4) {
                case 0 -> text = Double.toString(random.nextDouble() * Math.pow(10, random.nextInt(-30, 30)));
                case 1 -> text = random.nextLong(-1_000_000_000_000L, 1_000_000_000_000L) + "."
                        + random.nextInt(1_000_000);
                case 2 -> text = Long.toString(random.nextLong()) + "e" + random.nextInt(-40, 40);
                default -> text = String.valueOf(Double.longBitsToDouble(random.nextLong() & 0x5FEF_FFFF_FFFF_FFFFL));
            }
            DecimalScanner.Kind kind = scan(text);
            double expected = Double.parseDouble(text);
            if (Math.abs(expected) > Covariates.MAX_MAGNITUDE) {
                assertEquals(DecimalScanner.Kind.TOO_LARGE, kind, text);
            } else {
                assertEquals(DecimalScanner.Kind.NUMBER, kind, text);
                assertEquals(Double.doubleToLongBits(expected), Double.doubleToLongBits(scanner.value()), text);
            }
        }
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "NaN|NOT_FINITE", "-Inf|NOT_FINITE", "Infinity|NOT_FINITE", "inf|NOT_FINITE", "1e400|NOT_FINITE",
        "-1e309|NOT_FINITE", "2e150|TOO_LARGE", "-1e200|TOO_LARGE",
        "3,5|DECIMAL_COMMA", "-3,5|DECIMAL_COMMA", "1,234.5|DECIMAL_COMMA", "1.234,5|DECIMAL_COMMA",
        "7a|TEXT", "a7|TEXT", "1e|TEXT", "e5|TEXT", ".|TEXT", "-|TEXT", "1.2.3|TEXT", "0x10|TEXT", "1d|TEXT",
        "3,|TEXT", ",5|TEXT", "secondary|TEXT", "''|TEXT", "1 000|TEXT", "١٢|TEXT"})
    void classifiesWhatIsNotAPlainNumber(String text, DecimalScanner.Kind expected) {
        assertEquals(expected, scan(text), text);
    }
}
