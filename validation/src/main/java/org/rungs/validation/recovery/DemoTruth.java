package org.rungs.validation.recovery;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.rungs.examples.DemoScenario;
import org.rungs.examples.Scenario;

/**
 * The built-in demo ({@link DemoScenario}) as the fixed truth of a recovery study, optionally
 * shrunk to its first {@code groups} regions with {@code respondents} each. The stated values
 * (region intercepts, thresholds, effects, attraction deviations) are the demo's; the drawn ones
 * (threshold deviations, coarse-class intercepts) come from the demo's seed, so with fewer regions
 * some of them differ from the full demo's.
 *
 * @param variant     which parts of MODEL.md section 4 the truth has
 * @param groups      regions, 2..12 (one group would need stated intercepts and shared thresholds)
 * @param respondents respondents per region
 */
public record DemoTruth(Variant variant, int groups, int respondents) {

    /** Regions of the demo. */
    public static final int DEMO_GROUPS = 12;

    /** Respondents per region of the demo. */
    public static final int DEMO_RESPONDENTS = 1500;

    /** The parts of the demo kept. */
    public enum Variant {
        /** The full demo: coarse responders (MODEL.md 4, 4a) and number attraction (4b). */
        DEMO("demo", "the demo (coarse class and number attraction)"),
        /** The demo without number attraction. */
        NO_ATTRACTION("no-attraction", "the demo without number attraction (coarse class only)"),
        /** {@link DemoScenario#orderedProbit()}: the plain hierarchical ordered probit. */
        PLAIN("plain", "the demo as a plain ordered probit (no coarse class, no attraction)");

        private final String label;
        private final String description;

        Variant(String label, String description) {
            this.label = label;
            this.description = description;
        }

        public String label() {
            return label;
        }

        /** Reads a label: demo, no-attraction or plain. */
        public static Variant parse(String text) {
            for (Variant v : values()) {
                if (v.label.equals(text.trim().toLowerCase(Locale.ROOT))) {
                    return v;
                }
            }
            throw new IllegalArgumentException("the truth is demo, no-attraction or plain, got '" + text + "'");
        }
    }

    public DemoTruth {
        if (groups < 2 || groups > DEMO_GROUPS) {
            throw new IllegalArgumentException("the demo truth has 2.." + DEMO_GROUPS + " regions, got " + groups);
        }
        if (respondents < 1) {
            throw new IllegalArgumentException("each region needs at least one respondent, got " + respondents);
        }
    }

    /** The demo in full: all regions, all respondents. */
    public static DemoTruth of(Variant variant) {
        return new DemoTruth(variant, DEMO_GROUPS, DEMO_RESPONDENTS);
    }

    /** The scenario: the demo's first regions, each with {@link #respondents()}. */
    public Scenario scenario() {
        Scenario full = variant == Variant.PLAIN ? DemoScenario.orderedProbit() : DemoScenario.scenario();
        List<Scenario.Group> kept = new ArrayList<>();
        for (int g = 0; g < groups; g++) {
            kept.add(new Scenario.Group(full.groups().get(g).label(), respondents));
        }
        Scenario.StyleClasses style = full.styleClasses();
        if (style instanceof Scenario.StyleClasses.Coarse coarse) {
            style = new Scenario.StyleClasses.Coarse(coarse.covariates(), firstGroups(coarse.intercepts()),
                    coarse.coarsePoints());
        }
        Scenario.NumberAttraction attraction = Scenario.NumberAttraction.none();
        if (variant == Variant.DEMO && full.attraction() instanceof Scenario.NumberAttraction.Active active) {
            Scenario.AttractionDeviations deviations = active.deviations();
            if (deviations instanceof Scenario.AttractionDeviations.Fixed fixed) {
                deviations = new Scenario.AttractionDeviations.Fixed(Arrays.copyOf(fixed.deviations(), groups));
            }
            attraction = new Scenario.NumberAttraction.Active(active.attractionSet(), active.meanAttraction(), deviations);
        }
        Scenario.ThresholdDeviations deviations = full.thresholdDeviations();
        if (deviations instanceof Scenario.ThresholdDeviations.Fixed fixed) {
            deviations = new Scenario.ThresholdDeviations.Fixed(Arrays.copyOf(fixed.deviations(), groups));
        }
        return new Scenario(full.scale(), kept, full.levelCovariates(), firstGroups(full.groupLevels()), full.thresholds(),
                deviations, style, attraction, full.seed());
    }

    /** In words, e.g. "the demo without number attraction (coarse class only), 12 regions of 1500". */
    public String describe() {
        return variant.description + ", " + groups + " regions of " + respondents;
    }

    private Scenario.GroupLevels firstGroups(Scenario.GroupLevels levels) {
        return levels instanceof Scenario.GroupLevels.Fixed fixed
                ? new Scenario.GroupLevels.Fixed(Arrays.copyOf(fixed.alpha(), groups)) : levels;
    }
}
