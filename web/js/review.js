// The review page: labelled records filtered by what needs a second look; accept or override,
// and each record's full history.
import { getJson, postJson } from './api.js';
import { showAccount } from './account.js';
import { recordBody, scalesOf } from './fields.js';
import { el, showMessage, stamp } from './dom.js';

const PAGE = 20;
const $ = (id) => document.getElementById(id);
const state = { pool: null, classes: [], scales: {}, offset: 0, filter: {} };

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
  return `model: ${state.classes[top].name} ${(100 * model[top]).toFixed(0)}%`;
}

/** What a record's final label is now, in words: the label, or "unresolved" with the people's labels. */
function currentText(record) {
  if (record.final_label) return record.final_label;
  const given = record.opinions.map((o) => `${o.person}: ${o.label}`).join(', ');
  return given ? `unresolved (${given})` : 'unresolved';
}

/**
 * The decision controls of one card. Nothing is chosen at first: the reviewer picks the new label
 * by clicking a class or pressing its key (the desk's keys) while the card has focus, writes a
 * reason, and confirms a sentence that names the old and the new final label.
 */
function decisionForm(record, list, cardElement) {
  const form = el('form', 'decision');
  const chosen = { label: null };
  const agreed = record.opinions.length > 0 && new Set(record.opinions.map((o) => o.label)).size === 1;
  const peoples = agreed ? record.opinions[0].label : null;
  const accept = el('button', 'accept', record.review && peoples ? `Restore ${peoples}` : 'Accept');
  accept.type = 'button';
  accept.disabled = !agreed || (record.review && record.review.verdict === 'accept');
  accept.title = !agreed ? 'people disagree: choose a label and give a reason'
    : record.review ? `make the people's label (${peoples}) final again` : 'make the people\'s label final';
  const choices = el('div', 'review-choices');
  choices.setAttribute('role', 'radiogroup');
  choices.setAttribute('aria-label', `new label for ${record.id}`);
  const reason = el('input', 'reason');
  reason.placeholder = 'reason for the override';
  reason.maxLength = 2000;
  reason.setAttribute('aria-label', `reason for ${record.id}`);
  const override = el('button', 'override', 'Override…');
  override.type = 'submit';
  const confirm = el('div', 'confirm');
  confirm.hidden = true;
  const sentence = el('p', 'confirm-text');
  const yes = el('button', 'confirm-yes', 'Yes, change it');
  yes.type = 'button';
  const no = el('button', 'confirm-no', 'Cancel');
  no.type = 'button';
  confirm.append(sentence, yes, no);

  const buttons = new Map();
  const choose = (name) => {
    chosen.label = name;
    for (const [n, b] of buttons) b.setAttribute('aria-checked', String(n === name));
    confirm.hidden = true;
    reason.focus();
  };
  for (const c of state.classes) {
    const b = el('button', 'choice small');
    b.type = 'button';
    b.setAttribute('role', 'radio');
    b.setAttribute('aria-checked', 'false');
    b.dataset.label = c.name;
    if (c.key) b.append(el('kbd', null, c.key));
    if (c.key === c.name) b.classList.add('own-key');
    else b.append(document.createTextNode(c.name));
    b.setAttribute('aria-label', `${c.name}${c.key ? ` (key ${c.key})` : ''}`);
    b.addEventListener('click', () => choose(c.name));
    buttons.set(c.name, b);
    choices.append(b);
  }
  cardElement.addEventListener('keydown', (event) => {
    if (event.ctrlKey || event.metaKey || event.altKey) return;
    if (['INPUT', 'SELECT', 'TEXTAREA'].includes(event.target.tagName)) {
      if (event.key === 'Escape') confirm.hidden = true;
      return;
    }
    if (event.key === 'Escape') {
      confirm.hidden = true;
      return;
    }
    const c = state.classes.find((x) => x.key && x.key === event.key.toLowerCase());
    if (c) {
      event.preventDefault();
      choose(c.name);
    }
  });
  const ask = (text, body) => {
    sentence.textContent = text;
    confirm.hidden = false;
    yes.onclick = () => decide(body);
    yes.focus();
  };
  accept.addEventListener('click', () => ask(
    `Make ${peoples} the final label of ${record.id}? It is now ${currentText(record)}.`,
    { record: record.id, verdict: 'accept' }));
  no.addEventListener('click', () => { confirm.hidden = true; });
  form.addEventListener('submit', (event) => {
    event.preventDefault();
    if (!chosen.label) {
      say(`${record.id}: choose the new label first (click a class or press its key).`, true);
      return;
    }
    if (!reason.value.trim()) {
      say(`${record.id}: give a reason for the override; it is kept with the label.`, true);
      reason.focus();
      return;
    }
    ask(`Change the final label of ${record.id} from ${currentText(record)} to ${chosen.label}?`,
      { record: record.id, verdict: 'override', label: chosen.label, reason: reason.value.trim() });
  });
  const row = el('div', 'decision-row');
  row.append(accept, el('span', 'hint', 'or override with'), choices);
  const why = el('div', 'decision-row');
  why.append(reason, override);
  form.append(row, why, confirm);
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
    const line = `${stamp(h.at)} · ${h.by} · ${h.kind} ${h.label}${h.note ? ` — ${h.note}` : ''}`;
    box.append(el('li', null, line));
  }
  box.hidden = false;
  button.textContent = 'Hide history';
}

function card(record) {
  const c = el('article', `record review-card status-${record.status}`);
  c.dataset.record = record.id;
  c.tabIndex = 0;
  c.setAttribute('aria-label', `record ${record.id}: focus it and press a class key to choose a new label`);
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
  c.append(recordBody(record.fields, state.scales));
  const actions = el('div', 'inline-actions');
  decisionForm(record, actions, c);
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
  state.classes = pool.classes;
  state.scales = scalesOf(pool);
  const classSelect = $('filters').elements.label;
  for (const c of state.classes) classSelect.append(new Option(c.name, c.name));
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
