package org.rungs.examples;

import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.IntFunction;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.Summaries;
import org.rungs.sampler.FitResult;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.ProgressListener;
import org.rungs.sampler.SamplerSettings;

/**
 * A rerunnable speed and memory benchmark on invented surveys of 50 groups, 4 numeric level
 * covariates, scale 0..10 and by-group thresholds: nanoseconds per respondent per sweep on one
 * core, bulk ESS per second, and heap bytes per respondent.
 */
public final class Benchmark {

    /** Groups of the benchmark surveys. */
    public static final int GROUPS = 50;

    /** Bytes a survey holds per respondent: 1 category + 4 group + 8 per level covariate. */
    public static final int COLUMN_BYTES = 1 + 4 + 8 * 4;

    /** Threshold spacing before centring, as in the demo (gaps widen towards the top). */
    private static final double[] RAW_THRESHOLDS = {-2.5, -2.1, -1.7, -1.25, -0.8, -0.25, 0.3, 0.9, 1.55, 2.15};

    /** Sweeps of the untimed fit that lets the just-in-time compiler settle first. */
    private static final int JIT_SWEEPS = 400;

    /** Respondents of the untimed fit. */
    private static final int JIT_RESPONDENTS = 20_000;

    /**
     * @param sizes     numbers of respondents to time
     * @param sweeps    sweeps (warm-up + kept, half each) at the largest size; smaller sizes run
     *                  proportionally more, so every size does the same work
     * @param seed      seed of the data and of the sampler
     * @param essSizes  sizes of the bulk-ESS fits (2 chains on 2 threads)
     * @param essWarmup warm-up iterations per chain of the ESS fits
     * @param essDraws  kept iterations per chain of the ESS fits
     * @param models    the models whose speed is timed
     */
    public record Settings(int[] sizes, int sweeps, long seed, int[] essSizes, int essWarmup, int essDraws,
                           Set<Model> models) {
        public Settings {
            sizes = sizes.clone();
            essSizes = essSizes.clone();
            models = Set.copyOf(models);
            if (sizes.length == 0 || Arrays.stream(sizes).anyMatch(n -> n < GROUPS)
                    || Arrays.stream(essSizes).anyMatch(n -> n < GROUPS)) {
                throw new IllegalArgumentException("every size needs at least " + GROUPS + " respondents");
            }
            if (sweeps < 2 || essWarmup < 0 || essDraws < 10) {
                throw new IllegalArgumentException("need sweeps >= 2, ESS warm-up >= 0 and ESS draws >= 10");
            }
        }

        @Override
        public int[] sizes() {
            return sizes.clone();
        }

        @Override
        public int[] essSizes() {
            return essSizes.clone();
        }
    }

    /**
     * The models timed: the plain ordered probit, with the coarse class (half the sweeps), the
     * complete model with attraction too (a quarter of the sweeps), and that model with education
     * as the coarse class's covariate (a quarter of the sweeps).
     */
    public enum Model {
        PLAIN(1), COARSE(2), COMPLETE(4), EDUCATION(4);

        /** The largest size runs {@code sweeps / divisor} sweeps of this model. */
        final int divisor;

        Model(int divisor) {
            this.divisor = divisor;
        }
    }

    private Benchmark() {
    }

    /** The invented scenario: groups g01..g50 sharing {@code respondents} as evenly as possible. */
    public static Scenario scenario(int respondents, long seed) {
        List<Scenario.Group> groups = new ArrayList<>();
        for (int g = 0; g < GROUPS; g++) {
            int size = respondents / GROUPS + (g < respondents % GROUPS ? 1 : 0);
            groups.add(new Scenario.Group(String.format(Locale.ROOT, "g%02d", g + 1), size));
        }
        List<Scenario.LevelCovariate> covariates = List.of(
                new Scenario.LevelCovariate("income", new CovariateDistribution.LogNormal(2.8, 0.5), 0.12, 2),
                new Scenario.LevelCovariate("age", new CovariateDistribution.TruncatedNormal(48, 17, 18, 90), -0.004, 0),
                new Scenario.LevelCovariate("household", new CovariateDistribution.Uniform(1, 6), 0.05, 0),
                new Scenario.LevelCovariate("commute", new CovariateDistribution.Uniform(0, 90), -0.003, 0));
        return new Scenario(new Scenario.Scale(0, 10), groups, covariates,
                new Scenario.GroupLevels.Drawn(0.9, 0.4), Scenario.centred(RAW_THRESHOLDS),
                new Scenario.ThresholdDeviations.Drawn(0.15), seed);
    }

