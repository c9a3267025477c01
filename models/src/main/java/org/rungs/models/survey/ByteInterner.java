package org.rungs.models.survey;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/**
 * Numbers distinct byte strings 0, 1, 2, ... in order of first appearance, by open addressing
 * with linear probing; a lookup allocates nothing, so labels of a million rows cost one String per
 * distinct label.
 */
final class ByteInterner {
    private byte[] pool = new byte[256];
    private int poolSize;
    private int[] offsets = new int[16];
    private int[] lengths = new int[16];
    private int[] hashes = new int[16];
    private int size;
    private int[] table = emptyTable(64);

    /** The number of {@code bytes[from, to)}, new ones numbered next. */
    int intern(byte[] bytes, int from, int to) {
        int hash = hash(bytes, from, to);
        int mask = table.length - 1;
        for (int slot = hash & mask; ; slot = (slot + 1) & mask) {
            int id = table[slot];
            if (id < 0) {
                id = add(bytes, from, to, hash);
                table[slot] = id;
                if (2 * size > table.length) {
                    rehash();
                }
                return id;
            }
            if (hashes[id] == hash && Arrays.equals(pool, offsets[id], offsets[id] + lengths[id], bytes, from, to)) {
                return id;
            }
        }
    }

    int size() {
        return size;
    }

    /** Label {@code id} decoded as UTF-8 (the tokenizer has validated it). */
    String label(int id) {
        return new String(pool, offsets[id], lengths[id], StandardCharsets.UTF_8);
    }

    private int add(byte[] bytes, int from, int to, int hash) {
        int length = to - from;
        if (poolSize + length > pool.length) {
            pool = Arrays.copyOf(pool, Math.max(2 * pool.length, poolSize + length));
        }
        System.arraycopy(bytes, from, pool, poolSize, length);
        if (size == offsets.length) {
            offsets = Arrays.copyOf(offsets, 2 * size);
            lengths = Arrays.copyOf(lengths, 2 * size);
            hashes = Arrays.copyOf(hashes, 2 * size);
        }
        offsets[size] = poolSize;
        lengths[size] = length;
        hashes[size] = hash;
        poolSize += length;
        return size++;
    }

    private void rehash() {
        table = emptyTable(2 * table.length);
        int mask = table.length - 1;
        for (int id = 0; id < size; id++) {
            int slot = hashes[id] & mask;
            while (table[slot] >= 0) {
                slot = (slot + 1) & mask;
            }
            table[slot] = id;
        }
    }

    private static int hash(byte[] bytes, int from, int to) {
        int h = 1;
        for (int i = from; i < to; i++) {
            h = 31 * h + bytes[i];
        }
        // spread the high bits into the low ones used by the mask
        return h ^ (h >>> 16);
    }

    private static int[] emptyTable(int capacity) {
        int[] t = new int[capacity];
        Arrays.fill(t, -1);
        return t;
    }
}
