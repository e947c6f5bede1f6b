// The pool overview: whether to keep labelling, labels, accuracy, chain health, rounds and the served queue, live.
import { showAccount } from './account.js';
import { getJson, postJson, putJson, apiUrl } from './api.js';
import { bandChart, barList } from './charts.js';
import { cell, showMessage, stamp } from './dom.js';

const $ = (id) => document.getElementById(id);
let pool = null;

function headCell(row, text) {
  const th = document.createElement('th');
  th.textContent = text;
  row.append(th);
}

function fixed(v, digits) {
  return v === null || v === undefined || !Number.isFinite(Number(v)) ? '—' : Number(v).toFixed(digits);
}

async function showPool() {
  const p = await getJson(`pools/${encodeURIComponent(pool)}`);
  const labelled = p.classes.reduce((sum, c) => sum + c.labelled, 0);
  $('pool-facts').textContent = `${p.records.toLocaleString()} records · ${labelled.toLocaleString()} labelled · `
    + `${p.classes.length} classes`;
  $('counts').replaceChildren(barList(p.classes.map((c) => ({ name: c.name, value: c.labelled }))));
}

/** An accuracy as two decimals with its interval: 0.93 (0.90–0.95). */
function interval(e) {
  return `${fixed(e.accuracy, 2)} (${fixed(e.lower, 2)}–${fixed(e.upper, 2)})`;
}

function listItem(list, text) {
  const li = document.createElement('li');
  li.textContent = text;
  list.append(li);
  return li;
}

async function showAccuracy() {
  const [a, { strategy }] = await Promise.all([getJson(`pools/${encodeURIComponent(pool)}/accuracy`),
    getJson(`pools/${encodeURIComponent(pool)}/settings`)]);
  const facts = $('accuracy-facts');
  facts.replaceChildren();
  if (!a.model) {
    $('accuracy-model').textContent = 'Nothing to tell yet: once a model has queued records and people have labelled'
      + ' them, its accuracy on the records not yet labelled shows here, with a 95% interval.';
  } else {
    const from = a.window.from_round === a.window.to_round ? `round ${a.window.to_round}`
      : `rounds ${a.window.from_round}–${a.window.to_round}`;
    $('accuracy-model').textContent = `The models of ${from} (the newest learnt from ${a.model.labels} labels), `
      + 'judged by labels given after they made their predictions, on the records not yet labelled.';
    if (a.picked.labels > 0) {
      listItem(facts, `From every picked record, weighted by how likely it was to be picked: ${interval(a.picked)},`
        + ` ${a.picked.labels} labels.`);
    } else if (strategy.startsWith('typiclust-')) {
      // A typical phase ends by itself: power sampling follows, so asking for it would change nothing.
      listItem(facts, 'Picked records cannot tell yet: while labels are few, this pool\'s strategy'
        + ` (${strategy}) takes the most typical records outright, and such picks cannot be weighted back to the`
        + ' whole pool. The records it then picks by power sampling will count here as they are labelled.');
    } else {
      const li = listItem(facts, 'Picked records cannot tell: these rounds picked records outright (the best scores,'
        + ' or the typical records that come first while labels are few), and such picks cannot be weighted back to'
        + ' the whole pool. ');
      const link = document.createElement('a');
      link.href = '#settings';
      link.textContent = 'Pick by power sampling';
      // Like chain advice, the link fills in the setting; an admin saves it.
      link.addEventListener('click', () => {
        const form = $('settings');
        if (form && !form.elements.strategy.disabled) form.elements.strategy.value = 'power';
      });
      li.append(link, ' to let every label count.');
    }
    const s = a.spot_checks;
    if (s.labels > 0) {
      const right = Math.round(s.accuracy * s.labels);
      listItem(facts, `From spot checks (drawn at random): ${right} of ${s.labels} right, ${interval(s)}.`
        + (s.more_for_5_points > 0 ? ` About ${s.more_for_5_points} more would narrow it to ±5 points.`
          : ' That is within ±5 points.'));
    } else {
      listItem(facts, `No spot check in these rounds is labelled yet; about ${s.more_for_5_points} would give`
        + ' ±5 points.');
    }
    if (a.ece !== null && a.ece !== undefined) {
      listItem(facts, `Calibration error on all spot checks: ${fixed(a.ece, 3)} (0 when the model's confidence`
        + ' matches how often it is right).');
    }
  }
  const points = a.rounds.map((p) => ({ x: p.model_labels, y: p.accuracy, low: p.lower, high: p.upper }));
  // No chart before the first estimate: empty axes say nothing.
  $('accuracy-chart').replaceChildren(...(points.length
    ? [bandChart(points, { xTitle: 'labels the model learnt from', yTitle: 'accuracy' })] : []));
  $('accuracy-chart-note').textContent = points.length
    ? 'Each round\'s own estimate from its labels, with its 95% interval; each rests on few labels, so they scatter.'
    : '';
}

