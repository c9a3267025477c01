package org.rungs.sampler;

import java.io.BufferedInputStream;
import java.io.BufferedOutputStream;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.Closeable;
import java.io.DataInputStream;
import java.io.DataOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.channels.FileChannel;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import org.rungs.posteriors.Draws;

/**
 * The checkpoint of one chain: {@code chain-K.bin}, the chain's full state at an iteration,
 * replaced atomically (written to a temporary file, then renamed), and {@code draws-K.bin}, its
 * kept draws as raw doubles, appended as they are made and flushed with every save. The draws
 * file may run ahead of the state after a kill; a resume cuts it back to the saved count.
 *
 * <p>A resume may run the saved chains on: with at least as many draws per chain, and with a thin
 * that is a multiple r of the saved one, every r-th saved draw is kept and the file rewritten so.
 * The chain's sweeps and random stream depend on neither, so the draws are then those of a fit
 * started with the new draws and thin.
 */
final class ChainCheckpoint implements Closeable {
    /**
     * "RUNGSCK" and a letter: marks the file and its format (3: the joint Hamiltonian step's state in the
     * sweep; 4: under attraction, the counters of {@link BoundedRedrawSteps} and the attraction
     * update's block-move scale and warm-up sums; 5: the joint step's leapfrog and wall counts;
     * 6: the attraction update's count of warm-up sweeps, for its hold at the start; 7: the
     * trade step's scale and count, {@link AttractionTradeUpdate}; 8: the joint step's kept
     * warm-up states instead of their sums, and its change of variables, {@link CoordinateWarp}; 9:
     * the ridge move's scale and counts; 10: the joint step's group thresholds as scaled logs
     * of their gaps, so its kept warm-up states and metric are in those coordinates; 11: above
     * {@link JointHamiltonianUpdate#DENSE_UP_TO} coordinates the metric as {@link ArrowMetric}'s
     * blocks; 12: there, the scales of {@link CollapsedSpreadUpdate}; 13: its window and which of
     * its moves run, in every fit of several groups with by-group thresholds or the coarse class). The last byte counts
     * the formats: "RUNGSCKD" is 13.
     */
    private static final long MAGIC = 0x52554E4753434B44L;

    /**
     * Iterations done (warm-up included) and kept draws at a save, and how many of those saved
     * draws make one of the resumed fit's (its thin over the saved thin; 1 but for a resume with more thinning).
     */
    record Position(int iterations, int kept, int ratio) {
        /** The draws kept at this position by the resumed fit: every ratio-th saved one. */
        int keptNow() {
            return kept / ratio;
        }
    }

    private final Path stateFile;
    private final Path drawsFile;
    private final int chain;
    private final SamplerSettings settings;
    private final int parameters;
    private final long intervalNanos;
    private final boolean resume;
    private long lastSave;
    private DataOutputStream drawsOut;

    ChainCheckpoint(Path dir, int chain, SamplerSettings settings, int parameters, long intervalNanos, boolean resume) {
        this.stateFile = dir.resolve("chain-" + chain + ".bin");
        this.drawsFile = dir.resolve("draws-" + chain + ".bin");
        this.chain = chain;
        this.settings = settings;
        this.parameters = parameters;
        this.intervalNanos = intervalNanos;
        this.resume = resume;
    }

    /**
     * When resuming and a state was saved: restores {@code target} and puts the saved kept draws
     * into {@code draws}; otherwise starts empty files. Opens the draws file for appending.
     */
    Position restore(Chain target, Draws draws) throws IOException {
        Files.createDirectories(stateFile.getParent());
        Position at = new Position(0, 0, 1);
        if (resume && Files.exists(stateFile)) {
            try (DataInputStream in = new DataInputStream(new ByteArrayInputStream(Files.readAllBytes(stateFile)))) {
                at = readHeader(in);
                target.restore(in);
            }
            readDraws(draws, at);
        }
        try (FileChannel channel = FileChannel.open(drawsFile, StandardOpenOption.CREATE, StandardOpenOption.WRITE)) {
            channel.truncate((long) at.keptNow() * parameters * Double.BYTES);
        }
        drawsOut = new DataOutputStream(new BufferedOutputStream(
                Files.newOutputStream(drawsFile, StandardOpenOption.APPEND), 1 << 16));
        Position now = new Position(at.iterations(), at.keptNow(), 1);
        if (at.ratio() > 1) {
            // the state's header now says the new thin, matching the rewritten draws file
            save(target, now.iterations(), now.kept());
        }
        lastSave = System.nanoTime();
        return now;
    }

