package org.rungs.cli;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;

/** Command-line arguments as picocli expands them, edited to start another command from them. */
final class Arguments {
    private Arguments() {
    }

    /**
     * {@code args} without the options named in {@code withValue} (as {@code --opt V} or
     * {@code --opt=V}) and without the flags in {@code flags} (also as {@code --flag=V}).
     */
    static List<String> without(List<String> args, Set<String> withValue, Set<String> flags) {
        List<String> kept = new ArrayList<>();
        for (int i = 0; i < args.size(); i++) {
            String a = args.get(i);
            int eq = a.indexOf('=');
            String name = a.startsWith("--") && eq > 0 ? a.substring(0, eq) : a;
            if (withValue.contains(a)) {
                i++;
            } else if (!withValue.contains(name) && !flags.contains(name)) {
                kept.add(a);
            }
        }
        return kept;
    }
}
