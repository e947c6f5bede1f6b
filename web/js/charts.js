// Small SVG charts drawn by hand: no library, text only through textContent.
const SVG = 'http://www.w3.org/2000/svg';

function el(tag, attrs) {
  const node = document.createElementNS(SVG, tag);
  for (const [k, v] of Object.entries(attrs)) node.setAttribute(k, String(v));
  return node;
}

function label(x, y, text, anchor = 'middle') {
  const t = el('text', { x, y, 'text-anchor': anchor });
  t.textContent = text;
  return t;
}

/**
 * Points of y against x, each with its interval from low to high, joined by a line over a shaded
 * band once there are three; on axes from 0 to the largest x and from 0 to 1.
 */
export function bandChart(points, { xTitle, yTitle }) {
  const width = 520;
  const height = 240;
  const pad = { left: 44, right: 12, top: 12, bottom: 36 };
  const maxX = Math.max(1, ...points.map((p) => p.x));
  const sx = (x) => pad.left + (x / maxX) * (width - pad.left - pad.right);
  const sy = (y) => height - pad.bottom - y * (height - pad.top - pad.bottom);
  const svg = el('svg', { viewBox: `0 0 ${width} ${height}`, role: 'img', class: 'chart' });
  svg.setAttribute('aria-label', `${yTitle} against ${xTitle}, ${points.length} points`);
  for (const y of [0, 0.25, 0.5, 0.75, 1]) {
    svg.append(el('line', { x1: pad.left, x2: width - pad.right, y1: sy(y), y2: sy(y), class: 'grid' }));
    svg.append(label(pad.left - 6, sy(y) + 4, `${Math.round(y * 100)}%`, 'end'));
  }
  svg.append(label(pad.left, height - 8, '0', 'middle'));
  svg.append(label(width - pad.right, height - 8, String(maxX), 'end'));
  svg.append(label((width + pad.left) / 2, height - 8, xTitle));
  // A band needs a few points to read as one; each point also shows as a dot with its interval.
  if (points.length >= 3) {
    const upper = points.map((p) => `${sx(p.x).toFixed(1)},${sy(p.high).toFixed(1)}`);
    const lower = points.map((p) => `${sx(p.x).toFixed(1)},${sy(p.low).toFixed(1)}`).reverse();
    svg.append(el('polygon', { points: upper.concat(lower).join(' '), class: 'band' }));
  }
  if (points.length >= 2) {
    svg.append(el('polyline', { points: points.map((p) => `${sx(p.x).toFixed(1)},${sy(p.y).toFixed(1)}`).join(' '), class: 'line' }));
  }
  for (const p of points) {
    svg.append(el('line', { x1: sx(p.x), x2: sx(p.x), y1: sy(p.low), y2: sy(p.high), class: 'whisker' }));
    svg.append(el('circle', { cx: sx(p.x), cy: sy(p.y), r: 3, class: 'dot' }));
  }
  return svg;
}

/** Horizontal bars, one per item, scaled to the largest value. */
export function barList(items) {
  const max = Math.max(1, ...items.map((i) => i.value));
  const box = document.createElement('div');
  box.className = 'bars';
  for (const item of items) {
    const row = document.createElement('div');
    row.className = 'bar-row';
    const name = document.createElement('span');
    name.className = 'bar-name';
    name.textContent = item.name;
    const track = document.createElement('span');
    track.className = 'bar-track';
    const fill = document.createElement('span');
    fill.className = 'bar-fill';
    fill.style.width = `${(100 * item.value) / max}%`;
    track.append(fill);
    const value = document.createElement('span');
    value.className = 'bar-value';
    value.textContent = item.value.toLocaleString();
    row.append(name, track, value);
    box.append(row);
  }
  return box;
}
