import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';
import { ifft2c } from '../../src/core/centered-fft.ts';
import { type ComplexImage, magnitude } from '../../src/core/complex-image.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import { gridScale, phantomGridKspace, sheppLoganModified } from '../../src/phantoms/index.ts';

/**
 * The modified Shepp–Logan phantom at side², its exact k-space at trajectory points, and the two
 * references the gridding tests compare with: ifft2c of the analytic Cartesian k-space, and the
 * same with the k-space corners outside the inscribed disc zeroed (what a trajectory that stops
 * at kmax = side/2 can reach). Magnitudes, as the project's metrics compare.
 */
export function sheppLoganReferences(side: number) {
  const phantom = sheppLoganModified();
  const gridK = phantomGridKspace(phantom, side, side);
  const reference = real(ifft2c(gridK));
  const discK = { nx: side, ny: side, data: gridK.data.slice() };
  for (let v = 0; v < side; v++) {
    for (let u = 0; u < side; u++) {
      if (Math.hypot(u - side / 2, v - side / 2) > side / 2) {
        discK.data[2 * (v * side + u)] = 0;
        discK.data[2 * (v * side + u) + 1] = 0;
      }
    }
  }
  const discReference = real(ifft2c(discK));
  const inscribed = Uint8Array.from({ length: side * side }, (_, i) =>
    Math.hypot((i % side) - side / 2, Math.floor(i / side) - side / 2) <= side / 2 ? 1 : 0,
  );
  /** Exact k-space at the points (kspaceAt wants cycles per unit = cycles per FOV / 2), grid-scaled. */
  function samplesOf(t: Trajectory): Float64Array {
    const y = phantom.kspaceAt(
      t.kx.map((k) => k / 2),
      t.ky.map((k) => k / 2),
    );
    const scale = gridScale(side, side);
    for (let i = 0; i < y.length; i++) y[i] *= scale;
    return y;
  }
  return { reference, discReference, inscribed, samplesOf };
}

export function real(image: ComplexImage): RealImage {
  return { nx: image.nx, ny: image.ny, data: magnitude(image) };
}
