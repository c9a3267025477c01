package org.rungs.validation.calibration;

/**
 * A slice of the replications, {@code index/count} with index 1..count (the numbering of a batch
 * scheduler's job array): replication r belongs to shard {@code r % count + 1}.
 */
public record Shard(int index, int count) {
    public static final Shard ALL = new Shard(1, 1);

    public Shard {
        if (count < 1 || index < 1 || index > count) {
            throw new IllegalArgumentException("a shard is I/N with 1 <= I <= N, got " + index + "/" + count);
        }
    }

    /** Reads {@code "I/N"}, e.g. {@code 3/20}. */
    public static Shard parse(String text) {
        int slash = text.indexOf('/');
        try {
            if (slash > 0) {
                return new Shard(Integer.parseInt(text.substring(0, slash).strip()),
                        Integer.parseInt(text.substring(slash + 1).strip()));
            }
        } catch (NumberFormatException e) {
            // reported below with the expected form
        }
        throw new IllegalArgumentException("a shard is written I/N, e.g. 3/20, got '" + text + "'");
    }

    public boolean contains(int replication) {
        return replication % count == index - 1;
    }

    @Override
    public String toString() {
        return index + "/" + count;
    }
}
