package org.rungs.validation.calibration;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Shards merged, a single run and a resumed run give the same files, byte for byte. */
class ShardMergeResumeTest {
    private static final List<String> OUTPUTS = List.of("ranks.csv", "fits.csv", "verdicts.csv", "plots/level.x1.svg");

    /** A tiny configuration: 8 replications of short fits; only the bookkeeping is tested here. */
    private static CalibrationConfig tiny() {
        return CalibrationConfig.small(42, 8).withDesign(2, 20, 1).withSampler(2, 30, 30, 19);
    }

    private static void assertSameFiles(Path a, Path b) throws IOException {
        for (String f : OUTPUTS) {
            assertArrayEquals(Files.readAllBytes(a.resolve(f)), Files.readAllBytes(b.resolve(f)), f);
        }
    }

    @Test
    void twoShardsMergedEqualOneRun(@TempDir Path dir) throws IOException {
        Calibration.run(tiny(), dir.resolve("single"), Shard.ALL, 1, null, new AtomicBoolean());
        Calibration.run(tiny(), dir.resolve("s1"), Shard.parse("1/2"), 2, null, new AtomicBoolean());
        Calibration.run(tiny(), dir.resolve("s2"), Shard.parse("2/2"), 2, null, new AtomicBoolean());
        CalibrationSummary merged = Calibration.merge(List.of(dir.resolve("s1"), dir.resolve("s2")), dir.resolve("merged"));
        assertEquals(8, merged.results().size());
        assertSameFiles(dir.resolve("single"), dir.resolve("merged"));
        assertTrue(Calibration.missing(CalibrationFolder.existing(dir.resolve("merged"))).isEmpty());
    }

    @Test
    void aRerunSkipsFinishedReplicationsAndEndsWithTheSameFiles(@TempDir Path dir) throws IOException {
        Path resumed = dir.resolve("resumed");
        Calibration.run(tiny(), resumed, Shard.parse("1/2"), 2, null, new AtomicBoolean());
        Path record = resumed.resolve(CalibrationFolder.REPLICATIONS).resolve(CalibrationFolder.fileName(0));
        FitTimeMarker.set(record);
        ByteArrayOutputStream progress = new ByteArrayOutputStream();
        Calibration.run(tiny(), resumed, Shard.ALL, 2, new PrintStream(progress, true, StandardCharsets.UTF_8),
                new AtomicBoolean());
        assertTrue(FitTimeMarker.unchanged(record), "a finished replication is not redone");
        String lines = progress.toString(StandardCharsets.UTF_8);
        assertTrue(lines.contains("8/8 replications"), lines);
        Calibration.run(tiny(), dir.resolve("single"), Shard.ALL, 2, null, new AtomicBoolean());
        assertSameFiles(dir.resolve("single"), resumed);
    }

    /**
     * Which spreads each chain moved survives a fit's record and reaches fits.csv as counts and the
     * summary as totals; a record without the note (written before it was kept) reads as not
     * recorded, an empty cell rather than 0.
     */
    @Test
    void theSpreadMovesOfAFitAreKeptInItsRecordAndCounted(@TempDir Path dir) throws IOException {
        CalibrationFolder folder = CalibrationFolder.open(dir, tiny().withReplications(2));
        List<ParameterRank> ranks = List.of(new ParameterRank("level.x1", 0.5, 3, 19, 1.001, 500, 400, false));
        folder.write(new ReplicationResult(0, ranks, List.of("threshold_sd, style_sd", "none", "style_sd")));
        folder.write(new ReplicationResult(1, ranks));
        assertTrue(Files.readString(dir.resolve(CalibrationFolder.REPLICATIONS).resolve(CalibrationFolder.fileName(0)))
                .endsWith("\n# spread_moves_per_chain: threshold_sd, style_sd; none; style_sd\n"));
        Map<Integer, ReplicationResult> read = folder.finished();
        assertEquals(List.of("threshold_sd, style_sd", "none", "style_sd"), read.get(0).spreadMoves());
        assertNull(read.get(1).spreadMoves());
        CalibrationSummary summary = Calibration.summarise(folder);
        assertEquals(3, summary.chainsRecordingSpreadMoves());
        assertEquals(1, summary.chainsMoving("threshold_sd"));
        assertEquals(2, summary.chainsMoving("style_sd"));
        List<String> fits = Files.readAllLines(dir.resolve("fits.csv"));
        assertTrue(fits.get(0).endsWith(",min_ess_tail,chains_moving_threshold_sd,chains_moving_style_sd"), fits.get(0));
        assertTrue(fits.get(1).startsWith("0,false,0,1.0010,500.0,400.0,1,2"), fits.get(1));
        assertTrue(fits.get(2).endsWith(",400.0,,"), fits.get(2));
    }

    @Test
    void aStoppedRunRecordsNothingHalfDone(@TempDir Path dir) {
        AtomicBoolean stop = new AtomicBoolean(true);
        assertNull(Calibration.run(tiny(), dir, Shard.ALL, 2, null, stop));
        assertEquals(8, Calibration.missing(CalibrationFolder.existing(dir)).size());
    }

    @Test
    void aFolderOfAnotherConfigurationIsRefused(@TempDir Path dir) {
        Calibration.run(tiny().withReplications(2), dir, Shard.ALL, 1, null, new AtomicBoolean());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Calibration.run(tiny().withReplications(3), dir, Shard.ALL, 1, null, new AtomicBoolean()));
        assertTrue(e.getMessage().contains("another configuration"), e.getMessage());
    }

    /** Marks a file with an old modification time, to see whether it was rewritten. */
    private static final class FitTimeMarker {
        private static final FileTime OLD = FileTime.fromMillis(1_000_000_000_000L);

        static void set(Path file) throws IOException {
            Files.setLastModifiedTime(file, OLD);
        }

        static boolean unchanged(Path file) throws IOException {
            return Files.getLastModifiedTime(file).equals(OLD);
        }
    }
}