async function showKeep() {
  const k = await getJson(`pools/${encodeURIComponent(pool)}/advice`);
  $('keep').className = `panel keep keep-${k.state}`;
  $('keep-headline').textContent = k.headline;
  const list = $('keep-details');
  list.replaceChildren();
  for (const d of k.details) listItem(list, d);
  const info = k.information;
  if (info.length >= 2 && info[0].total > 0) {
    const first = info[0];
    const last = info[info.length - 1];
    listItem(list, `Information left in the unlabelled records: ${Math.round((100 * last.total) / first.total)}% of`
      + ` what it was at round ${first.round}.`);
  }
}

/** A setting's name as the settings panel shows it. */
const SETTING_NAMES = { draws: 'Draws kept', chains: 'Chains', reburn_in_steps: 'Warm-up steps each round' };

function showHealth(round) {
  const dl = $('health');
  dl.replaceChildren();
  const advice = $('advice');
  advice.replaceChildren();
  if (!round || !round.health) {
    $('chain-summary').textContent = 'No sampled round yet: the first batch is spread over the pool; the chains'
      + ' start after it is labelled.';
    return;
  }
  const h = round.health;
  const a = round.advice;
  $('chain-summary').textContent = `Round ${round.round}: ${a.summary}`;
  $('chain-summary').className = `chain-summary chain-${a.level}`;
  for (const p of a.points) {
    const li = listItem(advice, p.text);
    if (p.setting) {
      li.append(' ');
      const link = document.createElement('a');
      link.href = `#setting-${p.setting}`;
      link.textContent = `Set ${SETTING_NAMES[p.setting]} to ${p.suggest}`;
      link.addEventListener('click', () => {
        const input = $(`setting-${p.setting}`);
        if (input && !input.disabled) input.value = p.suggest;
      });
      li.append(link);
    }
  }
  const facts = [
    ['Kernel', round.kernel ? `${round.kernel}${round.message ? ` — ${round.message}` : ''}` : '—'],
    ['How far the chains agree (R-hat; 1 is full agreement)',
      `${fixed(h.rhatMax, 2)}; fine up to ${fixed(a.rhat_ceiling, 2)} for these draws`],
    ['Independent draws (effective sample size)',
      `${fixed(Math.min(h.essBulkMin, h.essTailMin), 0)}; fine from ${fixed(Math.ceil(a.ess_floor), 0)}`],
    ['Acceptance', h.acceptance === null || Number.isNaN(h.acceptance) ? 'not an accept-reject kernel'
      : fixed(h.acceptance, 2)],
    ['Steps undone and retried smaller', String(h.divergences)],
  ];
  for (const [k, v] of facts) {
    const dt = document.createElement('dt');
    dt.textContent = k;
    const dd = document.createElement('dd');
    dd.textContent = v;
    dl.append(dt, dd);
  }
}

const ROUNDS_PAGE = 15;
let roundsOffset = 0;

