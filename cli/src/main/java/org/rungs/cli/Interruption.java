package org.rungs.cli;

import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;

/**
 * Turns Ctrl-C (SIGINT) into a stop request: the chains end after their current iteration and
 * what was kept is written before the process exits with 130.
 */
final class Interruption implements AutoCloseable {
    private final AtomicBoolean stop = new AtomicBoolean();
    private final CountDownLatch finished = new CountDownLatch(1);
    private final Thread hook;

    Interruption() {
        hook = new Thread(() -> {
            stop.set(true);
            System.err.println("rungs: interrupted; writing what was kept...");
            try {
                finished.await(120, TimeUnit.SECONDS);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }, "rungs-interrupt");
        Runtime.getRuntime().addShutdownHook(hook);
    }

    AtomicBoolean flag() {
        return stop;
    }

    boolean requested() {
        return stop.get();
    }

    @Override
    public void close() {
        finished.countDown();
        try {
            Runtime.getRuntime().removeShutdownHook(hook);
        } catch (IllegalStateException shuttingDown) {
            // the hook is running; it returns now that the latch is open
        }
    }
}