    /** The same scenario with a coarse class of about a quarter of the respondents (MODEL.md 4a). */
    public static Scenario coarseScenario(int respondents, long seed) {
        Scenario plain = scenario(respondents, seed);
        return new Scenario(plain.scale(), plain.groups(), plain.levelCovariates(), plain.groupLevels(), plain.thresholds(),
                plain.thresholdDeviations(),
                new Scenario.StyleClasses.Coarse(List.of(), new Scenario.GroupLevels.Drawn(-0.67, 0.2)),
                Scenario.NumberAttraction.none(), seed);
    }

    /**
     * The coarse scenario with number attraction on every number but the coarse points (MODEL.md
     * 4b): 7 liked, 3 avoided, group deviations of sd 0.1.
     */
    public static Scenario fullScenario(int respondents, long seed) {
        Scenario coarse = coarseScenario(respondents, seed);
        return new Scenario(coarse.scale(), coarse.groups(), coarse.levelCovariates(), coarse.groupLevels(), coarse.thresholds(),
                coarse.thresholdDeviations(), coarse.styleClasses(),
                new Scenario.NumberAttraction.Active(new double[] {0, 0, -0.3, 0, 0, 0.4, 0, 0},
                        new Scenario.AttractionDeviations.Drawn(0.1)), seed);
    }

    /**
     * The full scenario with the coarse class driven by education, a categorical style covariate
     * of three levels (the demo's shares and effects; probit intercept -0.2, so about 23% coarse).
     */
    public static Scenario educationScenario(int respondents, long seed) {
        Scenario full = fullScenario(respondents, seed);
        return new Scenario(full.scale(), full.groups(), full.levelCovariates(), full.groupLevels(), full.thresholds(),
                full.thresholdDeviations(),
                new Scenario.StyleClasses.Coarse(List.of(DemoScenario.EDUCATION), new Scenario.GroupLevels.Drawn(-0.2, 0.2)),
                full.attraction(), seed);
    }

    /** A simulated survey of {@code respondents}, in the simulator's row order (sorted by group only). */
    public static Survey survey(int respondents, long seed) {
        return survey(scenario(respondents, seed), seed);
    }

    static Survey survey(Scenario scenario, long seed) {
        SimulatedSurvey data = Simulator.simulate(scenario, seed);
        int[] rating = data.rating();
        byte[] category = new byte[rating.length];
        for (int i = 0; i < rating.length; i++) {
            category[i] = (byte) (rating[i] - data.scenario().scale().lowest());
        }
        List<double[]> columns = new ArrayList<>();
        for (String name : data.covariateNames()) {
            columns.add(data.covariate(name));
        }
        return Survey.of(new Scale(0, 10), category, data.group(), data.groupLabels(),
                Covariates.fromNumeric(data.covariateNames(), columns), styleCovariates(data), null);
    }

    /** The survey's categorical style covariates, each with the simulator's reference level. */
    private static Covariates styleCovariates(SimulatedSurvey data) {
        Covariates.Builder style = Covariates.builder();
        for (String name : data.styleCovariateNames()) {
            String[] labels = data.category(name);
            List<String> levels = new ArrayList<>(new LinkedHashSet<>(Arrays.asList(labels)));
            int[] codes = new int[labels.length];
            for (int i = 0; i < labels.length; i++) {
                codes[i] = levels.indexOf(labels[i]);
            }
            style.categorical(name, codes, levels, data.referenceLevels().get(name));
        }
        return style.build();
    }

    /**
     * One timed single-chain, single-thread fit: all its sweeps, and separately its sampling sweeps
     * (after warm-up and the one-off fitting of the joint step's metric), with the joint step's
     * acceptance, mean leapfrog steps per trajectory and share of trajectories stopped on a wall
     * while sampling (NaN when the model has no joint step).
     */
    public record Timing(int respondents, int sweeps, double seconds, int samplingSweeps, double samplingSeconds,
                         double jointAcceptance, double jointLeapfrogSteps, double jointWallShare) {
        public double nanosPerRespondentSweep() {
            return seconds * 1e9 / ((double) respondents * sweeps);
        }

        public double samplingNanosPerRespondentSweep() {
            return samplingSeconds * 1e9 / ((double) respondents * samplingSweeps);
        }
    }

    /** One two-chain fit and its bulk ESS over all parameters (constant ones left out). */
    public record Ess(int respondents, int chains, int warmup, int draws, double seconds,
                      double minimum, String minimumParameter, double median) {
    }

