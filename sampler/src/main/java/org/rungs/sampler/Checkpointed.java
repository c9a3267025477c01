package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import java.util.List;

/**
 * A part of a chain whose values carry over from one iteration to the next, saved in a
 * checkpoint and restored exactly: doubles travel as their raw bits, so a resumed chain continues
 * bit for bit where it stopped. Caches recomputed at the start of every update are not saved.
 */
interface Checkpointed {
    void save(DataOutput out) throws IOException;

    /** @throws IOException when the saved values do not fit this part (another model or survey) */
    void restore(DataInput in) throws IOException;

    /** Saves, in order, those of {@code parts} that are checkpointed. */
    static void saveAll(List<?> parts, DataOutput out) throws IOException {
        for (Object p : parts) {
            if (p instanceof Checkpointed) {
                ((Checkpointed) p).save(out);
            }
        }
    }

    /** Restores, in order, those of {@code parts} that are checkpointed. */
    static void restoreAll(List<?> parts, DataInput in) throws IOException {
        for (Object p : parts) {
            if (p instanceof Checkpointed) {
                ((Checkpointed) p).restore(in);
            }
        }
    }

    static void writeDoubles(DataOutput out, double[] values) throws IOException {
        out.writeInt(values.length);
        for (double v : values) {
            out.writeLong(Double.doubleToRawLongBits(v));
        }
    }

    static void readDoubles(DataInput in, double[] values) throws IOException {
        expectLength(in.readInt(), values.length);
        for (int i = 0; i < values.length; i++) {
            values[i] = Double.longBitsToDouble(in.readLong());
        }
    }

    static void writeDouble(DataOutput out, double value) throws IOException {
        out.writeLong(Double.doubleToRawLongBits(value));
    }

    static double readDouble(DataInput in) throws IOException {
        return Double.longBitsToDouble(in.readLong());
    }

    static void expectLength(int saved, int expected) throws IOException {
        if (saved != expected) {
            throw new IOException("the checkpoint holds " + saved + " values where this fit has " + expected);
        }
    }
}
