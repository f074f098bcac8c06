/**
 * Independent numerical integration for the phantom tests: Gauss–Legendre rules (nodes by Newton's
 * iteration on the three-term Legendre recurrence, the textbook construction — common practice) and
 * the periodic trapezoidal rule. Neither uses anything from src/phantoms.
 */

export interface Rule {
  nodes: Float64Array;
  weights: Float64Array;
}

/** n-point Gauss–Legendre rule on [−1, 1]; exact for polynomials of degree ≤ 2n − 1. */
export function gaussLegendre(n: number): Rule {
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < Math.ceil(n / 2); i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let derivative = 0;
    for (let iter = 0; iter < 100; iter++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      // p1 = P_n(x), p0 = P_{n−1}(x); P_n′ = n(x P_n − P_{n−1})/(x² − 1).
      derivative = (n * (x * p1 - p0)) / (x * x - 1);
      const step = p1 / derivative;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    const w = 2 / ((1 - x * x) * derivative * derivative);
    nodes[i] = -x;
    nodes[n - 1 - i] = x;
    weights[i] = w;
    weights[n - 1 - i] = w;
  }
  return { nodes, weights };
}

/** The same rule mapped to [lo, hi]. */
export function gaussLegendreOn(n: number, lo: number, hi: number): Rule {
  const base = gaussLegendre(n);
  const half = 0.5 * (hi - lo);
  const mid = 0.5 * (hi + lo);
  return {
    nodes: base.nodes.map((t) => mid + half * t),
    weights: base.weights.map((w) => half * w),
  };
}

/**
 * ∫∫ e^(−i2π(kx·x + ky·y)) over an ellipse (centre x0, y0, semi-axes a, b, angle θ in radians), by the
 * map x = x0 + R(θ)(a·r·cos φ, b·r·sin φ) with area element a·b·r dr dφ: Gauss–Legendre in r,
 * periodic trapezoid in φ (spectrally accurate for this smooth periodic integrand).
 */
export function ellipseTransformByQuadrature(
  e: { x0: number; y0: number; a: number; b: number; theta: number },
  kx: number,
  ky: number,
  radialNodes = 48,
  angularNodes = 96,
): [number, number] {
  const rule = gaussLegendreOn(radialNodes, 0, 1);
  const c = Math.cos(e.theta);
  const s = Math.sin(e.theta);
  let re = 0;
  let im = 0;
  for (let m = 0; m < angularNodes; m++) {
    const phi = (2 * Math.PI * m) / angularNodes;
    const cp = Math.cos(phi);
    const sp = Math.sin(phi);
    for (let j = 0; j < radialNodes; j++) {
      const r = rule.nodes[j];
      const u = e.a * r * cp;
      const v = e.b * r * sp;
      const x = e.x0 + c * u - s * v;
      const y = e.y0 + s * u + c * v;
      const phase = -2 * Math.PI * (kx * x + ky * y);
      const w = rule.weights[j] * r;
      re += w * Math.cos(phase);
      im += w * Math.sin(phase);
    }
  }
  const scale = (e.a * e.b * 2 * Math.PI) / angularNodes;
  return [re * scale, im * scale];
}

/**
 * ∫∫ e^(−i2π(kx·x + ky·y)) over a rectangle (centre, full widths wx, wy, angle θ in radians), by
 * Gauss–Legendre in both local coordinates and the map x = x0 + R(θ)(u, v).
 */
export function rectangleTransformByQuadrature(
  r: { x0: number; y0: number; wx: number; wy: number; theta: number },
  kx: number,
  ky: number,
  nodes = 40,
): [number, number] {
  const ru = gaussLegendreOn(nodes, -r.wx / 2, r.wx / 2);
  const rv = gaussLegendreOn(nodes, -r.wy / 2, r.wy / 2);
  const c = Math.cos(r.theta);
  const s = Math.sin(r.theta);
  let re = 0;
  let im = 0;
  for (let i = 0; i < nodes; i++) {
    for (let j = 0; j < nodes; j++) {
      const u = ru.nodes[i];
      const v = rv.nodes[j];
      const x = r.x0 + c * u - s * v;
      const y = r.y0 + s * u + c * v;
      const phase = -2 * Math.PI * (kx * x + ky * y);
      const w = ru.weights[i] * rv.weights[j];
      re += w * Math.cos(phase);
      im += w * Math.sin(phase);
    }
  }
  return [re, im];
}
