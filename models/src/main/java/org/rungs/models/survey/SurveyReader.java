package org.rungs.models.survey;

import java.io.BufferedInputStream;
import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.zip.GZIPInputStream;
import java.util.zip.ZipException;

/**
 * Reads a survey file into a {@link Survey}: delimited text with a header row (comma, tab or
 * semicolon, see {@link DelimitedTokenizer}), gzip-compressed or not (told by the magic bytes
 * 1f 8b), streamed once into primitive columns.
 *
 * <p>A row missing a used column (empty cell, {@code NA} or a declared code) is excluded and
 * counted under each such column. In the group column and in categorical covariates a code
 * matches only the same text ({@code 1} leaves the labels {@code 01} and {@code 1.0} alone); in the
 * other columns also the same number. Answers on the scale that a code of the rating column made
 * missing are counted per rating ({@link Exclusions#answersDeclaredMissing()}).
 *
 * <p>A covariate column becomes categorical when declared so or when its values in the rows used
 * are all text. Text among numbers (a stray "refused" in a column of
 * ages) is an error unless the column is declared categorical; a decimal comma ({@code 3,5}),
 * {@code Inf}, {@code NaN} or a magnitude above {@link Covariates#MAX_MAGNITUDE} in an otherwise
 * numeric column is an error, not a level. Ratings and weights are checked in every row, covariates in the rows used. Every
 * problem stops the reading with a {@link SurveyInputException} naming the file, row and column.
 *
 * <p>Hostile input costs bounded memory and time: a record longer than {@link #MAX_RECORD_BYTES}
 * or a header of more than {@link #MAX_COLUMNS} columns stops the reading at once, without reading
 * the rest, and group labels are interned with a seeded hash (see {@link ByteInterner}).
 *
 * <p>Labels (group labels and levels of categorical covariates) are cut of the spaces, tabs and
 * invisible characters at their ends (U+00A0, U+200B, U+FEFF and the other Unicode spaces, see
 * {@link Blanks}) before they are interned, so "Dunsellow " joins "Dunsellow" instead of making a
 * group that looks the same in every table; the cut is on the bytes, allocation-free. Inside, a
 * label is kept byte for byte, HTML included: whoever writes it out escapes it. A label holding a
 * control character other than tab (U+0000..U+001F, U+007F..U+009F, so also a line break inside quotes or a terminal escape
 * sequence) stops the reading, naming row and column: such a label is almost surely damage, and
 * printed as is it would break the lines of a table or drive the terminal.
 *
 * <p>Valid but unusual data (a category nobody uses, a group of one respondent, a group whose
 * respondents all give the same rating) are read without complaint; {@link DataWarnings} words
 * them for the caller to print.
 */
public final class SurveyReader {

    /**
     * Most levels a categorical covariate may have (our guard, no source): each level but one
     * becomes a column of n doubles, and a text column with more levels is more likely an identifier.
     */
    public static final int MAX_LEVELS = 200;

    /**
     * Longest record in bytes, 64 MiB (our guard, no source). A survey row takes some hundreds of
     * bytes and even a long free-text column stays far below this; past it the file is almost surely
     * not delimited text, or a quote was never closed, and reading on would only cost memory (the
     * kept fields of a record are held at once) before failing anyway. Kept well below the 2 GiB
     * limit of a Java array so the buffers never overflow.
     */
    public static final int MAX_RECORD_BYTES = 64 << 20;

    /**
     * Most columns a header may have (our guard, no source): wide survey exports have some
     * thousands; a header of more is not a survey header and each column costs memory up front.
     */
    public static final int MAX_COLUMNS = 100_000;

    private static final int GZIP_MAGIC_1 = 0x1f;
    private static final int GZIP_MAGIC_2 = 0x8b;

    private final Path file;
    private final SurveySpec spec;
    private final DelimitedTokenizer tokenizer;
    private final DecimalScanner scanner = new DecimalScanner();

    /** Used columns in the order of {@link SurveySpec#usedColumns()}, with their header index. */
    private final List<String> used;
    private int[] headerIndex;
    private MissingCodes[] missingCodes;
    /** Whether a slot holds text (group labels, declared categorical covariates): missing codes match it only as text. */
    private boolean[] textColumn;
    private long[] missing;
    private boolean[] missingInRow;
    private int columns;

