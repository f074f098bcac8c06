// The contrast–detail plot: per disc diameter the smallest contrast resolved, for this sampling and
// method and for full sampling, as two stepped lines on log–log axes (SVG, no library: five points).
// Diameters where nothing is resolved sit on the top edge, marked "none".

const svgNs = 'http://www.w3.org/2000/svg';

function element(name, attributes, text) {
  const el = document.createElementNS(svgNs, name);
  for (const [key, value] of Object.entries(attributes)) el.setAttribute(key, String(value));
  if (text !== undefined) el.textContent = text;
  return el;
}

/** curve, fullySampled: [{ diameterPixels, smallestContrast | null }], largest diameter first. */
export function drawContrastDetail(container, curve, fullySampled) {
  const width = 320;
  const height = 200;
  const margin = { left: 46, right: 10, top: 12, bottom: 34 };
  const diameters = curve.map((p) => p.diameterPixels);
  const contrasts = [0.025, 0.05, 0.1, 0.2, 0.4];
  const [dMin, dMax] = [Math.min(...diameters) / 1.3, Math.max(...diameters) * 1.3];
  const [cMin, cMax] = [0.02, 0.6];
  const x = (d) =>
    margin.left +
    ((Math.log(d) - Math.log(dMin)) / (Math.log(dMax) - Math.log(dMin))) *
      (width - margin.left - margin.right);
  const y = (c) =>
    margin.top +
    ((Math.log(cMax) - Math.log(c)) / (Math.log(cMax) - Math.log(cMin))) *
      (height - margin.top - margin.bottom);
  const svg = element('svg', { viewBox: `0 0 ${width} ${height}`, width: '100%', class: 'cd-plot' });
  for (const c of contrasts) {
    svg.append(
      element('line', { x1: margin.left, x2: width - margin.right, y1: y(c), y2: y(c), stroke: '#ece8dd' }),
    );
    svg.append(
      element(
        'text',
        { x: margin.left - 4, y: y(c) + 3, 'text-anchor': 'end', 'font-size': 9 },
        `${c * 100}%`,
      ),
    );
  }
  for (const d of diameters) {
    svg.append(
      element(
        'text',
        { x: x(d), y: height - margin.bottom + 12, 'text-anchor': 'middle', 'font-size': 9 },
        d.toFixed(1),
      ),
    );
  }
  svg.append(
    element(
      'text',
      { x: (margin.left + width) / 2, y: height - 4, 'text-anchor': 'middle', 'font-size': 10 },
      'disc diameter (px)',
    ),
  );
  const series = [
    { points: fullySampled, colour: '#55656a', dash: '5 3', name: 'full' },
    { points: curve, colour: '#0072B2', dash: '', name: 'this' },
  ];
  for (const { points, colour, dash, name } of series) {
    const placed = points.map((p) => ({ ...p, px: x(p.diameterPixels), py: y(p.smallestContrast ?? cMax) }));
    svg.append(
      element('polyline', {
        points: placed.map((p) => `${p.px},${p.py}`).join(' '),
        fill: 'none',
        stroke: colour,
        'stroke-width': 2,
        'stroke-dasharray': dash,
      }),
    );
    for (const p of placed) {
      const dot = element('circle', {
        cx: p.px,
        cy: p.py,
        r: 3.5,
        fill: p.smallestContrast === null ? 'white' : colour,
        stroke: colour,
      });
      dot.dataset.series = name;
      dot.dataset.value = p.smallestContrast === null ? 'none' : String(p.smallestContrast);
      svg.append(dot);
    }
  }
  svg.append(
    element(
      'text',
      { x: width - margin.right, y: margin.top + 8, 'text-anchor': 'end', 'font-size': 9, fill: '#0072B2' },
      '— this sampling',
    ),
  );
  svg.append(
    element(
      'text',
      { x: width - margin.right, y: margin.top + 20, 'text-anchor': 'end', 'font-size': 9, fill: '#55656a' },
      '- - full sampling',
    ),
  );
  container.replaceChildren(svg);
}
