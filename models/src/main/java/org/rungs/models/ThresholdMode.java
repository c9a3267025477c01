package org.rungs.models;

/** How thresholds vary across groups (MODEL.md section 3). */
public enum ThresholdMode {
    /** One set of thresholds for all groups ({@code d = 0}). */
    SHARED("shared"),
    /** Common thresholds plus sum-to-zero group deviations; the default when there are several groups. */
    BY_GROUP("by-group");

    private final String label;

    ThresholdMode(String label) {
        this.label = label;
    }

    public String label() {
        return label;
    }

    public static ThresholdMode parse(String text) {
        for (ThresholdMode m : values()) {
            if (m.label.equals(text)) {
                return m;
            }
        }
        throw new IllegalArgumentException("threshold mode must be 'shared' or 'by-group', got '" + text + "'");
    }
}