    /** Heap growth per respondent: the survey alone, and during a fit (draws of one iteration only). */
    public record Memory(int respondents, double surveyBytes, double fitBytes, double sortedFitBytes) {
    }

    /** Runs every measurement, logging progress to {@code log}, and returns the Markdown report. */
    public static String run(Settings settings, PrintStream log) {
        ModelSpec model = ModelSpec.defaults();
        log.println("benchmark: untimed fit to let the compiler settle");
        fit(survey(JIT_RESPONDENTS, settings.seed()), model, new SamplerSettings(1, JIT_SWEEPS / 2, JIT_SWEEPS / 2, settings.seed(), 1));

        Set<Model> models = settings.models();
        List<Timing> timings = models.contains(Model.PLAIN)
                ? timings("", settings, n -> scenario(n, settings.seed()), model, Model.PLAIN, log) : List.of();
        ModelSpec coarseModel = model.withStyleClasses(StyleClasses.coarse(null));
        List<Timing> coarseTimings = models.contains(Model.COARSE)
                ? timings("coarse class, ", settings, n -> coarseScenario(n, settings.seed()), coarseModel, Model.COARSE, log)
                : List.of();
        List<Timing> fullTimings = models.contains(Model.COMPLETE)
                ? timings("coarse class and attraction, ", settings, n -> fullScenario(n, settings.seed()),
                        coarseModel.withAttraction(NumberAttraction.besidesCoarsePoints()), Model.COMPLETE, log)
                : List.of();
        List<Timing> educationTimings = models.contains(Model.EDUCATION)
                ? timings("complete model with education, ", settings, n -> educationScenario(n, settings.seed()),
                        coarseModel.withAttraction(NumberAttraction.besidesCoarsePoints()), Model.EDUCATION, log)
                : List.of();

        List<Ess> ess = new ArrayList<>();
        for (int n : settings.essSizes()) {
            SamplerSettings s = new SamplerSettings(2, settings.essWarmup(), settings.essDraws(), settings.seed(), 2);
            FitResult result = fit(survey(n, settings.seed()), model, s);
            Ess e = ess(n, s, result);
            ess.add(e);
            log.printf(Locale.ROOT, "benchmark: ESS fit of %,d respondents, %.1f s, minimum bulk ESS %.0f (%s)%n",
                    n, e.seconds(), e.minimum(), e.minimumParameter());
        }

        List<Memory> memory = new ArrayList<>();
        for (int n : settings.sizes()) {
            Memory m = memory(n, settings.seed(), model);
            memory.add(m);
            log.printf(Locale.ROOT, "benchmark: memory at %,d respondents: survey %.1f, fit %.1f bytes per respondent%n",
                    n, m.surveyBytes(), m.fitBytes());
        }
        return markdown(settings, timings, coarseTimings, fullTimings, educationTimings, ess, memory);
    }

    /**
     * Single-chain, single-thread fits of each size; the largest runs {@code settings.sweeps() /
     * divisor} sweeps and smaller ones proportionally more, so each size takes about as long.
     */
    private static List<Timing> timings(String label, Settings settings, IntFunction<Scenario> scenario, ModelSpec model,
                                        Model timed, PrintStream log) {
        int largest = Arrays.stream(settings.sizes()).max().orElseThrow();
        List<Timing> timings = new ArrayList<>();
        for (int n : settings.sizes()) {
            int sweeps = (int) Math.max(2, Math.round((double) settings.sweeps() * largest / n / timed.divisor));
            Survey survey = survey(scenario.apply(n), settings.seed());
            long[] samplingFrom = {0};
            ProgressListener clock = (chain, done, total, warmingUp) -> {
                if (done == sweeps / 2) {
                    samplingFrom[0] = System.nanoTime();
                }
            };
            FitResult result = Fitter.fit(survey, model, new SamplerSettings(1, sweeps / 2, sweeps - sweeps / 2, settings.seed(), 1),
                    clock, new AtomicBoolean());
            double sampling = (System.nanoTime() - samplingFrom[0]) / 1e9;
            Timing t = new Timing(n, sweeps, result.seconds(), sweeps - sweeps / 2, sampling, result.jointAcceptance()[0],
                    result.jointLeapfrogSteps()[0], result.jointWallShare()[0]);
            timings.add(t);
            log.printf(Locale.ROOT, "benchmark: %s%,d respondents, %d sweeps, %.1f s, %.1f ns per respondent per sweep"
                    + " (sampling sweeps %.1f), joint step acceptance %.2f, leapfrog steps %.2f, walls %.2f%n",
                    label, n, sweeps, t.seconds(), t.nanosPerRespondentSweep(), t.samplingNanosPerRespondentSweep(),
                    t.jointAcceptance(), t.jointLeapfrogSteps(), t.jointWallShare());
        }
        return timings;
    }

