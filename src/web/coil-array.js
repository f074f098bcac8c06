// The receive-array picker of the setup (docs/design.md §3.8, §4.3): uniform, loops or Gaussian
// profiles on a ring, or uploaded maps by id. It builds the `coils` request piece and draws where the
// coils sit around the phantom frame's field of view, computed here from the same definitions.

import { byId } from './dom.js';

const svgNs = 'http://www.w3.org/2000/svg';

/** Ids of the picker's controls, in the order the address restores them (the array first). */
export const coilControls = [
  'coilArray',
  'coilCount',
  'coilLoopRadius',
  'coilWidth',
  'coilRingRadius',
  'coilCorrelation',
  'coilTilt',
  'coilMapsId',
];

function numberOf(id) {
  const raw = byId(id).value.trim();
  return raw === '' ? undefined : Number(raw);
}

/** The `coils` piece of the current controls; blank optional fields are left out (service defaults). */
export function coilSpec() {
  const array = byId('coilArray').value;
  if (array === 'maps') return { mapsId: byId('coilMapsId').value.trim() };
  if (array !== 'loops' && array !== 'gaussian') return { array: 'uniform' };
  // Both ring arrays: count, their own size (loop radius or profile width), ring radius, ρ.
  const spec = { array, count: numberOf('coilCount') };
  if (array === 'loops') spec.loopRadius = numberOf('coilLoopRadius');
  else spec.width = numberOf('coilWidth');
  spec.ringRadius = numberOf('coilRingRadius');
  const correlation = numberOf('coilCorrelation');
  if (correlation !== undefined) spec.correlation = correlation;
  const tiltDeg = numberOf('coilTilt');
  if (array === 'loops' && tiltDeg !== undefined) spec.tiltDeg = tiltDeg;
  return spec;
}

export function isUniform(spec) {
  return spec.array === 'uniform';
}

/**
 * The plan's `coilArrays`: the setup's array first (the reference row uses the first), then the
 * uniform single coil when asked for and not already the setup's.
 */
export function planCoilArrays(setupSpec, compareUniform) {
  const arrays = [setupSpec];
  if (compareUniform && !isUniform(setupSpec)) arrays.push({ array: 'uniform' });
  return arrays;
}

/** The short name the service gives an array in tables ("uniform", "8 loops", "maps <id>"). */
export function coilLabel(spec) {
  if ('mapsId' in spec) return `maps ${spec.mapsId}`;
  if (spec.array === 'uniform') return 'uniform';
  return `${spec.count} ${spec.array}`;
}

/**
 * Where the coils sit (phantom frame, y up): coil c at angle 90° + 360°·c/C counter-clockwise from +x
 * on a circle of radius ringRadius (coil 0 at the top, as the service places them). A loop's plane
 * holds the image normal and the ring's tangent, so in the image plane it is seen edge-on: a segment
 * of length 2·loopRadius along the tangent (normal to the radius), centred on its ring point.
 */
export function coilGeometry(spec) {
  if (spec.array !== 'loops' && spec.array !== 'gaussian') return [];
  const count = spec.count;
  const ring = spec.ringRadius;
  if (!Number.isInteger(count) || count < 1 || count > 32 || !(ring >= 0)) return [];
  return Array.from({ length: count }, (_, c) => {
    const phi = ((90 + (360 * c) / count) * Math.PI) / 180;
    const x = ring * Math.cos(phi);
    const y = ring * Math.sin(phi);
    // Tangent of the ring at φ: the in-plane direction of the loop's plane (normal to the radius).
    const tx = -Math.sin(phi);
    const ty = Math.cos(phi);
    return { x, y, tx, ty };
  });
}

function svgElement(name, attributes) {
  const element = document.createElementNS(svgNs, name);
  for (const [key, value] of Object.entries(attributes)) element.setAttribute(key, String(value));
  return element;
}

/** Rounds coordinates for the SVG text (the picture needs no more). */
const r4 = (v) => Number(v.toFixed(4));