    /**
     * When resuming, the position the saved state is at, read from its header alone; null when
     * there is none to resume from.
     */
    Position saved() throws IOException {
        if (!resume || !Files.exists(stateFile)) {
            return null;
        }
        try (DataInputStream in = new DataInputStream(new BufferedInputStream(Files.newInputStream(stateFile)))) {
            return readHeader(in);
        }
    }

    private Position readHeader(DataInputStream in) throws IOException {
        if (in.readLong() != MAGIC) {
            throw new IOException(stateFile + " is not a checkpoint of this version");
        }
        int savedChain = in.readInt();
        long seed = in.readLong();
        int warmup = in.readInt();
        int kept = in.readInt();
        int thin = in.readInt();
        int savedParameters = in.readInt();
        if (savedChain != chain || seed != settings.seed() || warmup != settings.warmup() || kept > settings.draws()
                || thin < 1 || settings.thin() % thin != 0 || savedParameters != parameters) {
            throw new IOException(stateFile + " was saved by another fit (chain " + savedChain + ", seed " + seed + ", "
                    + warmup + " warm-up + " + kept + " kept draws, thin " + thin + ", " + savedParameters + " parameters)");
        }
        return new Position(in.readInt(), in.readInt(), settings.thin() / thin);
    }

    /**
     * Puts the saved draws the resumed fit keeps into {@code draws}. With more thinning the draws
     * file is replaced by those it keeps before the state is saved with the new thin; a file of
     * exactly that many draws, fewer than the state counts, is one a kill left between the two
     * (a draws file otherwise never falls behind its state), and is read as it is.
     */
    private void readDraws(Draws draws, Position at) throws IOException {
        long rowBytes = (long) parameters * Double.BYTES;
        long size = Files.size(drawsFile);
        boolean rethinned = at.ratio() > 1 && size == at.keptNow() * rowBytes && at.keptNow() < at.kept();
        if (!rethinned && size < at.kept() * rowBytes) {
            throw new IOException(drawsFile + " holds fewer than the " + at.kept() + " kept draws its checkpoint counts");
        }
        int step = rethinned ? 1 : at.ratio();
        double[] row = new double[parameters];
        try (InputStream file = Files.newInputStream(drawsFile);
             DataInputStream in = new DataInputStream(new BufferedInputStream(file, 1 << 16))) {
            for (int t = 0; t < at.keptNow() * step; t++) {
                for (int p = 0; p < parameters; p++) {
                    row[p] = Double.longBitsToDouble(in.readLong());
                }
                // saved draw t is iteration warmup + (t + 1) x saved thin: kept when t + 1 is a multiple of the ratio
                if ((t + 1) % step == 0) {
                    draws.putRow(chain, (t + 1) / step - 1, row);
                }
            }
        }
        if (at.ratio() > 1 && !rethinned) {
            Path tmp = drawsFile.resolveSibling(drawsFile.getFileName() + ".partial");
            try (DataOutputStream out = new DataOutputStream(new BufferedOutputStream(Files.newOutputStream(tmp), 1 << 16))) {
                for (int t = 0; t < at.keptNow(); t++) {
                    for (int p = 0; p < parameters; p++) {
                        out.writeLong(Double.doubleToRawLongBits(draws.get(p, chain, t)));
                    }
                }
            }
            try {
                Files.move(tmp, drawsFile, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, drawsFile, StandardCopyOption.REPLACE_EXISTING);
            }
        }
    }

    /** Appends one kept draw. */
    void append(double[] row) throws IOException {
        for (double v : row) {
            drawsOut.writeLong(Double.doubleToRawLongBits(v));
        }
    }

    /** Whether the save interval has passed; only when a save happens depends on the clock, never what is saved. */
    boolean due() {
        return System.nanoTime() - lastSave >= intervalNanos;
    }

    /** Flushes the kept draws, then atomically replaces the saved state with {@code target}'s. */
    void save(Chain target, int iterations, int kept) throws IOException {
        drawsOut.flush();
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (DataOutputStream out = new DataOutputStream(bytes)) {
            out.writeLong(MAGIC);
            out.writeInt(chain);
            out.writeLong(settings.seed());
            out.writeInt(settings.warmup());
            out.writeInt(settings.draws());
            out.writeInt(settings.thin());
            out.writeInt(parameters);
            out.writeInt(iterations);
            out.writeInt(kept);
            target.save(out);
        }
        Path tmp = stateFile.resolveSibling(stateFile.getFileName() + ".partial");
        Files.write(tmp, bytes.toByteArray());
        try {
            Files.move(tmp, stateFile, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        } catch (AtomicMoveNotSupportedException e) {
            Files.move(tmp, stateFile, StandardCopyOption.REPLACE_EXISTING);
        }
        lastSave = System.nanoTime();
    }

    @Override
    public void close() throws IOException {
        if (drawsOut != null) {
            drawsOut.close();
        }
    }
}
