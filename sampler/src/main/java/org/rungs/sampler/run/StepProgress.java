package org.rungs.sampler.run;

import java.io.PrintStream;
import java.util.Locale;
import java.util.function.LongSupplier;
import org.rungs.sampler.ConsoleProgress;
import org.rungs.sampler.derived.WorkProgress;

/**
 * The progress of a long step after sampling (the derived quantities, the cross-validation): a
 * line on stderr two seconds after it began and every two seconds after, with the time left at
 * the pace so far; a step that ends sooner prints nothing.
 */
final class StepProgress implements WorkProgress {
    private static final long INTERVAL_NANOS = 2_000_000_000L;

    private final PrintStream err;
    private final String label;
    private final LongSupplier clock;
    private final long start;
    private long lastPrint;

    StepProgress(PrintStream err, String label) {
        this(err, label, System::nanoTime);
    }

    /** With the clock {@code clock} in nanoseconds (tests). */
    StepProgress(PrintStream err, String label, LongSupplier clock) {
        this.err = err;
        this.label = label;
        this.clock = clock;
        this.start = clock.getAsLong();
        this.lastPrint = start;
    }

    @Override
    public synchronized void done(int done, int total) {
        long now = clock.getAsLong();
        if (done <= 0 || done >= total || now - lastPrint < INTERVAL_NANOS) {
            return;
        }
        lastPrint = now;
        double left = (now - start) / 1e9 * (total - done) / done;
        err.println(String.format(Locale.ROOT, "rungs: %s %,d/%,d | about %s left", label, done, total,
                ConsoleProgress.formatSeconds(left)));
    }
}
