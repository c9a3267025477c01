package org.rungs.models.survey;

/**
 * A covariate set that cannot be built, split into what is wrong and what was expected so that
 * {@link SurveyReader} can restate it as a {@link SurveyInputException} about the file.
 */
final class CovariateProblem extends IllegalArgumentException {
    private static final long serialVersionUID = 1L;

    private final String column;
    private final String problem;
    private final String expected;

    CovariateProblem(String column, String problem, String expected) {
        super(problem + "; expected " + expected);
        this.column = column;
        this.problem = problem;
        this.expected = expected;
    }

    /** The source column concerned, or null when the problem involves several. */
    String column() {
        return column;
    }

    String problem() {
        return problem;
    }

    String expected() {
        return expected;
    }
}
