// The pools page: the list of pools, one pool's records, and adding a pool from a file.
import { showAccount } from './account.js';
import { getJson, postBody, postFile, apiUrl } from './api.js';
import { recordBody, scalesOf } from './fields.js';
import { el, showMessage } from './dom.js';

const PAGE = 24;
const $ = (id) => document.getElementById(id);

async function showPools() {
  const { pools } = await getJson('pools');
  const list = $('pools');
  list.replaceChildren();
  $('pools-empty').hidden = pools.length > 0;
  for (const pool of pools) {
    const a = document.createElement('a');
    a.href = `overview.html?pool=${encodeURIComponent(pool.name)}`;
    a.append(el('div', 'pool-name', pool.name));
    a.append(el('div', 'pool-meta', `${pool.records.toLocaleString()} records · ${pool.labelled.toLocaleString()} labelled`));
    const meter = document.createElement('div');
    meter.className = 'meter';
    const fill = document.createElement('span');
    fill.style.width = `${pool.records ? (100 * pool.labelled) / pool.records : 0}%`;
    meter.append(fill);
    a.append(meter);
    const li = document.createElement('li');
    li.append(a);
    list.append(li);
  }
}

async function showPool(name, offset) {
  $('pool-list').hidden = true;
  if ($('add-pool')) $('add-pool').hidden = true;
  $('pool-view').hidden = false;
  const pool = await getJson(`pools/${encodeURIComponent(name)}`);
  document.title = `Dowser · ${pool.name}`;
  $('pool-title').textContent = pool.name;
  $('pool-overview').href = `overview.html?pool=${encodeURIComponent(pool.name)}`;
  const labelled = pool.classes.reduce((sum, c) => sum + c.labelled, 0);
  $('pool-facts').textContent = `${pool.records.toLocaleString()} records · ${labelled.toLocaleString()} labelled · `
    + `${pool.feature_width} model features from ${pool.features.length} columns`;
  const chips = $('pool-classes');
  chips.replaceChildren();
  for (const c of pool.classes) {
    const chip = document.createElement('span');
    chip.className = 'class-chip';
    if (c.key) chip.append(el('kbd', null, c.key));
    chip.append(document.createTextNode(`${c.name} · ${c.labelled}`));
    chips.append(chip);
  }
  if ($('export-csv')) {
    $('export-csv').href = apiUrl(`pools/${encodeURIComponent(name)}/export?format=csv`);
    $('export-jsonl').href = apiUrl(`pools/${encodeURIComponent(name)}/export?format=jsonl`);
    $('export-meta').href = apiUrl(`pools/${encodeURIComponent(name)}/export/metadata`);
  }

  const page = await getJson(`pools/${encodeURIComponent(name)}/records?offset=${offset}&limit=${PAGE}`);
  const records = $('records');
  records.replaceChildren();
  for (const r of page.records) {
    const card = document.createElement('article');
    card.className = 'record';
    const head = document.createElement('div');
    head.className = 'record-head';
    head.append(el('span', 'record-id', r.id));
    head.append(el('span', 'record-label', r.label ? `${r.label} · ${r.labelled_by}` : ''));
    card.append(head, recordBody(r.fields, scalesOf(pool)));
    records.append(card);
  }
  $('page-facts').textContent = `${offset + 1}–${Math.min(offset + PAGE, page.total)} of ${page.total.toLocaleString()}`;
  $('prev').disabled = offset === 0;
  $('next').disabled = offset + PAGE >= page.total;
  $('prev').onclick = () => go(name, Math.max(0, offset - PAGE));
  $('next').onclick = () => go(name, offset + PAGE);
}

function go(name, offset) {
  history.pushState(null, '', `?pool=${encodeURIComponent(name)}&offset=${offset}`);
  showPool(name, offset).catch(fail);
}

function fail(error) {
  showMessage($('import-message') ? 'import-message' : 'page-message', error.message, true);
  if ($('add-pool')) $('add-pool').hidden = false;
}

