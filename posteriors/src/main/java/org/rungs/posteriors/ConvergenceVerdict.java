package org.rungs.posteriors;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Whether a family of quantities (a fit's parameters, or its derived quantities) has converged
 * by the flags of MODEL.md section 7, and, where R-hat alone raised them, whether they are
 * within what chains drawing from the posterior itself show among this many quantities. At
 * 100 to 200 effective draws per chain such chains put R-hat above 1.01 for a few in a hundred
 * quantities (RhatChanceTest), so a fit of hundreds is rarely free of flags by chance alone.
 *
 * <p>Flags within chance: every flag is R-hat alone (every ESS sufficient), no R-hat above
 * {@value #RHAT_CEILING}, and the chance that at least one of the family's quantities gives an
 * R-hat as unlikely as its least likely one, 1 - (1 - min rhatChance)^quantities (Sidak's
 * correction, which treats the quantities as independent), is at least {@value #LEVEL}.
 */
public record ConvergenceVerdict(Kind kind, int quantities, List<String> flagged, String largest, double largestRhat,
        double familyChance) {
    /** A family's verdict. */
    public enum Kind { CONVERGED, WITHIN_CHANCE, NOT_CONVERGED }

    /** The family chance below which R-hat flags are taken as the chains' disagreement (common practice, no source). */
    static final double LEVEL = 0.05;
    /**
     * No R-hat above this is put down to chance, whatever its chance (our choice, no source):
     * among hundreds of quantities the family correction lets a chain shifted by half a posterior
     * sd pass now and then at ESS near 700 (RhatChanceTest), with R-hat near 1.03; chains drawing
     * from the posterior give a largest R-hat of about 1.02 among 640 quantities at that ESS.
     */
    static final double RHAT_CEILING = 1.03;
    private static final String RHAT_REASON = "rhat>1.01";
    private static final int LISTED_NAMES = 10;

    /** What the verdict reads of one quantity: its flag reasons (empty when it passes), R-hat and R-hat's chance. */
    public record Quantity(String name, List<String> reasons, double rhat, double rhatChance) {
    }

    public ConvergenceVerdict {
        flagged = List.copyOf(flagged);
    }

    /** The verdict of these summaries. */
    public static ConvergenceVerdict of(List<ParameterSummary> summaries) {
        List<Quantity> quantities = new ArrayList<>(summaries.size());
        for (ParameterSummary s : summaries) {
            List<String> reasons = s.flagged() ? s.flagReasons() : List.of();
            quantities.add(new Quantity(s.name(), s.flagged() && reasons.isEmpty() ? List.of("flagged") : reasons,
                    s.rhat(), s.rhatChance()));
        }
        return ofQuantities(quantities);
    }

    /** The verdict of a family read back from a file. */
    public static ConvergenceVerdict ofQuantities(List<Quantity> quantities) {
        List<String> flagged = new ArrayList<>();
        boolean rhatAlone = true;
        String largest = null;
        double largestRhat = Double.NEGATIVE_INFINITY;
        double smallestChance = 1;
        for (Quantity q : quantities) {
            if (!Double.isNaN(q.rhatChance())) {
                smallestChance = Math.min(smallestChance, q.rhatChance());
            }
            if (q.reasons().isEmpty()) {
                continue;
            }
            flagged.add(q.name());
            rhatAlone &= q.reasons().equals(List.of(RHAT_REASON)) && q.rhat() <= RHAT_CEILING
                    && !Double.isNaN(q.rhatChance());
            if (q.rhat() > largestRhat) {
                largest = q.name();
                largestRhat = q.rhat();
            }
        }
        if (flagged.isEmpty()) {
            return new ConvergenceVerdict(Kind.CONVERGED, quantities.size(), flagged, null, Double.NaN, Double.NaN);
        }
        double family = -Math.expm1(quantities.size() * Math.log1p(-smallestChance));
        Kind kind = rhatAlone && family >= LEVEL ? Kind.WITHIN_CHANCE : Kind.NOT_CONVERGED;
        return new ConvergenceVerdict(kind, quantities.size(), flagged, largest, largestRhat, rhatAlone ? family : Double.NaN);
    }

    /** False only when the family has not converged: flags within chance leave the estimates readable. */
    public boolean readable() {
        return kind != Kind.NOT_CONVERGED;
    }

    /** One line for the console, naming the quantities as {@code noun} (e.g. "parameters"). */
    public String line(String noun) {
        return switch (kind) {
            case CONVERGED -> "All " + quantities + " " + noun
                    + " converged (R-hat <= 1.01, bulk and tail ESS >= 100 per chain).";
            case WITHIN_CHANCE -> String.format(Locale.ROOT, "Converged within chance: %d of %d %s %s R-hat above 1.01"
                    + " (largest %s: %.4f) and every ESS is sufficient; among %d %s, chains drawing from the posterior"
                    + " itself give R-hat this far from 1 with probability %s (README, reading the verdict).",
                    flagged.size(), quantities, noun, flagged.size() == 1 ? "has" : "have", largest, largestRhat,
                    quantities, noun, ProbabilityText.of(familyChance, 2));
            case NOT_CONVERGED -> {
                StringBuilder line = new StringBuilder("Not converged: ").append(flagged.size()).append(" of ")
                        .append(quantities).append(' ').append(noun).append(" flagged: ")
                        .append(String.join(", ", flagged.subList(0, Math.min(LISTED_NAMES, flagged.size()))));
                if (flagged.size() > LISTED_NAMES) {
                    line.append(" (and ").append(flagged.size() - LISTED_NAMES).append(" more)");
                }
                yield line.append('.').toString();
            }
        };
    }
}
