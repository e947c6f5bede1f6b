// Renders display fields as text, never as markup: every value goes through textContent.
import { el } from './dom.js';

const SVG = 'http://www.w3.org/2000/svg';

/** A list of numbers written as a JSON array, such as a sensor trace; null if the text is anything else. */
export function numberSeries(text) {
  if (typeof text !== 'string' || !text.startsWith('[') || !text.endsWith(']')) return null;
  const parts = text.slice(1, -1).split(',');
  if (parts.length < 3) return null;
  const values = parts.map(Number);
  return values.every(Number.isFinite) ? values : null;
}

const LENGTH_UNITS = { m: 'm', mm: 'mm', cm: 'cm', um: 'µm', km: 'km' };
const TIME_UNITS = { s: 's', s2: 's²', min: 'min', h: 'h' };
const UNITS = {
  g: 'g', m: 'm', mm: 'mm', cm: 'cm', um: 'µm', km: 'km', s: 's', ms: 'ms', us: 'µs', min: 'min', h: 'h',
  hz: 'Hz', khz: 'kHz', v: 'V', mv: 'mV', kv: 'kV', a: 'A', ma: 'mA', w: 'W', kw: 'kW', mw: 'MW', kwh: 'kWh',
  j: 'J', degc: '°C', c: '°C', degf: '°F', k: 'K', pa: 'Pa', kpa: 'kPa', mpa: 'MPa', bar: 'bar', mbar: 'mbar',
  psi: 'psi', lps: 'L/s', lpm: 'L/min', l: 'L', ml: 'mL', m3h: 'm³/h', rpm: 'rpm', pct: '%', percent: '%',
  db: 'dB', dba: 'dB(A)', n: 'N', nm: 'N·m', kg: 'kg', ppm: 'ppm',
};

/**
 * The unit a column's name carries, if any: in brackets at its end ("pressure (kPa)", "accel [g]"),
 * or as its last word after an underscore ("vibration_g", "flow_lps", "speed_mm_s"); null otherwise.
 */
export function unitOf(name) {
  const bracketed = /[([]\s*([^()[\]]{1,12}?)\s*[)\]]\s*$/.exec(name);
  if (bracketed) return bracketed[1];
  const words = name.toLowerCase().split(/[_\s]+/).filter((w) => w);
  if (words.length < 2) return null;
  const last = words[words.length - 1];
  const before = words[words.length - 2];
  if (words.length >= 3 && LENGTH_UNITS[before] && TIME_UNITS[last]) return `${LENGTH_UNITS[before]}/${TIME_UNITS[last]}`;
  return UNITS[last] || null;
}

/** A number short enough for an axis: at most 3 significant digits, no trailing zeros. */
export function tick(v) {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e4 || a < 1e-2) return v.toExponential(1).replace('e+', 'e');
  return String(Number(v.toPrecision(3)));
}

/** The range widened to round numbers, so that its ends and middle are ticks a person reads at a glance. */
export function niceRange(low, high) {
  const half = (high - low) / 2 || Math.abs(high) || 1;
  const power = 10 ** Math.floor(Math.log10(half));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * power).find((v) => v >= half);
  return { low: Math.floor(low / step) * step, high: Math.ceil(high / step) * step };
}

/**
 * A line chart of a series with its axes: values up the side (with the unit), sample numbers along
 * the bottom. {@code scale} is the pool's range for the column ({low, high}): every record of the
 * pool is then drawn on one scale, so a gentle and a violent trace look different. A button switches
 * this chart between that scale and the record's own range.
 */