    private static void timingTable(StringBuilder sb, List<Timing> timings) {
        sb.append("| respondents | sweeps | seconds | ns per respondent per sweep | the same over the sampling sweeps"
                + " | joint step acceptance | its leapfrog steps | its walls | time per sweep vs previous size |\n");
        sb.append("|---:|---:|---:|---:|---:|---:|---:|---:|---:|\n");
        Timing previous = null;
        for (Timing t : timings) {
            String ratio = "";
            if (previous != null) {
                double perSweep = t.seconds() / t.sweeps();
                double previousPerSweep = previous.seconds() / previous.sweeps();
                ratio = String.format(Locale.ROOT, "%.2fx for %.0fx respondents", perSweep / previousPerSweep,
                        (double) t.respondents() / previous.respondents());
            }
            sb.append(String.format(Locale.ROOT, "| %,d | %d | %.1f | %.1f | %.1f | %s | %s | %s | %s |%n", t.respondents(),
                    t.sweeps(), t.seconds(), t.nanosPerRespondentSweep(), t.samplingNanosPerRespondentSweep(),
                    cell(t.jointAcceptance()), cell(t.jointLeapfrogSteps()), cell(t.jointWallShare()), ratio));
            previous = t;
        }
    }

    /** A table cell with two decimals, or "-" for NaN (no joint step). */
    private static String cell(double v) {
        return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.2f", v);
    }

    /** Writes {@code text} to {@code file}. */
    public static void write(Path file, String text) throws IOException {
        Files.writeString(file, text, StandardCharsets.UTF_8);
    }

    private static FitResult fit(Survey survey, ModelSpec model, SamplerSettings settings) {
        return Fitter.fit(survey, model, settings, ProgressListener.NONE, new AtomicBoolean());
    }

    private static Ess ess(int n, SamplerSettings s, FitResult result) {
        List<ParameterSummary> summaries = Summaries.of(result.draws());
        double[] bulk = summaries.stream().mapToDouble(ParameterSummary::essBulk).filter(Double::isFinite).sorted().toArray();
        ParameterSummary lowest = summaries.stream().filter(p -> Double.isFinite(p.essBulk()))
                .min((a, b) -> Double.compare(a.essBulk(), b.essBulk())).orElseThrow();
        double median = bulk.length % 2 == 1 ? bulk[bulk.length / 2] : (bulk[bulk.length / 2 - 1] + bulk[bulk.length / 2]) / 2;
        return new Ess(n, s.chains(), s.warmup(), s.draws(), result.seconds(), lowest.essBulk(), lowest.name(), median);
    }

    /**
     * Heap in use after garbage collection, before and after building the survey, and while the
     * first iteration of a one-chain fit holds its state (one kept draw, so the draws store is
     * negligible). The fit is measured twice: given the survey in the simulator's row order, of
     * which the sampler keeps a copy in group-and-category order while the caller keeps the
     * original; and as {@code rungs fit} does it, sorting once ({@link Fitter#sorted}) and keeping
     * only the sorted survey.
     */
    private static Memory memory(int n, long seed, ModelSpec model) {
        long before = usedHeap();
        Survey survey = survey(n, seed);
        long built = usedHeap();
        long during = heapDuringFit(survey, model, seed);
        Survey sorted = Fitter.sorted(survey);
        survey = null;
        long sortedBuilt = usedHeap();
        long sortedDuring = heapDuringFit(sorted, model, seed);
        return new Memory(n, (double) (built - before) / n, (double) (during - before) / n,
                (double) (sortedDuring - sortedBuilt + built - before) / n);
    }

    private static long heapDuringFit(Survey survey, ModelSpec model, long seed) {
        long[] used = new long[1];
        ProgressListener measure = (chain, done, total, warmingUp) -> {
            if (done == 1) {
                used[0] = usedHeap();
            }
        };
        Fitter.fit(survey, model, new SamplerSettings(1, 1, 1, seed, 1), measure, new AtomicBoolean());
        return used[0];
    }