/** Roles a column can take in the mapping step; features may also be shown. */
const ROLES = [
  ['feature-shown', 'feature, shown'],
  ['feature', 'feature, not shown'],
  ['category-shown', 'category feature, shown'],
  ['shown', 'shown only'],
  ['id', 'id'],
  ['label', 'label'],
  ['ignored', 'ignored'],
];
/** Roles that many columns can share (a pool has one id and one label column). */
const SHARED_ROLES = ROLES.filter(([value]) => value !== 'id' && value !== 'label');
const KIND_WORDS = { number: 'numbers', numbers: 'lists of numbers', text: 'text' };
const PREVIEW_BYTES = 256 * 1024;
let chosen = null; // {file, pool, preview}

function suggestedRole(column, suggested) {
  if (column.name === suggested.id) return 'id';
  if (column.name === suggested.label) return 'label';
  const feature = suggested.features.includes(column.name);
  const shown = suggested.display.includes(column.name);
  if (feature) return shown ? 'feature-shown' : 'feature';
  return shown ? 'shown' : 'ignored';
}

const roleSelect = (i) => $('mapping').elements[`role-${i}`];

function roleOptions(select, roles) {
  for (const [value, title] of roles) select.append(new Option(title, value));
}

/** What a column is, in words, for the mapping table. */
function holds(column, sampled) {
  const parts = [KIND_WORDS[column.kind] || column.kind];
  if (column.filled < sampled) parts.push(`${sampled - column.filled} of ${sampled} empty`);
  if (column.unique) parts.push('all different');
  else if (column.distinct <= 12 && column.filled > 0) parts.push(`${column.distinct} different`);
  return parts.join(' · ');
}

function drawMapping(preview) {
  const body = $('mapping-table').querySelector('tbody');
  body.replaceChildren();
  preview.columns.forEach((column, i) => {
    const tr = el('tr');
    tr.dataset.column = column.name;
    tr.append(el('th', 'mono', column.name), el('td', 'hint', holds(column, preview.sampled)));
    const select = el('select');
    select.name = `role-${i}`;
    select.setAttribute('aria-label', `role of column ${column.name}`);
    roleOptions(select, ROLES);
    select.value = suggestedRole(column, preview.suggested);
    select.addEventListener('change', () => roleChanged(i));
    const roleCell = el('td');
    roleCell.append(select);
    if (column.name === preview.suggested.id) roleCell.append(el('span', 'hint suggestion', column.unique ? ' suggested: every value differs' : ''));
    tr.append(roleCell);
    const values = preview.rows.slice(0, 3).map((r) => (r[i] === null || r[i] === '' ? '—' : r[i]));
    const sample = values.map((v) => (v.length > 40 ? `${v.slice(0, 39)}…` : v)).join(' · ');
    tr.append(el('td', 'sample', sample));
    body.append(tr);
  });
  const head = $('records-table').querySelector('thead');
  const names = el('tr');
  for (const column of preview.columns) names.append(el('th', column.kind === 'number' ? 'numeric' : 'text', column.name));
  head.replaceChildren(names);
  const rows = $('records-table').querySelector('tbody');
  rows.replaceChildren();
  for (const values of preview.rows) {
    const tr = el('tr');
    for (const v of values) tr.append(el('td', null, v === null ? '' : v));
    rows.append(tr);
  }
  const form = $('mapping').elements;
  for (const name of ['bulk_from', 'bulk_to']) {
    form[name].replaceChildren(...preview.columns.map((c, i) => new Option(c.name, String(i))));
  }
  form.bulk_to.value = String(preview.columns.length - 1);
  checkMapping();
}

/** One id and one label column: choosing one elsewhere frees the old one. */
function roleChanged(i) {
  const role = roleSelect(i).value;
  if (role === 'id' || role === 'label') {
    chosen.preview.columns.forEach((column, j) => {
      if (j !== i && roleSelect(j).value === role) roleSelect(j).value = 'shown';
    });
  }
  checkMapping();
}

