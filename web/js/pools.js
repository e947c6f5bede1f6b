// The pools page: the list of pools, one pool's records, and adding a pool from a file.
import { showAccount } from './account.js';
import { getJson, postBody, apiUrl } from './api.js';
import { recordBody } from './fields.js';
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
    card.append(head, recordBody(r.fields));
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
const PREVIEW_BYTES = 256 * 1024;
let chosen = null; // {file, pool, columns}

function suggestedRole(column, suggested) {
  if (column.name === suggested.id) return 'id';
  if (column.name === suggested.label) return 'label';
  const feature = suggested.features.includes(column.name);
  const shown = suggested.display.includes(column.name);
  if (feature) return shown ? 'feature-shown' : 'feature';
  return shown ? 'shown' : 'ignored';
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
    chosen = { file, pool: form.pool.value, columns: preview.columns };
    $('mapping-file').textContent = file.name;
    const head = $('mapping-table').querySelector('thead');
    const body = $('mapping-table').querySelector('tbody');
    const names = document.createElement('tr');
    const roles = document.createElement('tr');
    preview.columns.forEach((column, i) => {
      names.append(el('th', column.numeric ? 'numeric' : 'text', column.name));
      const td = document.createElement('td');
      const select = document.createElement('select');
      select.name = `role-${i}`;
      select.setAttribute('aria-label', `role of column ${column.name}`);
      for (const [value, title] of ROLES) {
        const option = document.createElement('option');
        option.value = value;
        option.textContent = title;
        select.append(option);
      }
      select.value = suggestedRole(column, preview.suggested);
      td.append(select);
      roles.append(td);
    });
    head.replaceChildren(names, roles);
    body.replaceChildren();
    for (const values of preview.rows) {
      const tr = document.createElement('tr');
      for (const v of values) tr.append(el('td', null, v === null ? '' : v));
      body.append(tr);
    }
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
  chosen.columns.forEach((column, i) => {
    const role = $('mapping').elements[`role-${i}`].value;
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
    throw new Error('Name the classes (a,b,c), or mark the column that holds labels: people need classes to pick from.');
  }
  return params;
}

async function importFile(event) {
  event.preventDefault();
  const message = $('import-message');
  const bar = $('import-progress');
  message.className = 'message';
  try {
    const params = mappingParams();
    message.textContent = `Uploading ${chosen.file.name}…`;
    bar.hidden = false;
    bar.value = 0;
    $('import-button').disabled = true;
    const job = await postBody(`imports?${params}`, chosen.file, 'application/octet-stream');
    let status = job;
    while (status.state === 'queued' || status.state === 'running') {
      await new Promise((resolve) => setTimeout(resolve, 250));
      status = await getJson(`imports/${job.id}`);
      bar.value = status.total_bytes ? status.bytes_read / status.total_bytes : 0;
      message.textContent = `${status.records.toLocaleString()} records read`;
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
