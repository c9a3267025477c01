package org.rungs.sampler;

import org.rungs.models.ParameterLayout;
import org.rungs.posteriors.Draws;

/**
 * What a fit produced.
 *
 * @param draws                kept draws of every named parameter; fewer iterations than asked when interrupted
 * @param layout               the parameter names and their positions
 * @param settings             the sampler settings used, with the seed actually used
 * @param seconds              wall-clock time of the sampling
 * @param thresholdAcceptance  per chain, the share of accepted threshold proposals while sampling
 * @param jointAcceptance      per chain, the share of accepted joint Hamiltonian proposals while
 *                             sampling; NaN when the model has no such step (plain ordered probit)
 * @param jointLeapfrogSteps   per chain, that step's mean leapfrog steps per trajectory while sampling; NaN likewise
 * @param jointWallShare       per chain, the share of its trajectories that stopped on a wall (a log
 *                             density of minus infinity: thresholds crossing, or far out) while
 *                             sampling; NaN likewise
 * @param latentStepsSkipped   per chain, the share of sampling sweeps in which the attractions spread
 *                             too wide for the latent-level steps ({@link BoundedRedrawSteps}); 0
 *                             without attraction
 * @param spreadMoves          per chain, which spreads {@link CollapsedSpreadUpdate} moved while
 *                             sampling ("threshold_sd", "style_sd", both comma-separated, or
 *                             "none"); null for a chain without that step (one group, or shared thresholds
 *                             without the coarse class)
 * @param interrupted          true when the run was stopped before all iterations were done
 */
public record FitResult(Draws draws, ParameterLayout layout, SamplerSettings settings, double seconds,
                        double[] thresholdAcceptance, double[] jointAcceptance, double[] jointLeapfrogSteps,
                        double[] jointWallShare, double[] latentStepsSkipped, String[] spreadMoves, boolean interrupted) {
}