    private final int groupSlot;
    private final int weightSlot;
    private final int firstCovariateSlot;
    private CovariateColumn[] covariates;

    private final ByteInterner groups = new ByteInterner();
    private long[] groupRowsRead = new long[16];
    private long[] groupFirstRow = new long[16];
    private int[] groupRowsUsed = new int[16];

    /** Whether a missing code of the rating column lies on the scale, so that answers may be declared missing. */
    private boolean ratingCodesOnScale;
    /** Per position on the scale, the answers a missing code of the rating column made missing. */
    private final long[] answersDeclaredMissing;

    private int size;
    private byte[] category = new byte[1 << 12];
    /** The file row of each kept record, for the per-respondent outputs. */
    private int[] row = new int[1 << 12];
    private int[] group = new int[1 << 12];
    private double[] weight;
    private long rowsRead;

    private SurveyReader(Path file, SurveySpec spec, DelimitedTokenizer tokenizer) {
        this.file = file;
        this.spec = spec;
        this.tokenizer = tokenizer;
        this.used = spec.usedColumns();
        int slot = 1;
        groupSlot = spec.groupColumn() == null ? -1 : slot++;
        weightSlot = spec.weightColumn() == null ? -1 : slot++;
        firstCovariateSlot = slot;
        weight = weightSlot < 0 ? null : new double[category.length];
        answersDeclaredMissing = new long[spec.scale().categories()];
    }

    /**
     * Reads {@code file} as {@code spec} says.
     *
     * @throws SurveyInputException for any problem with the file, naming row and column when it is
     *     about one
     */
    public static Survey read(Path file, SurveySpec spec) throws SurveyInputException {
        try (InputStream raw = Files.newInputStream(file)) {
            return read(raw, file, spec);
        } catch (NoSuchFileException e) {
            throw new SurveyInputException(file, 0, null, "the file does not exist", "an existing survey file", e);
        } catch (IOException e) {
            throw new SurveyInputException(file, 0, null, "the file cannot be read (" + e + ")",
                    "a readable survey file", e);
        }
    }

    /**
     * Reads the content of a survey file from {@code in}, which is read once from its current
     * position and not closed.
     *
     * @param name the file named in messages
     * @throws SurveyInputException for any problem with the content, naming row and column when it
     *     is about one
     */
    public static Survey read(InputStream in, Path name, SurveySpec spec) throws SurveyInputException {
        try {
            BufferedInputStream buffered = new BufferedInputStream(in, 1 << 16);
            buffered.mark(2);
            int first = buffered.read();
            int second = buffered.read();
            buffered.reset();
            if (first < 0) {
                throw new SurveyInputException(name, 0, null, "the file is empty (0 bytes)",
                        "a header row naming the columns and at least one data row");
            }
            boolean gzip = first == GZIP_MAGIC_1 && second == GZIP_MAGIC_2;
            InputStream content = gzip ? gunzip(name, buffered) : buffered;
            return new SurveyReader(name, spec, new DelimitedTokenizer(content, name, gzip)).read();
        } catch (IOException e) {
            throw new SurveyInputException(name, 0, null, "the file cannot be read (" + e + ")",
                    "a readable survey file", e);
        }
    }

    private static InputStream gunzip(Path file, InputStream in) throws SurveyInputException, IOException {
        try {
            return new GZIPInputStream(in, 1 << 16);
        } catch (EOFException | ZipException e) {
            throw new SurveyInputException(file, 0, null, "the gzip stream is truncated or corrupt ("
                    + DelimitedTokenizer.gzipDetail(e) + ") in its header",
                    "a complete gzip file (compress the file again)", e);
        }
    }

