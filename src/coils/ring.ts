/**
 * Positions of coils spaced equally in angle on a ring (an ellipse with semi-axes rx along x and ry
 * along y) around the field-of-view centre, phantom frame (y up, angles counter-clockwise from +x).
 */
export interface RingPlacement {
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Angle of each coil on the ring, radians. */
  readonly angle: Float64Array;
}

export function ringPlacement(
  count: number,
  ringRadius: number | readonly [number, number],
  startAngleDeg: number,
): RingPlacement {
  const [rx, ry] = typeof ringRadius === 'number' ? [ringRadius, ringRadius] : ringRadius;
  const x = new Float64Array(count);
  const y = new Float64Array(count);
  const angle = new Float64Array(count);
  for (let c = 0; c < count; c++) {
    const phi = ((startAngleDeg + (360 * c) / count) * Math.PI) / 180;
    angle[c] = phi;
    x[c] = rx * Math.cos(phi);
    y[c] = ry * Math.sin(phi);
  }
  return { x, y, angle };
}
