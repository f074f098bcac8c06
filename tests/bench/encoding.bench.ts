import { coilArrayMaps } from '../../src/coils/coil-array.ts';
import { analyticCoilKspace } from '../../src/coils/coil-kspace.ts';
import { senseGFactorMap } from '../../src/coils/sense-g-factor.ts';
import { fitTrigPolynomial } from '../../src/coils/trig-fit.ts';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { CartesianEncoding } from '../../src/encoding/cartesian-encoding.ts';
import { sheppLoganModified } from '../../src/phantoms/shepp-logan.ts';
import { type BenchRow, medianMs } from './timing.ts';

/**
 * The multi-coil encoding operator at 256² with 8 loop coils and every other row acquired: the normal
 * operator EᴴE against the 2 × 8 centred FFTs it contains (the rest is the sensitivity products,
 * the mask and the accumulation), then forward and adjoint alone, and the coil model's set-up costs.
 */
export async function benchEncoding(): Promise<BenchRow[]> {
  const n = 256;
  const coils = 8;
  const rng = new SeededRandom(5);
  const mask = new Uint8Array(n * n);
  for (let v = 0; v < n; v += 2) mask.fill(1, v * n, (v + 1) * n);
  const spec = { array: 'loops', count: coils, loopRadius: 0.35, ringRadius: 1.25 } as const;
  const maps = coilArrayMaps(spec, n, n);
  const op = new CartesianEncoding(n, n, mask, maps);
  const x = createComplexImage(n, n);
  for (let i = 0; i < x.data.length; i++) x.data[i] = rng.normal();
  const out = op.createImage();
  const data = op.createData();

  const normal = await medianMs(() => op.normal(x, out), 7);
  const image = createComplexImage(n, n);
  image.data.set(x.data);
  const ffts = await medianMs(() => {
    for (let c = 0; c < coils; c++) {
      fft2c(image, image);
      ifft2c(image, image);
    }
  }, 7);
  const forward = await medianMs(() => op.forward(x, data), 7);
  const adjoint = await medianMs(() => op.adjoint(data, out), 7);
  const mapsMs = await medianMs(() => coilArrayMaps(spec, n, n), 3, 1);
  const fit = fitTrigPolynomial(maps, { order: 6, periodFactor: 2 });
  const fitMs = await medianMs(() => fitTrigPolynomial(maps, { order: 6, periodFactor: 2 }), 3, 1);
  const phantom = sheppLoganModified();
  const kspaceMs = await medianMs(() => analyticCoilKspace(phantom, fit, n, n), 3, 1);
  const gMs = await medianMs(() => senseGFactorMap(maps, 4), 3, 1);
  return [
    {
      name: `EᴴE, ${coils} coils ${n}²`,
      medianMs: normal,
      note: `÷ 2×${coils} fft2c/ifft2c (${ffts.toFixed(1)} ms) = ${(normal / ffts).toFixed(2)}`,
    },
    { name: `E, ${coils} coils ${n}²`, medianMs: forward },
    { name: `Eᴴ, ${coils} coils ${n}²`, medianMs: adjoint },
    { name: `loop maps (Biot–Savart, 128 segments), ${coils} coils ${n}²`, medianMs: mapsMs },
    { name: `trigonometric fit, order 6, ${coils} coils ${n}²`, medianMs: fitMs },
    {
      name: `analytic coil k-space, Shepp–Logan, ${coils} coils ${n}²`,
      medianMs: kspaceMs,
      note: '169 harmonics, L = 2',
    },
    { name: `SENSE g-factor map, R = 4, ${coils} coils ${n}²`, medianMs: gMs },
  ];
}