/** The columns a bulk choice names. */
function bulkColumns() {
  const f = $('mapping').elements;
  const columns = chosen.preview.columns;
  const which = f.bulk_which.value;
  if (which === 'numeric') return columns.map((c, i) => (c.kind !== 'text' ? i : -1)).filter((i) => i >= 0);
  if (which === 'text') return columns.map((c, i) => (c.kind === 'text' ? i : -1)).filter((i) => i >= 0);
  if (which === 'range') {
    const a = Number(f.bulk_from.value);
    const b = Number(f.bulk_to.value);
    const out = [];
    for (let i = Math.min(a, b); i <= Math.max(a, b); i++) out.push(i);
    return out;
  }
  if (which === 'pattern') {
    const pattern = f.bulk_pattern.value.trim();
    if (!pattern) return [];
    // A glob: * stands for any run of characters, ? for one; the rest is taken as written.
    const regex = new RegExp(`^${pattern.split('').map((ch) => (ch === '*' ? '.*' : ch === '?' ? '.'
      : ch.replace(/[.+^${}()|[\]\\]/g, '\\$&'))).join('')}$`, 'i');
    return columns.map((c, i) => (regex.test(c.name) ? i : -1)).filter((i) => i >= 0);
  }
  return columns.map((c, i) => i);
}

function showBulkChoice() {
  const which = $('mapping').elements.bulk_which.value;
  $('bulk-range').hidden = which !== 'range';
  $('bulk-pattern').hidden = which !== 'pattern';
  const n = bulkColumns().length;
  $('bulk-count').textContent = `${n} column${n === 1 ? '' : 's'}`;
}

function applyBulk() {
  const role = $('mapping').elements.bulk_role.value;
  const columns = bulkColumns();
  for (const i of columns) roleSelect(i).value = role;
  $('bulk-count').textContent = `${columns.length} column${columns.length === 1 ? '' : 's'} set to ${
    ROLES.find(([v]) => v === role)[1]}`;
  checkMapping();
}

/**
 * Warns before a pool would start with every record labelled (a label column filled in every
 * record read), and asks for classes when no column holds labels.
 */
function checkMapping() {
  const { preview } = chosen;
  const labelAt = preview.columns.findIndex((c, i) => roleSelect(i).value === 'label');
  const warning = $('mapping-warning');
  const labelColumn = labelAt >= 0 ? preview.columns[labelAt] : null;
  const full = labelColumn && labelColumn.filled === preview.sampled;
  warning.hidden = !full;
  if (full) {
    $('mapping-warning-text').textContent = `Every one of the first ${preview.sampled} records already has a label`
      + ` in '${labelColumn.name}'. Imported as the label column, the pool starts with those records labelled,`
      + ' and if the whole file is like this there is nothing left for people to label. To label from scratch,'
      + ` make '${labelColumn.name}' ignored or shown.`;
  }
  $('accept-labels').checked = false;
  $('classes-field').classList.toggle('needed', !labelColumn);
  $('mapping').elements.classes.placeholder = labelColumn
    ? `optional: by default the values of '${labelColumn.name}'` : 'needed: the classes, as a,b,c';
  showBulkChoice();
}

async function previewFile(event) {
  event.preventDefault();
  const form = event.target;
  const file = form.file.files[0];
  const message = $('import-message');
  message.className = 'message';
  message.textContent = `Reading the start of ${file.name}…`;
  try {
    const params = new URLSearchParams({ file_name: file.name });
    const preview = await postBody(`previews?${params}`, file.slice(0, PREVIEW_BYTES), 'application/octet-stream');
    chosen = { file, pool: form.pool.value, preview };
    $('mapping-file').textContent = file.name;
    drawMapping(preview);
    $('import-form').hidden = true;
    $('mapping').hidden = false;
    message.textContent = '';
  } catch (error) {
    showMessage('import-message', error.message, true);
  }
}