    /** Used heap after a few collections; the smallest of the readings. */
    private static long usedHeap() {
        Runtime rt = Runtime.getRuntime();
        long least = Long.MAX_VALUE;
        for (int k = 0; k < 4; k++) {
            System.gc();
            try {
                Thread.sleep(50);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
            least = Math.min(least, rt.totalMemory() - rt.freeMemory());
        }
        return least;
    }

    /** Processors, Java version, architecture and, where /proc/cpuinfo exists, the CPU model. */
    public static String machine() {
        String cpu = "unknown";
        Path info = Path.of("/proc/cpuinfo");
        if (Files.isReadable(info)) {
            try {
                cpu = Files.readAllLines(info).stream().filter(l -> l.startsWith("model name"))
                        .map(l -> l.substring(l.indexOf(':') + 1).trim()).findFirst().orElse(cpu);
            } catch (IOException e) {
                cpu = "unreadable";
            }
        }
        return String.format(Locale.ROOT, "%d processors available to the JVM; CPU %s; Java %s (%s); %s %s; max heap %d MiB",
                Runtime.getRuntime().availableProcessors(), cpu, System.getProperty("java.version"),
                System.getProperty("java.vm.name"), System.getProperty("os.name"), System.getProperty("os.arch"),
                Runtime.getRuntime().maxMemory() >> 20);
    }

    private static String markdown(Settings settings, List<Timing> timings, List<Timing> coarseTimings,
                                   List<Timing> fullTimings, List<Timing> educationTimings, List<Ess> ess, List<Memory> memory) {
        StringBuilder sb = new StringBuilder();
        sb.append("Machine: ").append(machine()).append("\n\n");
        sb.append(String.format(Locale.ROOT, "Survey: %d groups, 4 numeric level covariates, scale 0..10, by-group thresholds, seed %d.%n%n",
                GROUPS, settings.seed()));
        sb.append("Speed: 1 chain on 1 thread, half warm-up and half kept sweeps; time is the sampler's wall clock.\n");
        if (!timings.isEmpty()) {
            sb.append("\nSpeed of the plain ordered probit (style classes off).\n\n");
            timingTable(sb, timings);
        }
        if (!coarseTimings.isEmpty()) {
            sb.append("\nSpeed with the coarse class on (a quarter of the respondents coarse, intercept-only class probit).\n\n");
            timingTable(sb, coarseTimings);
        }
        if (!fullTimings.isEmpty()) {
            sb.append("\nSpeed of the complete model: the coarse class and number attraction on every number but the coarse points "
                    + "(7 liked, 3 avoided).\n\n");
            timingTable(sb, fullTimings);
        }
        if (!educationTimings.isEmpty()) {
            sb.append("\nSpeed of the complete model with education (three levels: 25% basic, 45% secondary, 30% tertiary) "
                    + "as the coarse class's covariate, about 23% coarse.\n\n");
            timingTable(sb, educationTimings);
        }
        if (!ess.isEmpty()) {
            sb.append("\nBulk ESS per second: 2 chains on 2 threads, seconds are wall clock; ESS over all parameters.\n\n");
            sb.append("| respondents | warm-up + kept per chain | seconds | min bulk ESS (parameter) | median bulk ESS | min ESS/s | median ESS/s |\n");
            sb.append("|---:|---:|---:|---:|---:|---:|---:|\n");
            for (Ess e : ess) {
                sb.append(String.format(Locale.ROOT, "| %,d | %d + %d | %.1f | %.0f (%s) | %.0f | %.1f | %.1f |%n",
                        e.respondents(), e.warmup(), e.draws(), e.seconds(), e.minimum(), e.minimumParameter(),
                        e.median(), e.minimum() / e.seconds(), e.median() / e.seconds()));
            }
        }
        sb.append(String.format(Locale.ROOT, "%nMemory: heap growth per respondent after garbage collection; the columns alone take %d bytes "
                + "(1 category + 4 group + 8 x 4 covariates). During a fit the draws hold one iteration.%n%n", COLUMN_BYTES));
        sb.append("| respondents | survey built | during a fit, caller keeping the survey in file order | during a fit as `rungs fit` runs it (sorted once, file order released) |\n");
        sb.append("|---:|---:|---:|---:|\n");
        for (Memory m : memory) {
            sb.append(String.format(Locale.ROOT, "| %,d | %.1f | %.1f | %.1f |%n", m.respondents(), m.surveyBytes(),
                    m.fitBytes(), m.sortedFitBytes()));
        }
        return sb.toString();
    }
}
