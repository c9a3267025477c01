package org.rungs.sampler.run;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Properties;

/** Builds the content of {@code run.json}: what was read, how it was fitted, what happened. */
public final class RunRecord {
    private final Map<String, Object> root = new LinkedHashMap<>();
    private final List<String> warnings = new ArrayList<>();

    public RunRecord() {
        Map<String, Object> versions = new LinkedHashMap<>();
        versions.put("rungs", version());
        versions.put("java", System.getProperty("java.version"));
        versions.put("os", System.getProperty("os.name") + " " + System.getProperty("os.arch"));
        root.put("versions", versions);
    }

    public RunRecord put(String key, Object value) {
        root.put(key, value);
        return this;
    }

    public RunRecord warn(String warning) {
        warnings.add(warning);
        return this;
    }

    public List<String> warnings() {
        return List.copyOf(warnings);
    }

    public String toJson() {
        Map<String, Object> all = new LinkedHashMap<>(root);
        all.put("warnings", List.copyOf(warnings));
        return Json.write(all);
    }

    /** The version of this build, from the packaged properties. */
    public static String version() {
        try (InputStream in = RunRecord.class.getResourceAsStream("version.properties")) {
            Properties p = new Properties();
            if (in != null) {
                p.load(in);
            }
            return p.getProperty("version", "unknown");
        } catch (IOException e) {
            return "unknown";
        }
    }

    /** SHA-256 of a file's bytes, in hex. */
    public static String sha256(Path file) {
        try (InputStream in = Files.newInputStream(file)) {
            MessageDigest md = MessageDigest.getInstance("SHA-256");
            byte[] buffer = new byte[1 << 16];
            int n;
            while ((n = in.read(buffer)) > 0) {
                md.update(buffer, 0, n);
            }
            return HexFormat.of().formatHex(md.digest());
        } catch (IOException e) {
            throw new UncheckedIOException("could not read " + file + ": " + e.getMessage(), e);
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }
}