    private Survey read() throws SurveyInputException, IOException {
        List<String> header = tokenizer.readHeader();
        if (header == null) {
            throw new SurveyInputException(file, 0, null,
                    "the file has no header row (its content is empty or only line breaks)",
                    "a header row naming the columns and at least one data row");
        }
        locateColumns(header);
        while (tokenizer.next()) {
            readRecord();
        }
        if (rowsRead == 0) {
            throw new SurveyInputException(file, 0, null, "the file has a header row but no data rows",
                    "at least one data row after the header");
        }
        Exclusions exclusions = exclusions();
        if (size == 0) {
            throw new SurveyInputException(file, 0, null, "all " + rowsRead + " data rows were excluded for missing"
                    + " values (" + exclusions.describe() + ")",
                    "at least one row with every used column present (check the missing codes and column names)");
        }
        List<String> groupLabels = groupLabels();
        checkGroups(groupLabels);
        Covariates level = covariates(spec.levelColumns());
        Covariates style = covariates(spec.styleColumns());
        return Survey.read(spec.scale(), Arrays.copyOf(category, size), Arrays.copyOf(group, size), groupLabels,
                level, style, weight == null ? null : Arrays.copyOf(weight, size), exclusions, Arrays.copyOf(row, size));
    }

    private void locateColumns(List<String> header) throws SurveyInputException {
        columns = header.size();
        Map<String, Integer> index = new HashMap<>();
        for (int k = 0; k < columns; k++) {
            Integer earlier = index.putIfAbsent(header.get(k), k);
            if (earlier != null) {
                throw new SurveyInputException(file, tokenizer.recordLine, header.get(k), "the header names this column twice"
                        + " (columns " + (earlier + 1) + " and " + (k + 1) + ")", "distinct column names in the header");
            }
        }
        int slots = used.size();
        headerIndex = new int[slots];
        missingCodes = new MissingCodes[slots];
        textColumn = new boolean[slots];
        missing = new long[slots];
        missingInRow = new boolean[slots];
        boolean[] keep = new boolean[columns];
        for (int s = 0; s < slots; s++) {
            String name = used.get(s);
            Integer k = index.get(name);
            if (k == null) {
                throw new SurveyInputException(file, tokenizer.recordLine, name, "no such column in the header"
                        + headerHint(header), "one of the columns " + Text.quoteAll(header));
            }
            headerIndex[s] = k;
            keep[k] = true;
            List<String> codes = new ArrayList<>(spec.missingCodes());
            codes.addAll(spec.missingCodesByColumn().getOrDefault(name, List.of()));
            missingCodes[s] = new MissingCodes(codes);
            textColumn[s] = s == groupSlot || s >= firstCovariateSlot && spec.declaredCategorical(name);
        }
        ratingCodesOnScale = missingCodes[0].anyNumberWithin(spec.scale().lowest(), spec.scale().highest());
        tokenizer.keep(keep);
        covariates = new CovariateColumn[slots - firstCovariateSlot];
        for (int s = firstCovariateSlot; s < slots; s++) {
            covariates[s - firstCovariateSlot] = new CovariateColumn(used.get(s), spec.declaredCategorical(used.get(s)));
        }
    }

    /** Why a column may be absent when the header looks like no header or like another delimiter. */
    private String headerHint(List<String> header) {
        for (String name : header) {
            byte[] bytes = name.getBytes(StandardCharsets.UTF_8);
            if (scanner.scan(bytes, 0, bytes.length) == DecimalScanner.Kind.NUMBER) {
                return " (the first row holds the number " + Text.quote(name.strip())
                        + ": is the header row missing?)";
            }
        }
        if (header.size() == 1) {
            return " (the header has a single column: is the delimiter one of comma, tab or semicolon?)";
        }
        return "";
    }