export function seriesChart(values, { scale = null, unit = null, name = 'series' } = {}) {
  const own = { low: Math.min(...values), high: Math.max(...values) };
  const shared = scale && Number.isFinite(scale.low) && Number.isFinite(scale.high) && scale.high > scale.low
    ? { low: Math.min(scale.low, own.low), high: Math.max(scale.high, own.high) } : null;
  const figure = el('figure', 'trace');
  const plot = el('div', 'trace-plot');
  const axis = el('div', 'trace-y');
  const svg = document.createElementNS(SVG, 'svg');
  svg.setAttribute('preserveAspectRatio', 'none');
  svg.setAttribute('role', 'img');
  plot.append(axis, svg);
  const foot = el('figcaption', 'trace-foot');
  const xAxis = el('div', 'trace-x');
  xAxis.append(el('span', null, '0'), el('span', null, `sample${unit ? ` · values in ${unit}` : ''}`),
    el('span', null, String(values.length - 1)));
  plot.append(el('span'), xAxis);
  figure.append(plot, foot);

  const width = 600;
  const height = 120;
  const draw = (exact, which) => {
    const range = niceRange(exact.low, exact.high);
    const span = range.high - range.low || 1;
    const y = (v) => (height - ((v - range.low) / span) * height).toFixed(1);
    svg.setAttribute('viewBox', `0 0 ${width} ${height}`);
    svg.setAttribute('aria-label', `${name}: ${values.length} values from ${tick(own.low)} to ${tick(own.high)}`
      + `${unit ? ` ${unit}` : ''}, drawn on ${which}`);
    svg.replaceChildren();
    const across = (cls, at) => {
      const rule = document.createElementNS(SVG, 'line');
      for (const [k, v] of [['class', cls], ['x1', '0'], ['x2', String(width)], ['y1', y(at)], ['y2', y(at)]]) {
        rule.setAttribute(k, v);
      }
      svg.append(rule);
    };
    for (const at of [range.low, (range.low + range.high) / 2, range.high]) across('grid', at);
    if (range.low < 0 && range.high > 0) across('zero', 0);
    const line = document.createElementNS(SVG, 'polyline');
    const step = width / Math.max(1, values.length - 1);
    line.setAttribute('points', values.map((v, i) => `${(i * step).toFixed(1)},${y(v)}`).join(' '));
    svg.append(line);
    axis.replaceChildren(...[range.high, (range.low + range.high) / 2, range.low].map((v) => el('span', null, tick(v))));
    if (unit) axis.firstChild.textContent += ` ${unit}`;
  };
  let onShared = shared !== null;
  draw(shared || own, shared ? 'the pool\'s scale' : 'its own scale');
  if (shared) {
    const toggle = document.createElement('button');
    toggle.type = 'button';
    toggle.className = 'scale-toggle';
    toggle.textContent = 'this record\'s scale';
    toggle.title = 'switch between the scale shared by the pool and this record\'s own range';
    toggle.addEventListener('click', () => {
      onShared = !onShared;
      draw(onShared ? shared : own, onShared ? 'the pool\'s scale' : 'its own scale');
      toggle.textContent = onShared ? 'this record\'s scale' : 'the pool\'s scale';
      figure.classList.toggle('own-scale', !onShared);
    });
    foot.append(toggle);
  }
  return figure;
}

/**
 * A definition list of a record's fields. {@code scales} gives the pool's range of each column
 * that has one ({name: {low, high}}), on which its series are drawn.
 */
export function fieldList(fields, scales = {}) {
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
      dd.append(seriesChart(series, { scale: scales[name], unit: unitOf(name), name }));
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

/** The range of each feature column of a pool (from its description) by name, for drawing series on one scale. */
export function scalesOf(pool) {
  const scales = {};
  for (const f of pool.features || []) {
    if (f.low !== null && f.low !== undefined && f.high !== null && f.high !== undefined) {
      scales[f.name] = { low: f.low, high: f.high };
    }
  }
  return scales;
}

/** A record's card body: an image for a pixel grid (fields folded below it), else the field list. */
export function recordBody(fields, scales = {}) {
  const grid = pixelGrid(fields);
  if (!grid) return fieldList(fields, scales);
  const wrap = document.createElement('div');
  const details = document.createElement('details');
  const summary = document.createElement('summary');
  summary.textContent = 'values';
  details.append(summary, fieldList(fields, scales));
  wrap.append(grid, details);
  return wrap;
}