function mappingParams() {
  const params = new URLSearchParams({ pool: chosen.pool, file_name: chosen.file.name });
  const features = [];
  const display = [];
  const categorical = [];
  chosen.preview.columns.forEach((column, i) => {
    const role = roleSelect(i).value;
    if (role === 'id') params.set('id', column.name);
    if (role === 'label') params.set('label', column.name);
    if (role.startsWith('feature') || role.startsWith('category')) features.push(column.name);
    if (role.startsWith('category')) categorical.push(column.name);
    if (role.endsWith('shown')) display.push(column.name);
  });
  if (!features.length) throw new Error('Mark at least one column as a feature: the model learns from them.');
  if (!display.length) throw new Error('Mark at least one column as shown: people label from what they see.');
  params.set('features', features.join(','));
  params.set('display', display.join(','));
  if (categorical.length) params.set('categorical', categorical.join(','));
  const classes = $('mapping').elements.classes.value.trim();
  if (classes) params.set('classes', classes);
  if (!params.has('label') && !classes) {
    $('mapping').elements.classes.focus();
    throw new Error('Name the classes (a,b,c), or mark the column that holds labels: people need classes to pick from.');
  }
  if (!$('mapping-warning').hidden && !$('accept-labels').checked) {
    throw new Error(`Every record read so far already has a label in '${params.get('label')}': tick`
      + ' "Import these labels anyway", or give that column another role.');
  }
  return params;
}

/** Bytes as MiB with one decimal. */
const mib = (n) => (n / 1048576).toFixed(1);

async function importFile(event) {
  event.preventDefault();
  const message = $('import-message');
  const bar = $('import-progress');
  message.className = 'message';
  try {
    const params = mappingParams();
    const limit = chosen.preview.upload_limit;
    if (limit && chosen.file.size > limit.bytes) {
      throw new Error(`${chosen.file.name} is ${mib(chosen.file.size)} MiB, larger than this server takes:`
        + ` ${limit.text}.`);
    }
    bar.hidden = false;
    bar.value = 0;
    bar.scrollIntoView({ block: 'center' });
    $('import-button').disabled = true;
    // Two stages, each with the bar from empty to full: sending the file, then reading it into the pool.
    message.textContent = `Sending ${chosen.file.name}…`;
    const job = await postFile(`imports?${params}`, chosen.file, (sent, total) => {
      bar.value = total ? sent / total : 0;
      message.textContent = `Sending ${chosen.file.name}: ${mib(sent)} of ${mib(total)} MiB`;
    });
    bar.value = 0;
    let status = job;
    while (status.state === 'queued' || status.state === 'running') {
      message.textContent = `Reading ${chosen.file.name} into the pool: ${status.records.toLocaleString()} records`
        + (status.total_bytes ? `, ${mib(status.bytes_read)} of ${mib(status.total_bytes)} MiB` : '');
      await new Promise((resolve) => setTimeout(resolve, 250));
      status = await getJson(`imports/${job.id}`);
      bar.value = status.total_bytes ? status.bytes_read / status.total_bytes : 0;
    }
    if (status.state === 'failed') throw new Error(status.error);
    bar.value = 1;
    message.replaceChildren(document.createTextNode(
      `Pool ${status.pool} holds ${status.result.records.toLocaleString()} records. `));
    const link = document.createElement('a');
    link.href = `overview.html?pool=${encodeURIComponent(status.pool)}`;
    link.id = 'new-pool-link';
    link.textContent = 'Open its overview';
    message.append(link);
    $('mapping').hidden = true;
    $('import-form').hidden = false;
    $('import-form').reset();
    await showPools();
  } catch (error) {
    showMessage('import-message', error.message, true);
  } finally {
    $('import-button').disabled = false;
  }
}

async function start() {
  await showAccount();
  const params = new URLSearchParams(location.search);
  const pool = params.get('pool');
  if ($('import-form')) {
    $('import-form').addEventListener('submit', previewFile);
    $('mapping').addEventListener('submit', importFile);
    const bulk = $('mapping').elements;
    roleOptions(bulk.bulk_role, SHARED_ROLES);
    for (const name of ['bulk_which', 'bulk_from', 'bulk_to']) bulk[name].addEventListener('change', showBulkChoice);
    bulk.bulk_pattern.addEventListener('input', showBulkChoice);
    $('bulk-apply').addEventListener('click', applyBulk);
    $('mapping-cancel').addEventListener('click', () => {
      $('mapping').hidden = true;
      $('import-form').hidden = false;
    });
  }
  if (pool) {
    await showPool(pool, Number(params.get('offset')) || 0);
  } else {
    await showPools();
  }
}

window.addEventListener('popstate', () => location.reload());
start().catch(fail);