    private void readRecord() throws SurveyInputException {
        DelimitedTokenizer t = tokenizer;
        if (t.fieldCount != columns) {
            throw new SurveyInputException(file, t.recordLine, null, "the row has " + t.fieldCount
                    + (t.fieldCount == 1 ? " field" : " fields"), columns + " fields separated by " + t.delimiterName()
                    + ", as many as the header has (a field containing the delimiter must be quoted)");
        }
        rowsRead++;
        int absentColumns = 0;
        int missingAsNumberOnly = -1;
        for (int s = 0; s < headerIndex.length; s++) {
            int k = headerIndex[s];
            boolean absent = missingCodes[s].matchesText(t.data, t.start[k], t.end[k]);
            if (!absent && !textColumn[s] && missingCodes[s].matchesAsNumber(t.data, t.start[k], t.end[k], scanner)) {
                absent = true;
                missingAsNumberOnly = s;
            }
            missingInRow[s] = absent;
            if (absent) {
                missing[s]++;
                absentColumns++;
            }
        }
        boolean complete = absentColumns == 0;
        if (missingInRow[0] && ratingCodesOnScale) {
            countAnswerDeclaredMissing(headerIndex[0]);
        }
        if (absentColumns == 1 && missingAsNumberOnly >= firstCovariateSlot) {
            // the row's fate rests on this column being numbers, known only at the end
            int k = headerIndex[missingAsNumberOnly];
            covariates[missingAsNumberOnly - firstCovariateSlot].missingAsNumberOnly(t.data, t.start[k], t.end[k],
                    t.recordLine);
        }
        int position = missingInRow[0] ? -1 : position(headerIndex[0]);
        double w = weightSlot < 0 || missingInRow[weightSlot] ? Double.NaN : weight(headerIndex[weightSlot]);
        int g = 0;
        if (groupSlot >= 0 && !missingInRow[groupSlot]) {
            int k = headerIndex[groupSlot];
            int from = Blanks.start(t.data, t.start[k], t.end[k]);
            int to = Blanks.end(t.data, from, t.end[k]);
            int known = groups.size();
            g = groups.intern(t.data, from, to);
            if (g == known) {
                checkLabel(spec.groupColumn(), "group label", from, to);
            }
            if (g == groupRowsRead.length) {
                groupRowsRead = Arrays.copyOf(groupRowsRead, 2 * g);
                groupFirstRow = Arrays.copyOf(groupFirstRow, 2 * g);
                groupRowsUsed = Arrays.copyOf(groupRowsUsed, 2 * g);
            }
            if (groupRowsRead[g]++ == 0) {
                groupFirstRow[g] = t.recordLine;
            }
        }
        if (!complete) {
            return;
        }
        if (size == category.length) {
            grow();
        }
        category[size] = (byte) position;
        group[size] = g;
        row[size] = (int) Math.min(t.recordLine, Integer.MAX_VALUE);
        groupRowsUsed[g]++;
        if (weight != null) {
            weight[size] = w;
        }
        for (int c = 0; c < covariates.length; c++) {
            int k = headerIndex[firstCovariateSlot + c];
            covariates[c].add(size, t.data, t.start[k], t.end[k], t.recordLine, scanner);
        }
        size++;
    }

    /** Stops at a label with a control character other than tab (see the class comment). */
    private void checkLabel(String column, String what, int from, int to) throws SurveyInputException {
        DelimitedTokenizer t = tokenizer;
        int control = controlCharacter(t.data, from, to);
        if (control >= 0) {
            throw new SurveyInputException(file, t.recordLine, column, "the " + what + " "
                    + Text.quote(new String(t.data, from, to - from, StandardCharsets.UTF_8))
                    + " contains the control character " + String.format("U+%04X", control),
                    "labels without control characters other than tab (remove them from the file)");
        }
    }

    /**
     * The first control character other than tab in valid UTF-8 {@code bytes[from, to)}: C0
     * (below 0x20), DEL (0x7F) or C1 (U+0080..U+009F, encoded C2 80..C2 9F); -1 when there is none.
     */
    static int controlCharacter(byte[] bytes, int from, int to) {
        for (int i = from; i < to; i++) {
            int b = bytes[i] & 0xFF;
            if (b < 0x20 && b != '\t' || b == 0x7F) {
                return b;
            }
            if (b == 0xC2 && i + 1 < to && (bytes[i + 1] & 0xFF) <= 0x9F) {
                return bytes[i + 1] & 0xFF;
            }
        }
        return -1;
    }

    /** Counts a missing rating cell that holds an answer on the scale (so a missing code of the rating column matched it). */
    private void countAnswerDeclaredMissing(int k) {
        DelimitedTokenizer t = tokenizer;
        int from = Blanks.start(t.data, t.start[k], t.end[k]);
        int to = Blanks.end(t.data, from, t.end[k]);
        if (scanner.scan(t.data, from, to) == DecimalScanner.Kind.NUMBER) {
            double v = scanner.value();
            Scale scale = spec.scale();
            if (v == Math.rint(v) && v >= scale.lowest() && v <= scale.highest()) {
                answersDeclaredMissing[(int) v - scale.lowest()]++;
            }
        }
    }

