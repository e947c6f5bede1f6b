// The pools page: the list of pools, one pool's records, and adding a pool from a file.
import { getJson, postBody, apiUrl } from './api.js';
import { fieldList } from './fields.js';

const PAGE = 24;
const $ = (id) => document.getElementById(id);

function text(tag, className, value) {
  const el = document.createElement(tag);
  if (className) el.className = className;
  el.textContent = value;
  return el;
}

async function showPools() {
  const { pools } = await getJson('pools');
  const list = $('pools');
  list.replaceChildren();
  $('pools-empty').hidden = pools.length > 0;
  for (const pool of pools) {
    const a = document.createElement('a');
    a.href = `?pool=${encodeURIComponent(pool.name)}`;
    a.append(text('div', 'pool-name', pool.name));
    a.append(text('div', 'pool-meta', `${pool.records.toLocaleString()} records · ${pool.labelled.toLocaleString()} labelled`));
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
  $('add-pool').hidden = true;
  $('pool-view').hidden = false;
  const pool = await getJson(`pools/${encodeURIComponent(name)}`);
  document.title = `Dowser · ${pool.name}`;
  $('pool-title').textContent = pool.name;
  const labelled = pool.classes.reduce((sum, c) => sum + c.labelled, 0);
  $('pool-facts').textContent = `${pool.records.toLocaleString()} records · ${labelled.toLocaleString()} labelled · `
    + `${pool.feature_width} model features from ${pool.features.length} columns`;
  const chips = $('pool-classes');
  chips.replaceChildren();
  for (const c of pool.classes) {
    const chip = document.createElement('span');
    chip.className = 'class-chip';
    if (c.key) chip.append(text('kbd', null, c.key));
    chip.append(document.createTextNode(`${c.name} · ${c.labelled}`));
    chips.append(chip);
  }
  $('export-csv').href = apiUrl(`pools/${encodeURIComponent(name)}/export?format=csv`);
  $('export-jsonl').href = apiUrl(`pools/${encodeURIComponent(name)}/export?format=jsonl`);

  const page = await getJson(`pools/${encodeURIComponent(name)}/records?offset=${offset}&limit=${PAGE}`);
  const records = $('records');
  records.replaceChildren();
  for (const r of page.records) {
    const card = document.createElement('article');
    card.className = 'record';
    const head = document.createElement('div');
    head.className = 'record-head';
    head.append(text('span', 'record-id', r.id));
    head.append(text('span', 'record-label', r.label ? `${r.label} · ${r.labelled_by}` : ''));
    card.append(head, fieldList(r.fields));
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
  const message = $('import-message');
  message.textContent = error.message;
  message.className = 'message error';
  $('add-pool').hidden = false;
}

async function importFile(event) {
  event.preventDefault();
  const form = event.target;
  const file = form.file.files[0];
  const message = $('import-message');
  const bar = $('import-progress');
  const params = new URLSearchParams({ pool: form.pool.value, file_name: file.name });
  if (form.id.value) params.set('id', form.id.value);
  if (form.label.value) params.set('label', form.label.value);
  message.className = 'message';
  message.textContent = `Uploading ${file.name}…`;
  bar.hidden = false;
  bar.value = 0;
  try {
    const job = await postBody(`imports?${params}`, file, 'application/octet-stream');
    let status = job;
    while (status.state === 'queued' || status.state === 'running') {
      await new Promise((resolve) => setTimeout(resolve, 250));
      status = await getJson(`imports/${job.id}`);
      bar.value = status.total_bytes ? status.bytes_read / status.total_bytes : 0;
      message.textContent = `${status.records.toLocaleString()} records read`;
    }
    if (status.state === 'failed') throw new Error(status.error);
    bar.value = 1;
    message.textContent = `Pool ${status.pool} holds ${status.result.records.toLocaleString()} records.`;
    form.reset();
    await showPools();
  } catch (error) {
    message.className = 'message error';
    message.textContent = error.message;
  }
}

function start() {
  const params = new URLSearchParams(location.search);
  const pool = params.get('pool');
  $('import-form').addEventListener('submit', importFile);
  if (pool) {
    showPool(pool, Number(params.get('offset')) || 0).catch(fail);
  } else {
    showPools().catch(fail);
  }
}

window.addEventListener('popstate', () => location.reload());
start();
