// Renders display fields as text, never as markup: every value goes through textContent.
const SVG = 'http://www.w3.org/2000/svg';

/** A list of numbers written as a JSON array, such as a sensor trace; null if the text is anything else. */
export function numberSeries(text) {
  if (typeof text !== 'string' || !text.startsWith('[') || !text.endsWith(']')) return null;
  const parts = text.slice(1, -1).split(',');
  if (parts.length < 3) return null;
  const values = parts.map(Number);
  return values.every(Number.isFinite) ? values : null;
}

/** A small line chart of a series, scaled to its own range. */
export function seriesChart(values) {
  const width = 300;
  const height = 60;
  const min = Math.min(...values);
  const max = Math.max(...values);
  const span = max - min || 1;
  const svg = document.createElementNS(SVG, 'svg');
  svg.setAttribute('viewBox', `0 0 ${width} ${height}`);
  svg.setAttribute('preserveAspectRatio', 'none');
  svg.setAttribute('role', 'img');
  svg.setAttribute('aria-label', `line chart of ${values.length} values from ${min} to ${max}`);
  const zero = document.createElementNS(SVG, 'line');
  const zeroY = height - ((0 - min) / span) * height;
  zero.setAttribute('x1', '0');
  zero.setAttribute('x2', String(width));
  zero.setAttribute('y1', String(zeroY));
  zero.setAttribute('y2', String(zeroY));
  svg.append(zero);
  const line = document.createElementNS(SVG, 'polyline');
  const step = width / (values.length - 1);
  line.setAttribute('points', values.map((v, i) => `${(i * step).toFixed(1)},${(height - ((v - min) / span) * height).toFixed(1)}`).join(' '));
  svg.append(line);
  return svg;
}

/** A definition list of a record's fields. */
export function fieldList(fields) {
  const dl = document.createElement('dl');
  for (const [name, value] of Object.entries(fields)) {
    const dt = document.createElement('dt');
    dt.textContent = name;
    const dd = document.createElement('dd');
    const series = numberSeries(value);
    if (value === null || value === undefined) {
      dd.textContent = '—';
      dd.className = 'missing';
    } else if (series) {
      dd.append(seriesChart(series));
    } else {
      dd.textContent = value;
    }
    dl.append(dt, dd);
  }
  return dl;
}

/**
 * The display fields as a square grey-level image when they are all numbers and their count is a
 * square of at least 16 (an 8 x 8 digit, a 28 x 28 scan); null otherwise.
 */
export function pixelGrid(fields) {
  const values = Object.values(fields).map((v) => (typeof v === 'string' && v.trim() !== '' ? Number(v) : NaN));
  const side = Math.round(Math.sqrt(values.length));
  if (values.length < 16 || side * side !== values.length || !values.every(Number.isFinite)) return null;
  const min = Math.min(...values);
  const span = Math.max(...values) - min || 1;
  const canvas = document.createElement('canvas');
  canvas.width = side;
  canvas.height = side;
  canvas.className = 'pixels';
  canvas.setAttribute('role', 'img');
  canvas.setAttribute('aria-label', `${side} by ${side} image of the record's values`);
  const context = canvas.getContext('2d');
  const image = context.createImageData(side, side);
  values.forEach((v, i) => {
    const ink = 255 - Math.round((255 * (v - min)) / span);
    image.data.set([ink, ink, ink, 255], i * 4);
  });
  context.putImageData(image, 0, 0);
  return canvas;
}

/** A record's card body: an image for a pixel grid (fields folded below it), else the field list. */
export function recordBody(fields) {
  const grid = pixelGrid(fields);
  if (!grid) return fieldList(fields);
  const wrap = document.createElement('div');
  const details = document.createElement('details');
  const summary = document.createElement('summary');
  summary.textContent = 'values';
  details.append(summary, fieldList(fields));
  wrap.append(grid, details);
  return wrap;
}