    /** The rating's position on the scale; stops at a non-integer or a rating off the scale. */
    private int position(int k) throws SurveyInputException {
        DelimitedTokenizer t = tokenizer;
        int from = Blanks.start(t.data, t.start[k], t.end[k]);
        DecimalScanner.Kind kind = scanner.scan(t.data, from, Blanks.end(t.data, from, t.end[k]));
        double v = scanner.value();
        Scale scale = spec.scale();
        String expected = "an integer rating on the scale " + scale + ", an empty cell, NA or a declared missing code";
        if ((kind != DecimalScanner.Kind.NUMBER && kind != DecimalScanner.Kind.TOO_LARGE) || v != Math.rint(v)) {
            throw new SurveyInputException(file, t.recordLine, spec.ratingColumn(), Text.quote(text(k))
                    + " is not an integer rating" + commaHint(kind), expected);
        }
        if (v < scale.lowest() || v > scale.highest()) {
            String shown = Math.abs(v) < 1e15 ? Long.toString((long) v) : text(k).strip();
            throw new SurveyInputException(file, t.recordLine, spec.ratingColumn(), "the rating " + shown
                    + " is outside the scale " + scale + " and is not a declared missing code; reading stops because"
                    + " this means a wrong scale or an undeclared missing code",
                    "an integer in " + scale + " (check the scale, or declare " + shown + " as a missing code)");
        }
        return (int) v - scale.lowest();
    }

    private double weight(int k) throws SurveyInputException {
        DelimitedTokenizer t = tokenizer;
        int from = Blanks.start(t.data, t.start[k], t.end[k]);
        DecimalScanner.Kind kind = scanner.scan(t.data, from, Blanks.end(t.data, from, t.end[k]));
        String expected = "a finite non-negative number with a decimal point, an empty cell, NA or a declared missing code";
        if (kind == DecimalScanner.Kind.NOT_FINITE) {
            throw new SurveyInputException(file, t.recordLine, spec.weightColumn(), "the weight " + Text.quote(text(k))
                    + " is not finite", expected);
        }
        if (kind == DecimalScanner.Kind.TOO_LARGE) {
            // a group's total weight must stay finite: population summaries divide by it
            throw new SurveyInputException(file, t.recordLine, spec.weightColumn(), "the weight " + text(k).strip()
                    + " exceeds " + Covariates.MAX_MAGNITUDE, "weights of at most " + Covariates.MAX_MAGNITUDE
                    + " (rescale the weights)");
        }
        if (kind != DecimalScanner.Kind.NUMBER) {
            throw new SurveyInputException(file, t.recordLine, spec.weightColumn(), "the weight "
                    + Text.quote(text(k)) + " is not a number" + commaHint(kind), expected);
        }
        double v = scanner.value();
        if (v < 0) {
            throw new SurveyInputException(file, t.recordLine, spec.weightColumn(), "the weight " + text(k).strip()
                    + " is negative", expected + " (declare it as a missing code if it means missing)");
        }
        return v;
    }

    private static String commaHint(DecimalScanner.Kind kind) {
        return kind == DecimalScanner.Kind.DECIMAL_COMMA
                ? " (it looks like a decimal comma or a thousands separator; numbers must use a decimal point)" : "";
    }

    private String text(int k) {
        DelimitedTokenizer t = tokenizer;
        return new String(t.data, t.start[k], t.end[k] - t.start[k], StandardCharsets.UTF_8);
    }

    private void grow() {
        int capacity = 2 * category.length;
        category = Arrays.copyOf(category, capacity);
        group = Arrays.copyOf(group, capacity);
        row = Arrays.copyOf(row, capacity);
        if (weight != null) {
            weight = Arrays.copyOf(weight, capacity);
        }
        for (CovariateColumn c : covariates) {
            c.grow(capacity);
        }
    }

    private Exclusions exclusions() {
        Map<String, Long> byColumn = new LinkedHashMap<>();
        for (int s = 0; s < used.size(); s++) {
            byColumn.put(used.get(s), missing[s]);
        }
        Map<Integer, Long> answers = new LinkedHashMap<>();
        for (int position = 0; position < answersDeclaredMissing.length; position++) {
            if (answersDeclaredMissing[position] > 0) {
                answers.put(spec.scale().rating(position), answersDeclaredMissing[position]);
            }
        }
        return new Exclusions(rowsRead, size, byColumn, answers);
    }

