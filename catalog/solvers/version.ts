/**
 * Bumped whenever a change to the solver can change its numbers (element, tolerances, step
 * control). Precomputed tables record the version they were made with, and a test fails when
 * the two differ, so a stale table cannot go unnoticed.
 */
export const SOLVER_VERSION = 2