/** A message with its numbers left out: "30 labelled rows ..." and "40 labelled rows ..." say the same. */
const wording = (m) => (m || '').replace(/[0-9][0-9.,]*/g, '#');

/** A round's note when it says something new: its failure or stop, or a reason worded unlike the older round's. */
function roundNote(round, older) {
  if (!round.message) return '';
  if (round.status !== 'published' || !older || wording(older.message) !== wording(round.message)
    || older.kernel !== round.kernel) {
    return round.message;
  }
  return '';
}

async function showRounds() {
  const enc = encodeURIComponent(pool);
  const r = await getJson(`pools/${enc}/rounds?offset=${roundsOffset}&limit=${ROUNDS_PAGE + 1}`);
  const body = $('rounds').querySelector('tbody');
  body.replaceChildren();
  const shown = r.rounds.slice(0, ROUNDS_PAGE);
  shown.forEach((round, i) => {
    const row = document.createElement('tr');
    row.className = `status-${round.status}`;
    const h = round.health || {};
    cell(row, String(round.round));
    cell(row, round.status + (round.round === r.served_round ? ' · served' : ''));
    cell(row, stamp(round.started_at));
    cell(row, round.seconds === undefined ? '…' : `${round.seconds.toFixed(1)} s`);
    cell(row, String(round.labels_at_start));
    cell(row, round.kernel || '—');
    cell(row, fixed(h.rhatMax, 3));
    cell(row, round.health ? `${fixed(h.essBulkMin, 0)} / ${fixed(h.essTailMin, 0)}` : '—');
    cell(row, round.health ? (Number.isNaN(h.acceptance) || h.acceptance === null
      ? Number(h.meanStepSize).toExponential(2) : fixed(h.acceptance, 2)) : '—');
    cell(row, round.health ? String(h.divergences) : '—');
    body.append(row);
    // A note gets a line of its own under its round, so the numbers above stay in narrow columns.
    const note = roundNote(round, r.rounds[i + 1]);
    if (note) {
      const noteRow = document.createElement('tr');
      noteRow.className = `round-note status-${round.status}`;
      cell(noteRow, note, 'note-cell').colSpan = row.cells.length;
      body.append(noteRow);
    }
  });
  $('rounds-facts').textContent = r.total === 0 ? 'No round yet.'
    : `${roundsOffset + 1}–${roundsOffset + shown.length} of ${r.total}`;
  $('rounds-newer').disabled = roundsOffset === 0;
  $('rounds-older').disabled = roundsOffset + ROUNDS_PAGE >= r.total;
  // The newest rounds say how the pool stands, whichever page is shown.
  const latest = roundsOffset === 0 ? r : await getJson(`pools/${enc}/rounds?limit=${ROUNDS_PAGE}`);
  const failed = latest.rounds.find((x) => x.status === 'failed');
  if (failed && failed.round === latest.rounds[0].round) {
    showMessage('overview-message', `Round ${failed.round} failed: ${failed.message}. `
      + 'The previous queue stays in service.', true);
  } else {
    $('overview-message').textContent = '';
  }
  showHealth(latest.rounds.find((x) => x.health));
}

async function showQueue() {
  const q = await getJson(`pools/${encodeURIComponent(pool)}/queue`);
  const body = $('queue').querySelector('tbody');
  body.replaceChildren();
  $('queue-title').textContent = q.round ? `Queue being served (round ${q.round})` : 'Queue being served';
  for (const e of q.entries) {
    const row = document.createElement('tr');
    if (e.labelled) row.className = 'done';
    else if (e.waiting_for_second) row.className = 'waiting';
    cell(row, String(e.position + 1));
    cell(row, e.record, 'mono');
    // A spot check is drawn at random and the first batch before any model: neither has a score.
    cell(row, e.spot_check || !e.scored ? '—' : fixed(e.score, 4), 'number');
    const kind = e.spot_check ? 'spot check' : e.scored ? 'picked' : 'first batch';
    const second = e.copies < 2 ? '' : e.labelled ? ' · labelled twice'
      : e.waiting_for_second ? ' · waits for a second label' : ' · two labels wanted';
    cell(row, kind + second);
    cell(row, e.leased_to && !e.labelled && new Date(e.lease_until) > new Date() ? e.leased_to : '');
    cell(row, e.label || '');
    body.append(row);
  }
}

