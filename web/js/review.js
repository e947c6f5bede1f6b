// The review page: labelled records filtered by what needs a second look; accept or override,
// and each record's full history.
import { getJson, postJson } from './api.js';
import { showAccount } from './account.js';
import { recordBody } from './fields.js';
import { el, showMessage } from './dom.js';

const PAGE = 20;
const $ = (id) => document.getElementById(id);
const state = { pool: null, classes: [], offset: 0, filter: {} };

const say = (text, isError = false) => showMessage('review-message', text, isError);

function query() {
  const q = new URLSearchParams({ show: state.filter.show || 'all', offset: state.offset, limit: PAGE });
  if (state.filter.labeller) q.set('labeller', state.filter.labeller);
  if (state.filter.label) q.set('label', state.filter.label);
  return q.toString();
}

function modelText(model) {
  if (!model) return 'no model view yet';
  let top = 0;
  model.forEach((p, i) => { if (p > model[top]) top = i; });
  return `model: ${state.classes[top]} ${(100 * model[top]).toFixed(0)}%`;
}

function decisionForm(record, list) {
  const form = el('form', 'inline-form decision');
  const accept = el('button', null, 'Accept');
  accept.type = 'button';
  accept.className = 'accept';
  accept.disabled = record.opinions.length === 0 || new Set(record.opinions.map((o) => o.label)).size > 1;
  accept.title = accept.disabled ? 'people disagree: choose a label and give a reason' : 'make the people\'s label final';
  accept.addEventListener('click', () => decide({ record: record.id, verdict: 'accept' }));
  const choice = el('select');
  choice.setAttribute('aria-label', `label for ${record.id}`);
  for (const c of state.classes) choice.append(new Option(c, c));
  const reason = el('input');
  reason.placeholder = 'reason for the override';
  reason.maxLength = 2000;
  reason.setAttribute('aria-label', `reason for ${record.id}`);
  const override = el('button', 'override', 'Override');
  override.type = 'submit';
  form.append(accept, choice, reason, override);
  form.addEventListener('submit', (event) => {
    event.preventDefault();
    decide({ record: record.id, verdict: 'override', label: choice.value, reason: reason.value });
  });
  list.append(form);
}

async function decide(body) {
  try {
    const r = await postJson(`pools/${encodeURIComponent(state.pool)}/reviews`, body);
    say(`${body.record}: final label ${r.final_label} (${body.verdict === 'accept' ? 'accepted' : 'overridden'})`);
    await show();
  } catch (e) {
    say(e.message, true);
  }
}

async function toggleHistory(record, box, button) {
  if (!box.hidden) {
    box.hidden = true;
    button.textContent = 'History';
    return;
  }
  const { history } = await getJson(`pools/${encodeURIComponent(state.pool)}/records/${encodeURIComponent(record.id)}/history`);
  box.replaceChildren();
  for (const h of history) {
    const line = `${new Date(h.at).toLocaleString()} · ${h.by} · ${h.kind} ${h.label}${h.note ? ` — ${h.note}` : ''}`;
    box.append(el('li', null, line));
  }
  box.hidden = false;
  button.textContent = 'Hide history';
}

function card(record) {
  const c = el('article', `record review-card status-${record.status}`);
  c.dataset.record = record.id;
  const head = el('div', 'record-head');
  head.append(el('span', 'record-id', record.id), el('span', `chip chip-${record.status}`, record.status));
  c.append(head);
  const facts = el('ul', 'opinions');
  for (const o of record.opinions) {
    facts.append(el('li', null, `${o.person}: ${o.label}${o.note ? ` — ${o.note}` : ''}`));
  }
  if (record.review) {
    const r = record.review;
    facts.append(el('li', 'reviewed', `${r.reviewer} ${r.verdict === 'accept' ? 'accepted' : 'overrode'}: ${r.label}`
      + `${r.reason ? ` — ${r.reason}` : ''}`));
  }
  facts.append(el('li', 'model-view', modelText(record.model) + (record.spot_check ? ' · spot check' : '')));
  c.append(el('p', 'final', record.final_label ? `final: ${record.final_label}` : 'final: unresolved'), facts);
  c.append(recordBody(record.fields));
  const actions = el('div', 'inline-actions');
  decisionForm(record, actions);
  const historyButton = el('button', null, 'History');
  historyButton.type = 'button';
  const history = el('ul', 'history');
  history.hidden = true;
  historyButton.addEventListener('click', () => toggleHistory(record, history, historyButton).catch((e) => say(e.message, true)));
  actions.append(historyButton);
  c.append(actions, history);
  return c;
}

async function show() {
  const page = await getJson(`pools/${encodeURIComponent(state.pool)}/review?${query()}`);
  const list = $('review-list');
  list.replaceChildren();
  for (const r of page.records) list.append(card(r));
  const people = $('people');
  people.replaceChildren(...page.people.map((p) => new Option(p, p)));
  $('review-facts').textContent = page.total === 0 ? 'No record matches.'
    : `${state.offset + 1}–${Math.min(state.offset + PAGE, page.total)} of ${page.total.toLocaleString()}`;
  $('review-prev').disabled = state.offset === 0;
  $('review-next').disabled = state.offset + PAGE >= page.total;
}

async function choosePool() {
  $('choose-pool').hidden = false;
  const { pools } = await getJson('pools');
  for (const p of pools) {
    const a = el('a');
    a.href = `review.html?pool=${encodeURIComponent(p.name)}`;
    a.append(el('div', 'pool-name', p.name), el('div', 'pool-meta', `${p.labelled.toLocaleString()} labelled`));
    const li = el('li');
    li.append(a);
    $('review-pools').append(li);
  }
}

async function start() {
  await showAccount();
  state.pool = new URLSearchParams(location.search).get('pool');
  if (!state.pool) {
    await choosePool();
    return;
  }
  document.title = `Dowser · review · ${state.pool}`;
  $('review-pool').textContent = `reviewing ${state.pool}`;
  $('review-title').textContent = `Review · ${state.pool}`;
  $('review').hidden = false;
  const pool = await getJson(`pools/${encodeURIComponent(state.pool)}`);
  state.classes = pool.classes.map((c) => c.name);
  const classSelect = $('filters').elements.label;
  for (const c of state.classes) classSelect.append(new Option(c, c));
  $('filters').addEventListener('submit', (event) => {
    event.preventDefault();
    const f = event.target.elements;
    state.filter = { show: f.show.value, labeller: f.labeller.value.trim(), label: f.label.value };
    state.offset = 0;
    show().catch((e) => say(e.message, true));
  });
  $('review-prev').addEventListener('click', () => {
    state.offset = Math.max(0, state.offset - PAGE);
    show().catch((e) => say(e.message, true));
  });
  $('review-next').addEventListener('click', () => {
    state.offset += PAGE;
    show().catch((e) => say(e.message, true));
  });
  await show();
}

start().catch((e) => say(e.message, true));
