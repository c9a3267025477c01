package org.rungs.models.survey;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.zip.GZIPOutputStream;

/** Writes small survey files for tests. */
final class SurveyFiles {
    private SurveyFiles() {
    }

    static Path write(Path dir, String name, String content) {
        return write(dir, name, content.getBytes(StandardCharsets.UTF_8));
    }

    static Path write(Path dir, String name, byte[] content) {
        try {
            return Files.write(dir.resolve(name), content);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static byte[] gzip(byte[] content) {
        try {
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            try (GZIPOutputStream gz = new GZIPOutputStream(out)) {
                gz.write(content);
            }
            return out.toByteArray();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** A fixture under src/test/resources/survey/. */
    static Path resource(String name) {
        try {
            return Path.of(SurveyFiles.class.getResource("/survey/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Ratings as written on the scale, from a survey's positions. */
    static int[] ratings(Survey survey) {
        int[] r = new int[survey.size()];
        for (int i = 0; i < r.length; i++) {
            r[i] = survey.scale().rating(survey.category()[i]);
        }
        return r;
    }
}