async function refresh() {
  try {
    await Promise.all([showPool(), showAccuracy(), showKeep(), showRounds(), showQueue(),
      getJson(`pools/${encodeURIComponent(pool)}/agreement`).then(showAgreement), showSettings()]);
  } catch (error) {
    showMessage('overview-message', error.message, true);
  }
}

// Labels arrive many times a second when a team is at work; the page redraws at most every two
// seconds for them, and within a third of a second for a round.
const LABEL_DELAY_MS = 2000;
const ROUND_DELAY_MS = 300;
let pending = null;
let pendingAt = Infinity;
function refreshAfter(delay) {
  const at = Date.now() + delay;
  if (pending && pendingAt <= at) return;
  clearTimeout(pending);
  pendingAt = at;
  pending = setTimeout(() => {
    pending = null;
    pendingAt = Infinity;
    refresh();
  }, delay);
}
const refreshSoon = () => refreshAfter(ROUND_DELAY_MS);

async function start() {
  await showAccount();
  pool = new URLSearchParams(location.search).get('pool');
  if (!pool) {
    location.href = './';
    return;
  }
  document.title = `Dowser · ${pool}`;
  $('pool-title').textContent = pool;
  const enc = encodeURIComponent(pool);
  $('to-desk').href = `desk.html?pool=${enc}`;
  // Buttons the role may not use are gone after showAccount(); the server refuses them regardless.
  const set = (id, apply) => { if ($(id)) apply($(id)); };
  set('to-records', (a) => { a.href = `./?pool=${enc}`; });
  set('to-review', (a) => { a.href = `review.html?pool=${enc}`; });
  set('settings', (form) => {
    form.addEventListener('submit', saveSettings);
    // Only admins may change settings; others see them and their history.
    if (!$('settings-save')) for (const el of form.elements) el.disabled = true;
  });
  set('export-csv', (a) => { a.href = apiUrl(`pools/${enc}/export?format=csv`); });
  set('export-jsonl', (a) => { a.href = apiUrl(`pools/${enc}/export?format=jsonl`); });
  set('export-meta', (a) => { a.href = apiUrl(`pools/${enc}/export/metadata`); });
  $('rounds-newer').addEventListener('click', () => {
    roundsOffset = Math.max(0, roundsOffset - ROUNDS_PAGE);
    showRounds().catch((e) => showMessage('overview-message', e.message, true));
  });
  $('rounds-older').addEventListener('click', () => {
    roundsOffset += ROUNDS_PAGE;
    showRounds().catch((e) => showMessage('overview-message', e.message, true));
  });
  set('round-now', (b) => b.addEventListener('click', async () => {
    await postJson(`pools/${enc}/rounds`, {});
    refreshSoon();
  }));
  const events = new EventSource(apiUrl(`events?pool=${enc}`));
  events.addEventListener('round', refreshSoon);
  events.addEventListener('label', () => refreshAfter(LABEL_DELAY_MS));
  refresh();
}

start();

const SETTINGS = ['batch_size', 'spot_check_share', 'double_label_share', 'lease_minutes', 'strategy', 'chains',
  'draws', 'reburn_in_steps', 'temperature', 'stop_agreement', 'cold_start'];
/** Settings sent as words; the rest are numbers. */
const WORD_SETTINGS = ['strategy', 'cold_start'];

/** A setting's name as the settings form says it ("labels per round"), so the history reads like the form. */
function settingWords(form, field) {
  const label = form.elements[field].closest('label');
  const words = label ? label.firstChild.textContent.trim() : field.replaceAll('_', ' ');
  return words.charAt(0).toLowerCase() + words.slice(1);
}

