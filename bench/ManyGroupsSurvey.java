import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * Writes an invented survey of many small groups for bench/many-groups: region R000, R001, ...,
 * a 0..10 rating and an income-like covariate. A region's level is drawn around 6 (sd 0.7); a
 * respondent's latent level adds 0.3 x income and a normal of sd 1.8, rounded to the scale; three
 * in ten answer the nearest of 0, 5 and 10 instead. Run as a single-file program:
 *
 *   java bench/ManyGroupsSurvey.java OUT.csv GROUPS PER_GROUP SEED
 */
public final class ManyGroupsSurvey {
    public static void main(String[] args) throws IOException {
        Path out = Path.of(args[0]);
        int groups = Integer.parseInt(args[1]);
        int perGroup = Integer.parseInt(args[2]);
        SplittableRandom random = new SplittableRandom(Long.parseLong(args[3]));
        try (PrintWriter w = new PrintWriter(Files.newBufferedWriter(out, StandardCharsets.UTF_8))) {
            w.print("region,rating,income\n");
            for (int g = 0; g < groups; g++) {
                double level = 6 + 0.7 * random.nextGaussian();
                for (int i = 0; i < perGroup; i++) {
                    double income = random.nextGaussian();
                    double latent = level + 0.3 * income + 1.8 * random.nextGaussian();
                    long rating = Math.max(0, Math.min(10, Math.round(latent)));
                    if (random.nextDouble() < 0.3) {
                        rating = latent < 2.5 ? 0 : latent < 7.5 ? 5 : 10;
                    }
                    w.printf(Locale.ROOT, "R%03d,%d,%.3f%n", g, rating, income);
                }
            }
        }
    }
}
