package org.rungs.validation;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.IntPredicate;

/**
 * Runs independent replications (calibration, recovery) on a fixed number of daemon threads.
 * Each replication depends on its index alone, so the results do not depend on the thread count.
 */
public final class ReplicationPool {
    private ReplicationPool() {
    }

    /**
     * Runs {@code replication} for every index of {@code todo}; it returns false when it was
     * stopped before finishing. A failure sets {@code stop}, so the others are abandoned, and is
     * thrown again.
     *
     * @return whether every replication finished
     */
    public static boolean run(List<Integer> todo, int threads, String threadName, AtomicBoolean stop,
                              IntPredicate replication) {
        ExecutorService pool = Executors.newFixedThreadPool(threads, task -> {
            Thread t = new Thread(task, threadName);
            t.setDaemon(true);
            return t;
        });
        boolean complete = true;
        try {
            List<Future<Boolean>> futures = new ArrayList<>();
            for (int r : todo) {
                futures.add(pool.submit(() -> !stop.get() && replication.test(r)));
            }
            for (Future<Boolean> f : futures) {
                complete &= f.get();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            stop.set(true);
            complete = false;
        } catch (ExecutionException e) {
            stop.set(true);
            Throwable cause = e.getCause();
            if (cause instanceof RuntimeException runtime) {
                throw runtime;
            }
            throw new IllegalStateException(cause);
        } finally {
            pool.shutdownNow();
        }
        return complete;
    }
}
