package org.rungs.posteriors.report;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.rungs.posteriors.AtomicFiles;
import org.rungs.posteriors.LeaveOneOut;

/**
 * The fit report: one self-contained HTML file (inline CSS and SVG charts, no script, no link to
 * anything outside) written from the files of a fit folder alone, so that it can be mailed and
 * opened offline. It knows the folder's file formats, not the model's classes.
 */
public final class Report {
    /** File name of the report inside the fit folder. */
    public static final String FILE_NAME = "report.html";

    /** What the report shows for a fact that run.json does not hold. */
    static final String NOT_RECORDED = "unknown (not in run.json)";

    private static final String STYLE = """
            body{font-family:"DejaVu Sans",Helvetica,Arial,sans-serif;font-size:15px;line-height:1.45;color:#111;
            max-width:1180px;margin:0 auto;padding:16px 24px}
            h1{font-size:26px;margin:8px 0}h2{font-size:21px;border-bottom:2px solid #0072B2;padding-bottom:3px;margin-top:34px}
            h3{font-size:16px;margin:18px 0 6px}
            table{border-collapse:collapse;margin:6px 0 12px;font-size:13.5px}
            th,td{border-bottom:1px solid #ccc;padding:3px 8px;text-align:left;vertical-align:top}
            th{background:#f2f2f2}table.facts td:first-child{white-space:nowrap}table.facts:not(.headed) thead th{position:absolute;width:1px;height:1px;overflow:hidden;clip:rect(0 0 0 0);padding:0;border:0}table.num td+td{text-align:right;font-variant-numeric:tabular-nums}
            .int{color:#555}.note{color:#333;font-size:13.5px;max-width:900px}
            .alarm{background:#fde0cf;border-left:6px solid #D55E00;padding:10px 14px;font-weight:bold}
            .ok{background:#e0f1ea;border-left:6px solid #009E73;padding:10px 14px}
            .warn{background:#fff6d5;border-left:6px solid #E69F00;padding:8px 14px}
            svg{width:100%;height:auto;display:block}
            figure{margin:4px 0 10px;break-inside:avoid;page-break-inside:avoid}
            figcaption{font-size:13.5px;margin:2px 0;overflow-wrap:anywhere}
            .grid{display:grid;grid-template-columns:repeat(auto-fill,minmax(320px,1fr));gap:8px 18px}
            .two{display:grid;grid-template-columns:repeat(auto-fit,minmax(420px,1fr));gap:8px 22px}
            .two>*,.grid>*{min-width:0}table.facts td{overflow-wrap:anywhere}
            .scroll{max-height:1100px;overflow-y:auto;border:1px solid #eee;padding:4px}.scroll.short{max-height:620px}
            .legend .sw{display:inline-block;width:22px;height:12px;margin:0 4px 0 14px;vertical-align:middle}
            .legend .sw.line{height:0;border-top:2px solid}.legend .sw.dot{width:10px;height:10px;border-radius:50%}
            nav ol{columns:2;font-size:14px}code{font-size:13px}
            @media print{body{max-width:none;padding:0;font-size:11pt}.scroll{max-height:none;overflow:visible;border:0}
            nav{display:none}h2{break-after:avoid}}
            """;

    private Report() {
    }

    /**
     * Reads the fit folder and writes {@value #FILE_NAME} into it, atomically (a temporary file
     * in the same folder, then a rename).
     *
     * @return the path of the report
     * @throws IOException when run.json or summary.csv is missing or a file is malformed
     */
    public static Path write(Path fitDir) throws IOException {
        System.setProperty("java.awt.headless", "true");
        String html = render(FitFolder.read(fitDir));
        Path target = fitDir.resolve(FILE_NAME).toAbsolutePath();
        AtomicFiles.write(target, out -> out.write(html));
        return target;
    }

    static String render(FitFolder fit) {
        StringBuilder out = new StringBuilder(1 << 20);
        String file = fit.text("input.file", "(unknown file)");
        out.append("<h1>Fit report</h1>\n<p>Data: <code>").append(Html.escape(file)).append("</code>; finished ")
                .append(Html.escape(fit.text("finished", "(time not recorded)"))).append("; Rungs ")
                .append(Html.escape(fit.text("versions.rungs", "")))
                .append(".</p>\n");
        ConvergenceSection.Verdict verdict = ConvergenceSection.verdict(fit);
        out.append("<p id=\"verdict\" class=\"").append(ConvergenceSection.verdictClass(fit, verdict)).append("\">")
                .append(Html.escape(ConvergenceSection.verdictText(fit, verdict))).append("</p>\n");
        out.append("""
                <nav><ol><li><a href="#fitted">What was fitted</a></li><li><a href="#convergence">Convergence</a></li>
                <li><a href="#distributions">Rating distributions</a></li><li><a href="#means">Reported and intended means</a></li>
                <li><a href="#coarse">Coarse responders</a></li><li><a href="#attraction">Attraction to numbers</a></li>
                <li><a href="#coefficients">Effects of covariates</a></li><li><a href="#cautions">Cautions</a></li></ol></nav>
                """);
        writeFitted(fit, out);
        ConvergenceSection.write(fit, out);
        DistributionSection.write(fit, out);
        GroupSection.writeMeans(fit, out);
        GroupSection.writeCoarse(fit, out);
        AttractionSection.write(fit, out);
        CoefficientSection.write(fit, out);
        writeCautions(fit, out);
        SvgStyles.Result body = SvgStyles.extract(out.toString());
        Path name = Path.of(file).getFileName();
        return "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\n"
                + "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
                + "<title>Fit report: " + Html.escape(name == null ? file : name.toString()) + "</title>\n"
                + "<style>" + STYLE + body.css() + "</style></head><body>\n" + body.html() + "</body></html>\n";
    }