    private List<String> groupLabels() {
        if (groupSlot < 0) {
            return List.of(SurveySpec.SINGLE_GROUP);
        }
        List<String> labels = new ArrayList<>(groups.size());
        for (int g = 0; g < groups.size(); g++) {
            labels.add(groups.label(g));
        }
        return labels;
    }

    private void checkGroups(List<String> labels) throws SurveyInputException {
        int count = groupSlot < 0 ? 1 : groups.size();
        double[] totalWeight = new double[count];
        if (weight != null) {
            for (int i = 0; i < size; i++) {
                totalWeight[group[i]] += weight[i];
            }
        }
        for (int g = 0; g < count; g++) {
            if (groupSlot >= 0 && groupRowsUsed[g] == 0) {
                throw new SurveyInputException(file, 0, spec.groupColumn(), "the group " + Text.quote(labels.get(g))
                        + " has no usable rows: " + (groupRowsRead[g] == 1 ? "its only row (row " + groupFirstRow[g]
                        + ") misses" : "all its " + groupRowsRead[g] + " rows (the first on row " + groupFirstRow[g]
                        + ") miss") + " a value in another used column",
                        "at least one complete row in every group (fill in the values or remove the group's rows)");
            }
            // population summaries (MODEL.md section 6) divide by a group's total weight
            if (weight != null && !(totalWeight[g] > 0)) {
                throw new SurveyInputException(file, 0, spec.weightColumn(), "the weights of the group "
                        + Text.quote(labels.get(g)) + " sum to zero in the rows used", "a positive total weight in every group");
            }
        }
    }

    private Covariates covariates(List<String> names) throws SurveyInputException {
        Covariates.Builder builder = Covariates.builder();
        for (String name : names) {
            CovariateColumn column = covariates[used.indexOf(name) - firstCovariateSlot];
            column.addTo(builder, spec.referenceLevels().get(name), size);
        }
        try {
            return builder.build();
        } catch (CovariateProblem e) {
            throw new SurveyInputException(file, 0, e.column(), e.problem(), e.expected(), e);
        }
    }

    /** One covariate column as read: numbers, and level codes while the distinct values are few. */
    private final class CovariateColumn {
        private final String name;
        private final boolean declaredCategorical;
        private double[] values = new double[category.length];
        private int[] codes = new int[category.length];
        private ByteInterner levels = new ByteInterner();
        private long textRow;
        private String textValue;
        private long numberRow;
        private String numberValue;
        private long badNumberRow;
        private String badNumberValue;
        private DecimalScanner.Kind badNumberKind;
        /** The first value made missing only by matching a code as a number, in a row missing nothing else. */
        private long missingAsNumberRow;
        private String missingAsNumberValue;

        CovariateColumn(String name, boolean declaredCategorical) {
            this.name = name;
            this.declaredCategorical = declaredCategorical;
        }

        void add(int i, byte[] data, int from, int to, long row, DecimalScanner scanner) throws SurveyInputException {
            from = Blanks.start(data, from, to);
            to = Blanks.end(data, from, to);
            DecimalScanner.Kind kind = scanner.scan(data, from, to);
            values[i] = scanner.value();
            if (kind == DecimalScanner.Kind.NUMBER) {
                if (numberRow == 0) {
                    numberRow = row;
                    numberValue = new String(data, from, to - from, StandardCharsets.UTF_8).strip();
                }
            } else {
                if (kind == DecimalScanner.Kind.TEXT) {
                    int control = controlCharacter(data, from, to);
                    if (control >= 0) {
                        throw new SurveyInputException(file, row, name, "the level " + Text.quote(new String(data, from,
                                to - from, StandardCharsets.UTF_8)) + " contains the control character "
                                + String.format("U+%04X", control),
                                "labels without control characters other than tab (remove them from the file)");
                    }
                    if (textRow == 0) {
                        textRow = row;
                        textValue = new String(data, from, to - from, StandardCharsets.UTF_8);
                    }
                } else if (badNumberRow == 0) {
                    badNumberRow = row;
                    badNumberKind = kind;
                    badNumberValue = new String(data, from, to - from, StandardCharsets.UTF_8).strip();
                }
            }
            if (levels != null) {
                codes[i] = levels.intern(data, from, to);
                if (levels.size() > MAX_LEVELS) {
                    if (declaredCategorical || textRow > 0) {
                        throw tooManyLevels(row);
                    }
                    levels = null;
                    codes = null;
                }
            } else if (textRow > 0) {
                throw tooManyLevels(textRow);
            }
        }