/** Draws the field of view, the ring and each coil into `svg` (viewBox in phantom units, y flipped). */
export function drawCoilPicture(svg, spec) {
  const geometry = coilGeometry(spec);
  const a = spec.array === 'loops' ? (spec.loopRadius ?? 0) : 0;
  const width = spec.array === 'gaussian' ? (spec.width ?? 0) : 0;
  const ring = geometry.length ? spec.ringRadius : 0;
  const extent = 1.08 * Math.max(1, ring + Math.max(a, 0.2));
  svg.setAttribute('viewBox', `${-extent} ${-extent} ${2 * extent} ${2 * extent}`);
  const parts = [
    svgElement('rect', { class: 'coil-fov', x: -1, y: -1, width: 2, height: 2 }),
    svgElement('line', { class: 'coil-axis', x1: -1, y1: 0, x2: 1, y2: 0 }),
    svgElement('line', { class: 'coil-axis', x1: 0, y1: -1, x2: 0, y2: 1 }),
  ];
  if (geometry.length && ring > 0)
    parts.push(svgElement('circle', { class: 'coil-ring', cx: 0, cy: 0, r: ring }));
  geometry.forEach(({ x, y, tx, ty }, c) => {
    const title = svgElement('title', {});
    if (spec.array === 'loops') {
      const loop = svgElement('line', {
        class: 'coil-loop',
        x1: r4(x - a * tx),
        y1: r4(-(y - a * ty)),
        x2: r4(x + a * tx),
        y2: r4(-(y + a * ty)),
        'data-coil': c,
        'data-x': x,
        'data-y': y,
      });
      title.textContent = `loop ${c + 1}: centre (${x.toFixed(2)}, ${y.toFixed(2)}), diameter ${2 * a}`;
      loop.append(title);
      parts.push(loop);
    } else {
      const profile = svgElement('circle', {
        class: 'coil-profile',
        cx: r4(x),
        cy: r4(-y),
        r: width,
        'data-coil': c,
        'data-x': x,
        'data-y': y,
      });
      title.textContent = `profile ${c + 1}: centre (${x.toFixed(2)}, ${y.toFixed(2)}), σ ${width}`;
      profile.append(title);
      parts.push(profile, svgElement('circle', { class: 'coil-centre', cx: r4(x), cy: r4(-y), r: 0.035 }));
    }
  });
  if (geometry.length) {
    // Coil 1 (at the top) is numbered just outside the ring, so the montage's tile order can be read off.
    const { x, y } = geometry[0];
    const label = svgElement('text', { class: 'coil-first', x: r4(x), y: r4(-y - 0.1) });
    label.textContent = '1';
    parts.push(label);
  }
  svg.replaceChildren(...parts);
  svg.dataset.coils = String(geometry.length);
}

/** A sentence under the picture: what is drawn, or why nothing is. */
function pictureCaption(spec) {
  if ('mapsId' in spec) return 'Uploaded maps: the coil positions are not known to the page.';
  if (spec.array === 'uniform')
    return 'One coil with S = 1 over the field of view (the single-coil acquisition).';
  const drawn = coilGeometry(spec).length;
  if (!drawn) return 'Enter a coil count (1–32) and a ring radius to see the array.';
  if (spec.array === 'loops')
    return `${drawn} loops seen edge-on (each line a loop of diameter 2 × ${spec.loopRadius}), square = FOV [−1, 1]²${spec.tiltDeg ? `, axes tilted ${spec.tiltDeg}° out of the plane` : ''}.`;
  return `${drawn} Gaussian profiles: circles of radius σ = ${spec.width} on the ring; square = FOV [−1, 1]².`;
}

/** Wires the picker: shows the fields of the chosen array and redraws the picture on every edit. */
export class CoilPicker {
  constructor(form) {
    this.form = form;
    form.addEventListener('input', (event) => {
      if (coilControls.includes(event.target.id)) this.sync();
    });
    form.addEventListener('change', (event) => {
      if (coilControls.includes(event.target.id)) this.sync();
    });
    this.sync();
  }

  spec() {
    return coilSpec();
  }

  sync() {
    const array = byId('coilArray').value;
    for (const el of this.form.querySelectorAll('[data-coil-array]')) {
      el.hidden = !el.dataset.coilArray.split(' ').includes(array);
    }
    const spec = coilSpec();
    drawCoilPicture(byId('coilPicture'), spec);
    byId('coilPictureCaption').textContent = pictureCaption(spec);
    const compare = byId('planCompareUniform');
    if (compare) {
      byId('planSetupArrayLabel').textContent = coilLabel(spec);
      compare.disabled = isUniform(spec);
    }
  }
}