    private static void writeFitted(FitFolder fit, StringBuilder out) {
        out.append("<section id=\"fitted\"><h2>1. What was fitted</h2>\n<div class=\"two\"><div><h3>Data</h3>\n");
        Html.tableHead(out, "facts", List.of("fact", "value"));
        // a run.json without some of these (hand-made, or cut short) says so rather than show a guess
        Html.row(out, "file", "<code>" + Html.escape(fit.text("input.file", NOT_RECORDED)) + "</code>");
        Html.row(out, "SHA-256", "<code>" + Html.escape(fit.text("input.sha256", NOT_RECORDED)) + "</code>");
        Html.row(out, "scale", Html.escape(fit.text("input.scale", NOT_RECORDED)));
        Html.row(out, "groups", Html.escape(fit.text("input.groups", NOT_RECORDED)));
        Html.row(out, "rows read", Html.escape(fit.text("input.rows_read", NOT_RECORDED)));
        Html.row(out, "rows used", Html.escape(fit.text("input.rows_used", NOT_RECORDED)));
        Html.row(out, "rows excluded", Html.escape(fit.text("input.rows_excluded", NOT_RECORDED)));
        for (Map.Entry<String, Object> reason : fit.map("input.excluded_by_reason").entrySet()) {
            Html.row(out, "&nbsp;&nbsp;excluded: " + Html.escape(reason.getKey()), Html.escape(fit.text("input.excluded_by_reason."
                    + reason.getKey(), "")));
        }
        for (Map.Entry<String, Object> missing : fit.map("input.missing_by_column").entrySet()) {
            Html.row(out, "&nbsp;&nbsp;missing in <code>" + Html.escape(missing.getKey()) + "</code>",
                    Html.escape(fit.text("input.missing_by_column." + missing.getKey(), "")));
        }
        Html.tableEnd(out);
        out.append("</div><div><h3>Sampling</h3>\n");
        Html.tableHead(out, "facts", List.of("fact", "value"));
        Html.row(out, "chains", Html.escape(fit.text("sampler.chains", "")));
        Html.row(out, "warm-up per chain", Html.escape(fit.text("sampler.warmup", "")));
        Html.row(out, "draws per chain", Html.escape(fit.text("sampler.kept_draws", fit.text("sampler.draws", ""))));
        Html.row(out, "iterations per kept draw", Html.escape(fit.text("sampler.thin", "1")));
        Html.row(out, "seed", Html.escape(fit.text("sampler.seed", "")));
        double seconds = fit.number("sampler.seconds");
        Html.row(out, "time taken", Double.isFinite(seconds) ? duration(seconds) : "&ndash;");
        Html.row(out, "interrupted", fit.flag("sampler.interrupted") ? "<strong>yes</strong>" : "no");
        String joint = fit.text("sampler.joint_step_acceptance_per_chain", null);
        if (joint != null) {
            Html.row(out, "joint step: acceptance per chain", Html.escape(joint));
            Html.row(out, "joint step: leapfrog steps per chain", Html.escape(fit.text("sampler.joint_step_leapfrog_steps_per_chain", "")));
            Html.row(out, "joint step: stopped on a wall per chain", Html.escape(fit.text("sampler.joint_step_walls_per_chain", "")));
        }
        String spreads = fit.text("sampler.spread_moves_per_chain", null);
        if (spreads != null) {
            Html.row(out, "spreads moved with their deviations per chain", Html.escape(spreads));
        }
        Html.tableEnd(out);
        if (!fit.map("cross_validation").isEmpty()) {
            // rungs fit --cross-validate (CrossValidation in sampler); compare fits with rungs compare
            out.append("<h3>Leave-one-out predictive accuracy</h3>\n");
            Html.tableHead(out, "facts", List.of("fact", "value"));
            Html.row(out, "elpd_loo (se)", Html.escape(String.format(Locale.ROOT, "%,.1f (%.1f)",
                    fit.number("cross_validation.elpd_loo"), fit.number("cross_validation.elpd_loo_se"))));
            Html.row(out, "p_loo", Html.escape(String.format(Locale.ROOT, "%.1f", fit.number("cross_validation.p_loo"))));
            Html.row(out, String.format(Locale.ROOT, "respondents with Pareto k above %.1f", LeaveOneOut.RELIABLE_K),
                    Html.escape(String.format(Locale.ROOT, "%,.0f of %,.0f",
                    fit.number("cross_validation.pareto_k_bad") + fit.number("cross_validation.pareto_k_very_bad"),
                    fit.number("cross_validation.respondents"))));
            Html.tableEnd(out);
            crossValidationNote(fit, out);
        }
        out.append("</div></div>\n<h3>The model in plain words</h3>\n<ul>\n");
        for (String sentence : ModelWords.describe(fit)) {
            out.append("<li>").append(Html.escape(sentence)).append("</li>\n");
        }
        out.append("</ul>\n<h3>Priors</h3>\n");
        out.append("<p class=\"note\">What each parameter's values are believed to be before the data are seen, on the ")
                .append("model's inner scale: the latent level's unit is the standard deviation of the respondents' levels around ")
                .append("what their group and covariates predict, and a numeric covariate counts in its standard deviations. ")
                .append("normal(m, s) is a normal distribution with mean m and standard deviation s; half-normal(s) its half ")
                .append("above 0, for a spread. ")
                .append("Wide priors leave the estimates to the data; <code>--prior NAME=DIST</code> replaces one.</p>\n");
        Html.tableHead(out, "facts headed", List.of("parameter", "prior", "the prior of"));
        for (Map.Entry<String, Object> prior : fit.map("model.priors").entrySet()) {
            String meaning = ParameterNames.ofPrior(prior.getKey());
            Html.row(out, "<code>" + Html.escape(prior.getKey()) + "</code>", Html.escape(String.valueOf(prior.getValue())),
                    meaning == null ? "&ndash;" : Html.escape(meaning));
        }
        Html.tableEnd(out);
        List<Object> warnings = fit.list("warnings");
        if (!warnings.isEmpty()) {
            out.append("<h3>Warnings from the run</h3>\n<ul class=\"warn\">\n");
            for (Object warning : warnings) {
                out.append("<li>").append(Html.escape(String.valueOf(warning))).append("</li>\n");
            }
            out.append("</ul>\n");
        }
        out.append("</section>\n");
    }

