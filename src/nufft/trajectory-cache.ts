import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';

/**
 * Values derived from a trajectory (NUFFT plans, density weights), kept per trajectory object and
 * key. The trajectory is held weakly, so dropping it frees everything made from it.
 */
export class TrajectoryCache<Value> {
  private readonly byTrajectory = new WeakMap<Trajectory, Map<string, Value>>();

  /** The value for (trajectory, key), made by `make` on first use. */
  get(trajectory: Trajectory, key: string, make: () => Value): Value {
    let values = this.byTrajectory.get(trajectory);
    if (!values) {
      values = new Map();
      this.byTrajectory.set(trajectory, values);
    }
    let value = values.get(key);
    if (value === undefined) {
      value = make();
      values.set(key, value);
    }
    return value;
  }
}