/** A setting's value as the form shows it: a choice by its words ("BatchBALD"), a number as it is. */
function settingValue(form, field, value) {
  const input = form.elements[field];
  if (input.tagName === 'SELECT') {
    const option = [...input.options].find((o) => o.value === String(value));
    if (option) return option.textContent;
  }
  return String(value);
}

async function showSettings() {
  const form = $('settings');
  if (!form) return;
  const now = await getJson(`pools/${encodeURIComponent(pool)}/settings`);
  if (!form.contains(document.activeElement)) {
    for (const f of SETTINGS) form.elements[f].value = now[f];
  }
  const { changes } = await getJson(`pools/${encodeURIComponent(pool)}/settings/history`);
  const list = $('settings-history');
  list.replaceChildren();
  for (const c of changes.slice().reverse()) {
    const changed = SETTINGS.filter((f) => !c.before || String(c.before[f]) !== String(c.after[f]))
      .map((f) => `${settingWords(form, f)} ${c.before ? `${settingValue(form, f, c.before[f])} → ` : ''}`
        + `${settingValue(form, f, c.after[f])}`);
    const li = document.createElement('li');
    li.textContent = `${stamp(c.at)} · ${c.by} · ${changed.join(', ') || 'saved unchanged'}`;
    list.append(li);
  }
  if (changes.length === 0) {
    const li = document.createElement('li');
    li.textContent = 'No change since the pool was made.';
    list.append(li);
  }
}

async function saveSettings(event) {
  event.preventDefault();
  const form = event.target;
  const body = {};
  for (const f of SETTINGS) body[f] = WORD_SETTINGS.includes(f) ? form.elements[f].value : Number(form.elements[f].value);
  try {
    await putJson(`pools/${encodeURIComponent(pool)}/settings`, body);
    showMessage('settings-message', 'Saved; the next round uses them.');
    if (document.activeElement) document.activeElement.blur();
    // Chain advice and the card read the settings too.
    await refresh();
  } catch (e) {
    showMessage('settings-message', e.message, true);
  }
}

/** Kappa in words: the common-practice bands of Landis and Koch (1977). */
function kappaWords(k) {
  if (k === null || k === undefined) return '—';
  const words = k < 0 ? 'worse than chance' : k <= 0.2 ? 'slight' : k <= 0.4 ? 'fair' : k <= 0.6 ? 'moderate'
    : k <= 0.8 ? 'substantial' : 'almost perfect';
  return `${k.toFixed(2)} (${words})`;
}

function showAgreement(a) {
  $('agreement-facts').textContent = a.records === 0
    ? 'No record has two labels yet. A share of every queue goes to two different people; their agreement shows here.'
    : `Fleiss' kappa over ${a.records.toLocaleString()} records labelled by two or more people: ${kappaWords(a.fleiss_kappa)}.`;
  const any = a.records > 0;
  $('pairs-wrap').hidden = !any;
  $('confusion-wrap').hidden = !any;
  $('confusion-title').hidden = !any;
  if (!any) return;
  const body = $('pairs').tBodies[0];
  body.replaceChildren();
  for (const p of a.pairs) {
    const row = document.createElement('tr');
    cell(row, `${p.first} & ${p.second}`);
    cell(row, String(p.records));
    cell(row, kappaWords(p.cohen_kappa));
    body.append(row);
  }
  const head = $('confusion').tHead;
  head.replaceChildren();
  const hr = document.createElement('tr');
  headCell(hr, '');
  for (const c of a.classes) headCell(hr, c);
  head.append(hr);
  const cbody = $('confusion').tBodies[0];
  cbody.replaceChildren();
  a.classes.forEach((c, i) => {
    const row = document.createElement('tr');
    headCell(row, c);
    a.confusion[i].forEach((n) => cell(row, String(n)));
    cbody.append(row);
  });
}

