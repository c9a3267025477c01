package org.rungs.sampler;

/**
 * One Gibbs or Metropolis step of a block of the model. Implementations hold their chain's
 * state, random source and workspace; {@link #update} allocates nothing.
 */
public interface Update {
    /**
     * Performs one step.
     *
     * @param adapt true during warm-up: proposal scales may adapt (Roberts & Rosenthal 2009);
     *              false while sampling, when every step leaves the posterior invariant.
     */
    void update(boolean adapt);
}
