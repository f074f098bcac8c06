/**
 * The convergence stop of the iterative solvers: stop after iteration k when both
 *   ‖x_k − x_{k−1}‖ / ‖x_k‖ < tolerance   and   |Φ(x_k) − Φ(x_{k−1})| / |Φ(x_k)| < tolerance,
 * Φ the objective the solver minimises (common practice: a small step alone can be a slow stretch,
 * a flat objective alone can hide a moving iterate). The objective is only evaluated once the
 * iterate test passes, so solvers whose Φ costs a transform pay for it near the end only; a
 * tolerance of 0 never stops (the fixed iteration counts of paired runs and noise replicas).
 */
export class StoppingRule {
  private previous: number | undefined;
  /** The last relative change of the iterate. */
  relativeChange = Number.POSITIVE_INFINITY;
  /** The last relative change of the objective (∞ until it has been measured). */
  objectiveChange = Number.POSITIVE_INFINITY;

  constructor(readonly tolerance: number) {}

  /**
   * `objective()` gives Φ(x_k); `previousObjective()` Φ(x_{k−1}), asked only when the last call
   * did not measure Φ. Returns true when the solver should stop.
   */
  converged(relativeChange: number, objective: () => number, previousObjective: () => number): boolean {
    this.relativeChange = relativeChange;
    if (!(relativeChange < this.tolerance)) {
      this.previous = undefined;
      return false;
    }
    const before = this.previous ?? previousObjective();
    const now = objective();
    this.previous = now;
    const scale = Math.abs(now);
    this.objectiveChange = scale > 0 ? Math.abs(now - before) / scale : Math.abs(now - before);
    return this.objectiveChange < this.tolerance;
  }

  /** What a response's `info` reports about the stop. */
  report(iterationsRun: number, iterationLimit: number): ConvergenceReport {
    return {
      iterations: iterationsRun,
      iterationLimit,
      tolerance: this.tolerance,
      relativeChange: this.relativeChange,
      objectiveChange: this.objectiveChange,
      converged: this.relativeChange < this.tolerance && this.objectiveChange < this.tolerance,
    };
  }
}

export interface ConvergenceReport {
  /** Iterations run. */
  iterations: number;
  /** The cap (requested or default). */
  iterationLimit: number;
  tolerance: number;
  /** ‖x_k − x_{k−1}‖ / ‖x_k‖ at the last iteration. */
  relativeChange: number;
  /** |Φ_k − Φ_{k−1}| / |Φ_k| when last measured (∞ if the iterate test never passed). */
  objectiveChange: number;
  converged: boolean;
}
