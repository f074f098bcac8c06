/** How far a plan is: finished cells, all cells, and an estimate of the time left. */
export interface PlanProgress {
  done: number;
  total: number;
  /**
   * Seconds to completion from this run's cell rate (wall time since the run started over the cells
   * it finished), to 0.1 s; null until the run has finished a cell.
   */
  etaSeconds: number | null;
}

/**
 * Measures one run of a plan. Cells finished by an earlier run (a plan resumed after a restart) count
 * as done but not towards the rate.
 */
export class ProgressClock {
  private readonly startedAt = performance.now();
  constructor(
    readonly total: number,
    private readonly doneAtStart = 0,
  ) {}

  at(done: number): PlanProgress {
    const ran = done - this.doneAtStart;
    if (ran <= 0) return { done, total: this.total, etaSeconds: null };
    const perCell = (performance.now() - this.startedAt) / 1000 / ran;
    return { done, total: this.total, etaSeconds: Math.round(perCell * (this.total - done) * 10) / 10 };
  }
}
