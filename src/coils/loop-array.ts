import { type CoilMaps, createMultiCoilArray } from '../encoding/index.ts';
import { addLoopField, type CircularLoop } from './loop-field.ts';
import { pixelCoordinates } from './pixel-coordinates.ts';
import { ringPlacement } from './ring.ts';

export interface LoopArrayGeometry {
  count: number;
  /** Loop radius a, phantom units. */
  loopRadius: number;
  /** Distance of the loop centres from the FOV centre, or the ring's semi-axes [along x, along y]. */
  ringRadius: number | readonly [number, number];
  /** Each loop axis tipped out of the image plane by this angle (0: the axis points at the centre). */
  tiltDeg: number;
  /** Angle of coil 0 on the ring, counter-clockwise from +x. */
  startAngleDeg: number;
  /** Biot–Savart integration steps around each loop. */
  segments: number;
}

/**
 * The loops of a receive array: centre c on the ring (slice plane z = 0), in-plane direction towards
 * the FOV centre n = −c/|c|, axis = cos τ·n + sin τ·ẑ (τ the tilt), loop plane spanned by
 * u = ẑ × n (in the image plane, along the ring) and v = axis × u (ẑ when τ = 0). So with τ = 0 the
 * loop plane contains ẑ, normal to the image plane, and the axis points at the FOV centre.
 * Every loop carries its current the same way round (u → v), so a rotation of the array rotates its maps.
 */
export function arrayLoops(geometry: LoopArrayGeometry): CircularLoop[] {
  const ring = ringPlacement(geometry.count, geometry.ringRadius, geometry.startAngleDeg);
  const tau = (geometry.tiltDeg * Math.PI) / 180;
  const loops: CircularLoop[] = [];
  for (let c = 0; c < geometry.count; c++) {
    const cx = ring.x[c];
    const cy = ring.y[c];
    const r = Math.hypot(cx, cy);
    const nx = -cx / r;
    const ny = -cy / r;
    const axis: [number, number, number] = [Math.cos(tau) * nx, Math.cos(tau) * ny, Math.sin(tau)];
    const u: [number, number, number] = [-ny, nx, 0];
    const v: [number, number, number] = [
      axis[1] * u[2] - axis[2] * u[1],
      axis[2] * u[0] - axis[0] * u[2],
      axis[0] * u[1] - axis[1] * u[0],
    ];
    loops.push({ centre: [cx, cy, 0], u, v, radius: geometry.loopRadius });
  }
  return loops;
}

/**
 * Unnormalised receive sensitivities of the loops on the ny×nx grid of the slice z = 0:
 * S_c = B_x − i·B_y of loop c's quasi-static field (B0 along z, normal to the image), the transverse
 * field written as a complex number with the sign convention the project fixes for receive maps.
 */
export function loopArrayMaps(geometry: LoopArrayGeometry, nx: number, ny: number): CoilMaps {
  const n = nx * ny;
  const { x, y } = pixelCoordinates(nx, ny);
  const z = new Float64Array(n);
  const bx = new Float64Array(n);
  const by = new Float64Array(n);
  const bz = new Float64Array(n);
  const maps = createMultiCoilArray(geometry.count, nx, ny);
  arrayLoops(geometry).forEach((loop, c) => {
    bx.fill(0);
    by.fill(0);
    bz.fill(0);
    addLoopField(loop, geometry.segments, x, y, z, bx, by, bz);
    const base = 2 * c * n;
    for (let i = 0; i < n; i++) {
      maps.data[base + 2 * i] = bx[i];
      maps.data[base + 2 * i + 1] = -by[i];
    }
  });
  return maps;
}