        /**
         * A value such as {@code 01} that a code ({@code 1}) made missing as a number: right if the
         * column holds numbers, wrong if it turns out to hold text, where codes match only as text.
         */
        void missingAsNumberOnly(byte[] data, int from, int to, long row) {
            if (missingAsNumberRow == 0 && !declaredCategorical) {
                missingAsNumberRow = row;
                from = Blanks.start(data, from, to);
                missingAsNumberValue = new String(data, from, Blanks.end(data, from, to) - from, StandardCharsets.UTF_8);
            }
        }

        private SurveyInputException numberAmongText() {
            return new SurveyInputException(file, missingAsNumberRow, name, Text.quote(missingAsNumberValue)
                    + " equals a missing code only as a number, but the column's other values are text (row " + textRow
                    + ": " + Text.quote(textValue) + "), and in a column of text a missing code matches only the same text",
                    "--categorical " + Text.escape(name) + " to read " + Text.quote(missingAsNumberValue)
                    + " as a level, or the code as written in the file (--missing-in " + Text.escape(name) + "="
                    + Text.escape(missingAsNumberValue) + ") to make it missing");
        }

        /**
         * Numbers and text in a column not declared categorical: a stray code such as "refused" in a
         * column of ages would otherwise make every age a category of its own.
         */
        private SurveyInputException mixed() {
            return new SurveyInputException(file, textRow, name, Text.quote(textValue) + " is text, but the column's other"
                    + " values are numbers (row " + numberRow + ": " + Text.escape(numberValue) + ")",
                    "numbers only (declare " + Text.quote(textValue) + " missing with --missing-in " + Text.escape(name) + "="
                    + Text.escape(textValue.strip()) + "), or --categorical " + Text.escape(name)
                    + " to read every value as a category");
        }

        private SurveyInputException tooManyLevels(long row) {
            if (!declaredCategorical && numberRow > 0) {
                return mixed();
            }
            String what = declaredCategorical ? "the categorical covariate has" : "the covariate has the non-number "
                    + Text.quote(textValue) + " (so it would be categorical) and";
            return new SurveyInputException(file, row, name, what + " more than " + MAX_LEVELS + " distinct values",
                    "numbers only, or a categorical covariate with at most " + MAX_LEVELS + " levels");
        }

        void grow(int capacity) {
            values = Arrays.copyOf(values, capacity);
            if (codes != null) {
                codes = Arrays.copyOf(codes, capacity);
            }
        }

        void addTo(Covariates.Builder builder, String referenceLevel, int n) throws SurveyInputException {
            if (!declaredCategorical && textRow > 0 && numberRow > 0) {
                throw mixed();
            }
            if (!declaredCategorical && textRow > 0 && missingAsNumberRow > 0) {
                throw numberAmongText();
            }
            if (declaredCategorical || textRow > 0) {
                List<String> labels = new ArrayList<>(levels.size());
                for (int level = 0; level < levels.size(); level++) {
                    labels.add(levels.label(level));
                }
                builder.categorical(name, Arrays.copyOf(codes, n), labels,
                        referenceLevel == null ? null : Blanks.strip(referenceLevel));
                return;
            }
            if (badNumberRow > 0) {
                throw switch (badNumberKind) {
                    case DECIMAL_COMMA -> new SurveyInputException(file, badNumberRow, name, Text.quote(badNumberValue)
                            + " is not a number: it looks like a decimal comma or a thousands separator",
                            "numbers with a decimal point (e.g. 3.5) in this numeric covariate, or declare it categorical");
                    case TOO_LARGE -> new SurveyInputException(file, badNumberRow, name, badNumberValue
                            + " exceeds " + Covariates.MAX_MAGNITUDE + " in magnitude, so squaring it would overflow",
                            "numbers of magnitude at most " + Covariates.MAX_MAGNITUDE + " (rescale the column)");
                    default -> new SurveyInputException(file, badNumberRow, name, Text.quote(badNumberValue)
                            + " is not a finite number", "finite numbers in this numeric covariate");
                };
            }
            builder.numeric(name, Arrays.copyOf(values, n));
        }
    }
}