    /**
     * elpd_loo, p_loo and Pareto k in plain words (Vehtari, Gelman & Gabry 2017; the k threshold,
     * and p_loo above the number of parameters as a sign of a misfit, from loo 2.5.1's glossary).
     */
    private static void crossValidationNote(FitFolder fit, StringBuilder out) {
        double parameters = fit.number("model.parameters");
        out.append("<p class=\"note\">elpd_loo is the expected log predictive density, estimated by leave-one-out ")
                .append("cross-validation with Pareto-smoothed importance sampling (PSIS-LOO; Vehtari, Gelman &amp; Gabry 2017): ")
                .append("the sum over respondents of the log of the probability the fit gives each one's rating when that ")
                .append("respondent is left out, so how well the model predicts answers it has not seen. Higher (nearer 0) is ")
                .append("better, but only between fits of the same ratings (the same file, rows, rating column and scale, as ")
                .append("<code>rungs compare</code> checks); a difference within about two of its standard errors (se) does ")
                .append("not tell two fits apart. p_loo is the effective number of parameters: how much the predictions lean ")
                .append("on the very answers they predict; in a fit that works it stays below the number of parameters")
                .append(Double.isFinite(parameters) ? String.format(Locale.ROOT, " (%,.0f in this model)", parameters) : "")
                .append(". Pareto k measures how much one respondent's own answer sways the fit: above ")
                .append(String.format(Locale.ROOT, "%.1f", LeaveOneOut.RELIABLE_K))
                .append(" the shortcut that spares refitting without that respondent is unreliable, and so is that ")
                .append("respondent's part of elpd_loo (cross_validation.csv gives each respondent's k). A few among thousands ")
                .append("change little; many make elpd_loo itself doubtful.</p>\n");
    }

    private static void writeCautions(FitFolder fit, StringBuilder out) {
        out.append("<section id=\"cautions\"><h2>8. Cautions</h2>\n<ul>\n");
        for (String sentence : ModelWords.cautions(fit)) {
            out.append("<li>").append(Html.escape(sentence)).append("</li>\n");
        }
        out.append("</ul></section>\n");
    }

    private static String duration(double seconds) {
        if (seconds < 90) {
            return String.format(Locale.ROOT, "%.1f s", seconds);
        }
        long whole = Math.round(seconds);
        return String.format(Locale.ROOT, "%d min %02d s", whole / 60, whole % 60);
    }
}
