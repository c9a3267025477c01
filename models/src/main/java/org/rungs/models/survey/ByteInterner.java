package org.rungs.models.survey;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.concurrent.ThreadLocalRandom;

/**
 * Numbers distinct byte strings 0, 1, 2, ... in order of first appearance, by open addressing
 * with linear probing; a lookup allocates nothing, so labels of a million rows cost one String per
 * distinct label.
 *
 * <p>The hash is seeded at random per instance: with a fixed hash a file of labels built to collide
 * (under {@code 31 * h + b}, "Aa" and "BB" are equal, so 2^16 labels of 16 such blocks share one
 * value) puts every label on one probe chain and makes reading quadratic. The numbering does not
 * depend on the seed.
 */
final class ByteInterner {
    private static final VarHandle LONGS = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);

    private final long seed = ThreadLocalRandom.current().nextLong();
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

    /** Eight bytes at a time through a bijective mixer, so the state after each block depends on the seed. */
    private int hash(byte[] bytes, int from, int to) {
        long h = seed ^ (to - from);
        int i = from;
        for (; i + Long.BYTES <= to; i += Long.BYTES) {
            h = mix(h ^ (long) LONGS.get(bytes, i));
        }
        long tail = 0;
        for (; i < to; i++) {
            tail = tail << 8 | (bytes[i] & 0xFF);
        }
        h = mix(h ^ tail);
        return (int) (h ^ (h >>> 32));
    }

    /**
     * The 64-bit finaliser of SplitMix64 (Steele, Lea and Flood 2014, "Fast splittable pseudorandom
     * number generators", OOPSLA).
     */
    private static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xbf58476d1ce4e5b9L;
        z = (z ^ (z >>> 27)) * 0x94d049bb133111ebL;
        return z ^ (z >>> 31);
    }

    private static int[] emptyTable(int capacity) {
        int[] t = new int[capacity];
        Arrays.fill(t, -1);
        return t;
    }
}
