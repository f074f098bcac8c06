// The error map on a fixed colour scale. The service's error-map PNG is scaled to its own maximum,
// which it does not report, so two runs cannot be compared by eye. The reconstruction and reference
// PNGs share one grey scale (white = the reference maximum), so the page forms | |x̂| − |x| | from
// them, in units of the reference maximum, and colours it on a scale the user fixes.

/**
 * Anchors of the viridis colour map (van der Walt & Smith, matplotlib 2015; perceptually uniform,
 * readable in grey and by colour-blind viewers), at t = 0, 1/9, …, 1 (equal to Debian's
 * python3-matplotlib cm.viridis at those points, rounded to bytes); linear in between.
 */
const viridis = [
  [68, 1, 84],
  [72, 40, 120],
  [62, 73, 137],
  [49, 104, 142],
  [38, 130, 142],
  [31, 158, 137],
  [53, 183, 121],
  [110, 206, 88],
  [181, 222, 43],
  [253, 231, 37],
];

/** Colour of t ∈ [0, 1] (clamped), as [r, g, b] bytes. */
export function colourAt(t) {
  const x = Math.min(1, Math.max(0, t)) * (viridis.length - 1);
  const i = Math.min(viridis.length - 2, Math.floor(x));
  const f = x - i;
  const a = viridis[i];
  const b = viridis[i + 1];
  return [0, 1, 2].map((c) => Math.round(a[c] + f * (b[c] - a[c])));
}

/** 8-bit grey levels of a PNG blob (the red channel of its RGBA decode), with its size. */
async function greyLevels(blob) {
  const bitmap = await createImageBitmap(blob, { colorSpaceConversion: 'none', premultiplyAlpha: 'none' });
  const canvas = document.createElement('canvas');
  canvas.width = bitmap.width;
  canvas.height = bitmap.height;
  const ctx = canvas.getContext('2d', { willReadFrequently: true });
  ctx.drawImage(bitmap, 0, 0);
  bitmap.close();
  const rgba = ctx.getImageData(0, 0, canvas.width, canvas.height).data;
  const levels = new Uint8Array(canvas.width * canvas.height);
  for (let i = 0; i < levels.length; i++) levels[i] = rgba[4 * i];
  return { nx: canvas.width, ny: canvas.height, levels };
}

/**
 * |recon − reference| in grey levels (0…255 = 0…the reference maximum), its largest value, and how
 * many reconstruction pixels sit at white (clipped in the PNG: there the error is a lower bound).
 */
export async function errorLevels(reconstructionBlob, referenceBlob) {
  const [recon, ref] = await Promise.all([greyLevels(reconstructionBlob), greyLevels(referenceBlob)]);
  if (recon.nx !== ref.nx || recon.ny !== ref.ny)
    throw new Error('reconstruction and reference sizes differ');
  const diff = new Uint8Array(recon.levels.length);
  let max = 0;
  let clipped = 0;
  for (let i = 0; i < diff.length; i++) {
    const d = Math.abs(recon.levels[i] - ref.levels[i]);
    diff[i] = d;
    if (d > max) max = d;
    if (recon.levels[i] === 255 && ref.levels[i] < 255) clipped++;
  }
  return { nx: recon.nx, ny: recon.ny, diff, maxLevel: max, clipped };
}

/** The error image as a PNG blob, coloured on [0, scaleMax] × the reference maximum. */
export async function colouredErrorPng(errors, scaleMax) {
  const canvas = document.createElement('canvas');
  canvas.width = errors.nx;
  canvas.height = errors.ny;
  const ctx = canvas.getContext('2d');
  const image = ctx.createImageData(errors.nx, errors.ny);
  // One colour per grey level: a lookup table instead of a colour per pixel.
  const table = Array.from({ length: 256 }, (_, level) => colourAt(level / 255 / scaleMax));
  for (let i = 0; i < errors.diff.length; i++) {
    const [r, g, b] = table[errors.diff[i]];
    image.data[4 * i] = r;
    image.data[4 * i + 1] = g;
    image.data[4 * i + 2] = b;
    image.data[4 * i + 3] = 255;
  }
  ctx.putImageData(image, 0, 0);
  return new Promise((resolve, reject) =>
    canvas.toBlob((blob) => (blob ? resolve(blob) : reject(new Error('no PNG'))), 'image/png'),
  );
}

/** Paints the colour bar and writes its ticks (0, a quarter steps, the upper end). */
export function drawColourBar(canvas, ticks, scaleMax) {
  const ctx = canvas.getContext('2d');
  for (let x = 0; x < canvas.width; x++) {
    const [r, g, b] = colourAt(x / (canvas.width - 1));
    ctx.fillStyle = `rgb(${r}, ${g}, ${b})`;
    ctx.fillRect(x, 0, 1, canvas.height);
  }
  const values = [0, 0.25, 0.5, 0.75, 1].map((f) => f * scaleMax);
  ticks.replaceChildren(
    ...values.map((v, i) => {
      const span = document.createElement('span');
      span.textContent = i === values.length - 1 ? `≥ ${formatTick(v)}` : formatTick(v);
      span.dataset.value = String(v);
      return span;
    }),
  );
}

function formatTick(v) {
  return String(Number(v.toPrecision(3)));
}
