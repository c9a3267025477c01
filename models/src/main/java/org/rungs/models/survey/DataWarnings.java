package org.rungs.models.survey;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;

/**
 * Valid but unusual data that deserve a word before fitting: a rating nobody gave (or whose
 * answers were all declared missing), a small group, a group whose respondents all gave one
 * rating, a category of a categorical covariate that few respondents have. The reader accepts such data ({@link SurveyReader}); a fit prints these warnings.
 */
public final class DataWarnings {
    /** Below this many respondents a group's own thresholds and level rest mostly on the priors (common practice, no source). */
    public static final int SMALL_GROUP = 30;

    /** Below this many respondents a categorical covariate's level has a coefficient resting mostly on its prior (our rule). */
    public static final int RARE_LEVEL = 10;

    /**
     * More unanswered ratings or small groups than this are said in one warning, not one each:
     * a scale of 0..100 or 150 groups of 15 gave screens of warnings in an audit (our rule).
     */
    public static final int MAX_NAMED = 5;

    private DataWarnings() {
    }

    private static String joined(List<Integer> ratings) {
        StringBuilder sb = new StringBuilder();
        for (int r : ratings) {
            sb.append(sb.length() == 0 ? "" : ", ").append(r);
        }
        return sb.toString();
    }

    /** The warnings about {@code survey}'s data, in the order a fit prints them. */
    public static List<String> of(Survey survey) {
        List<String> warnings = new ArrayList<>();
        int m = survey.scale().categories();
        long[] counts = new long[m];
        for (byte c : survey.category()) {
            counts[c]++;
        }
        Map<Integer, Long> declaredMissing = survey.exclusions().answersDeclaredMissing();
        List<Integer> unanswered = new ArrayList<>();
        for (int k = 0; k < m; k++) {
            int rating = survey.scale().rating(k);
            long declared = declaredMissing.getOrDefault(rating, 0L);
            if (declared > 0) {
                // a code of the rating column matches every answer of its rating, so none is left
                warnings.add("every answer of " + rating + " was declared missing (" + declared
                        + (declared == 1 ? " answer" : " answers") + ", by a missing code of the rating column)"
                        + "; the thresholds around it rest on the prior and on their neighbours");
            } else if (counts[k] == 0) {
                unanswered.add(rating);
            }
        }
        if (unanswered.size() > MAX_NAMED) {
            warnings.add("nobody answered " + unanswered.size() + " of the " + m + " ratings (" + joined(unanswered)
                    + "); the thresholds around them rest on the prior and on their neighbours");
        } else {
            for (int rating : unanswered) {
                warnings.add("nobody answered " + rating
                        + "; the thresholds around it rest on the prior and on their neighbours");
            }
        }
        int[] sizes = survey.groupSizes();
        int[] first = new int[sizes.length];
        boolean[] varied = new boolean[sizes.length];
        Arrays.fill(first, -1);
        byte[] category = survey.category();
        int[] group = survey.group();
        for (int i = 0; i < category.length; i++) {
            int g = group[i];
            if (first[g] < 0) {
                first[g] = category[i];
            } else if (first[g] != category[i]) {
                varied[g] = true;
            }
        }
        List<String> small = new ArrayList<>();
        for (int g = 0; g < sizes.length; g++) {
            if (sizes[g] < SMALL_GROUP) {
                small.add(survey.groupLabels().get(g) + " " + sizes[g]);
            }
        }
        if (small.size() > MAX_NAMED) {
            warnings.add(small.size() + " of the " + sizes.length + " groups have fewer than " + SMALL_GROUP
                    + " respondents (" + String.join(", ", small.subList(0, MAX_NAMED)) + " and " + (small.size() - MAX_NAMED)
                    + " more); their estimates lean on the other groups");
        }
        // with one group there are no other groups to lean on (an audit found the warnings saying so)
        boolean single = sizes.length == 1;
        // nor when every group gave the same one rating: one warning, not one per group
        boolean oneRatingEverywhere = !single && category.length > 1 && Arrays.stream(counts).filter(c -> c > 0).count() == 1;
        if (oneRatingEverywhere) {
            warnings.add("every respondent of every group answered " + survey.scale().rating(category[0])
                    + "; the levels and thresholds cannot be told apart, so they rest on the priors");
        }
        for (int g = 0; g < sizes.length; g++) {
            String respondents = sizes[g] + (sizes[g] == 1 ? " respondent" : " respondents");
            if (sizes[g] < SMALL_GROUP && small.size() <= MAX_NAMED) {
                warnings.add(single ? "the survey has only " + respondents + "; its estimates rest mostly on the priors"
                        : "group " + survey.groupLabels().get(g) + " has only " + respondents
                                + "; its estimates lean on the other groups");
            }
            if (sizes[g] > 1 && !varied[g] && !oneRatingEverywhere) {
                warnings.add(single ? "every respondent answered " + survey.scale().rating(first[g])
                        + "; the level and thresholds cannot be told apart, so they rest on the priors"
                        : "every respondent of group " + survey.groupLabels().get(g) + " answered "
                                + survey.scale().rating(first[g]) + "; its level and thresholds cannot be told apart, so"
                                + " they rest on the priors and on the other groups");
            }
        }
        rareLevels(warnings, survey.level(), "level");
        rareLevels(warnings, survey.style(), "style");
        return warnings;
    }

    /**
     * The levels of categorical covariates (their indicators) held by fewer than {@link #RARE_LEVEL}
     * respondents: their coefficients rest mostly on the prior. An audit fitted a level of one
     * respondent without a word.
     */
    private static void rareLevels(List<String> warnings, Covariates covariates, String role) {
        List<String> names = new ArrayList<>();
        List<String> levels = new ArrayList<>();
        List<Integer> counts = new ArrayList<>();
        for (int j = 0; j < covariates.count(); j++) {
            if (!covariates.isIndicator(j)) {
                continue;
            }
            int n = 0;
            for (double v : covariates.column(j)) {
                n += v != 0 ? 1 : 0;
            }
            if (n < RARE_LEVEL) {
                names.add(role + "." + covariates.name(j));
                levels.add(covariates.name(j));
                counts.add(n);
            }
        }
        if (names.size() > MAX_NAMED) {
            List<String> named = new ArrayList<>();
            for (int r = 0; r < MAX_NAMED; r++) {
                named.add(names.get(r) + " " + counts.get(r));
            }
            warnings.add(names.size() + " levels of categorical " + role + " covariates have fewer than " + RARE_LEVEL
                    + " respondents (" + String.join(", ", named) + " and " + (names.size() - MAX_NAMED)
                    + " more); their coefficients rest mostly on the prior");
            return;
        }
        for (int r = 0; r < names.size(); r++) {
            warnings.add("only " + counts.get(r) + (counts.get(r) == 1 ? " respondent has " : " respondents have ")
                    + levels.get(r) + " (" + names.get(r) + "); its coefficient rests mostly on the prior");
        }
    }
}
