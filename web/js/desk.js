// The labelling desk: one record at a time, labelled by keyboard, never waiting for the model.
import { getJson, postJson, postJsonOnLeave } from './api.js';
import { showAccount } from './account.js';
import { recordBody, scalesOf } from './fields.js';
import { el, showMessage } from './dom.js';

const $ = (id) => document.getElementById(id);
const BELIEF_KEY = 'dowser.showBelief';
// Calls that change nothing when the server answers busy, and may simply be sent again (not undo:
// it takes a label back and then leases the record, two steps).
const REPEATABLE = { retryBusy: true };

const state = {
  pool: null,
  person: null,
  classes: [],
  scales: {},
  current: null, // the assignment being shown: {round, position, spot_check, record, belief, reason}
  recent: [], // the person's labels that still stand, newest first: {record, label, at}
  relabel: [], // records taken back and not yet labelled again, newest last (shown before new ones)
  labelledThisSession: 0,
  showBelief: localStorage.getItem(BELIEF_KEY) === 'true',
  beliefOpen: false,
  busy: false,
  wantNext: false, // a round arrived while busy with nothing shown: fetch once free
  progress: null,
};

const say = (text, isError = false) => showMessage('desk-message', text, isError);

function showProgress(progress) {
  if (progress) {
    // Replies and events can cross: a reply computed before a round was published must not
    // take the newer round number back.
    const served = Math.max(progress.served_round || 0, (state.progress && state.progress.served_round) || 0);
    state.progress = { ...state.progress, ...progress, served_round: served || null };
  }
  const p = state.progress || {};
  const parts = [`${state.labelledThisSession} labelled this session`];
  parts.push(p.served_round ? `round ${p.served_round}` : 'no round yet');
  if (p.labels_to_next_round !== undefined) {
    parts.push(p.labels_to_next_round === 0 ? 'next round under way'
      : `next round in ${p.labels_to_next_round} label${p.labels_to_next_round === 1 ? '' : 's'}`);
  }
  $('progress').textContent = parts.join(' · ');
}

/** Whether a class's key is its own name, as the digit classes 0-9 are. */
function ownKey(c) {
  return Boolean(c.key) && c.key === c.name;
}

function renderChoices() {
  const box = $('choices');
  box.replaceChildren();
  for (const c of state.classes) {
    const b = document.createElement('button');
    b.type = 'button';
    b.className = 'choice';
    b.dataset.label = c.name;
    if (c.key) {
      const k = document.createElement('kbd');
      k.textContent = c.key;
      b.append(k);
    }
    // A class that is its own key (the digit 3) shows once, as its key.
    if (ownKey(c)) b.classList.add('own-key');
    else b.append(document.createTextNode(c.name));
    b.setAttribute('aria-label', `${c.name}${c.key ? ` (key ${c.key})` : ''}`);
    b.addEventListener('click', () => label(c.name));
    box.append(b);
  }
}

function renderBelief() {
  const a = state.current;
  const panel = $('belief');
  const toggle = $('belief-toggle');
  if (!a || !a.belief || !a.belief.mean) {
    panel.hidden = true;
    toggle.disabled = true;
    return;
  }
  toggle.disabled = false;
  panel.hidden = !state.beliefOpen;
  toggle.firstChild.textContent = state.beliefOpen ? 'Hide model belief ' : 'Show model belief ';
  $('belief-hint').textContent = a.spot_check
    ? 'This record is a spot check: the model is tested on it, so its belief starts hidden.'
    : 'Mean probability over the posterior draws; the whisker spans one standard deviation across them.';
  const bars = $('belief-bars');
  bars.replaceChildren();
  a.belief.mean.forEach((mean, i) => {
    const sd = a.belief.sd ? a.belief.sd[i] : 0;
    const row = document.createElement('div');
    row.className = 'belief-row';
    const name = document.createElement('span');
    name.className = 'belief-name';
    name.textContent = state.classes[i] ? state.classes[i].name : `class ${i + 1}`;
    const track = document.createElement('span');
    track.className = 'belief-track';
    const fill = document.createElement('span');
    fill.className = 'belief-fill';
    fill.style.width = `${(100 * mean).toFixed(1)}%`;
    const whisker = document.createElement('span');
    whisker.className = 'belief-spread';
    whisker.style.left = `${(100 * Math.max(0, mean - sd)).toFixed(1)}%`;
    whisker.style.width = `${(100 * (Math.min(1, mean + sd) - Math.max(0, mean - sd))).toFixed(1)}%`;
    track.append(fill, whisker);
    const value = document.createElement('span');
    value.className = 'belief-value';
    value.textContent = `${(100 * mean).toFixed(0)}% ± ${(100 * sd).toFixed(0)}`;
    row.append(name, track, value);
    bars.append(row);
  });
}

function show(assignment) {
  state.current = assignment;
  const card = $('card');
  const shown = Boolean(assignment && assignment.record);
  $('skip').disabled = !shown;
  if (!shown) {
    card.hidden = true;
    $('choices').hidden = true;
    $('belief').hidden = true;
    return;
  }
  const r = assignment.record;
  card.hidden = false;
  $('choices').hidden = false;
  $('card-id').textContent = r.id;
  $('card-spot').hidden = !assignment.spot_check;
  $('card-why').textContent = assignment.reason || '';
  $('card-body').replaceChildren(recordBody(r.fields, state.scales));
  $('note').value = '';
  state.beliefOpen = assignment.spot_check ? false : state.showBelief;
  renderBelief();
}

async function next() {
  const reply = await postJson(`pools/${encodeURIComponent(state.pool)}/queue/next`, {}, REPEATABLE);
  showProgress(reply.progress);
  if (!reply.record) {
    show(null);
    say(reply.message || 'Nothing to label right now.');
    return;
  }
  show(reply);
}

async function guarded(work) {
  if (state.busy) return;
  state.busy = true;
  try {
    await work();
  } catch (error) {
    say(error.message, true);
  } finally {
    state.busy = false;
    if (state.wantNext) {
      state.wantNext = false;
      if (!state.current || !state.current.record) guarded(next);
    }
  }
}

function renderRecent() {
  const list = $('mine-list');
  list.replaceChildren();
  $('mine').hidden = state.recent.length === 0;
  $('undo').disabled = state.recent.length === 0;
  for (const given of state.recent) {
    const li = el('li');
    li.dataset.record = given.record;
    li.append(el('span', 'mono', given.record), el('span', 'given', given.label));
    const back = el('button', 'take-back', 'Take back');
    back.type = 'button';
    back.title = `take back your label ${given.label} of ${given.record} and label it again`;
    back.addEventListener('click', () => undo(given.record));
    li.append(back);
    list.append(li);
  }
}

async function loadRecent() {
  const reply = await getJson(`pools/${encodeURIComponent(state.pool)}/labels/mine`);
  state.recent = reply.labels;
  renderRecent();
}

/** After a label or a skip: a record taken back earlier comes first, else the next of the queue. */
async function advance() {
  if (state.relabel.length) show(state.relabel.pop());
  else await next();
}

function label(name) {
  guarded(async () => {
    const a = state.current;
    if (!a || !a.record) return;
    const body = { record: a.record.id, label: name };
    const note = $('note').value.trim();
    if (note) body.note = note;
    const reply = await postJson(`pools/${encodeURIComponent(state.pool)}/labels`, body, REPEATABLE);
    state.labelledThisSession += 1;
    state.recent = [{ record: a.record.id, label: name, at: reply.labelled_at }, ...state.recent
      .filter((g) => g.record !== a.record.id)].slice(0, 10);
    renderRecent();
    say(`${a.record.id} labelled ${name}.`);
    showProgress(reply.progress);
    await advance();
  });
}

function skip() {
  guarded(async () => {
    const a = state.current;
    if (!a || !a.record) return;
    if (a.round !== undefined) {
      await postJson(`pools/${encodeURIComponent(state.pool)}/queue/skip`,
        { round: a.round, position: a.position }, REPEATABLE);
    }
    say(a.relabel ? `${a.record.id} stays without your label; it goes back to the queue.`
      : `${a.record.id} skipped; it goes back to the queue for someone else.`);
    await advance();
  });
}

/**
 * Takes back one of the person's labels (the newest when no record is named: a stack, one label
 * per press) and shows that record again to be labelled anew. A record taken back before and not
 * yet labelled again waits its turn; a fresh record on the desk goes back to the queue.
 */
function undo(recordId) {
  guarded(async () => {
    const target = recordId || (state.recent[0] && state.recent[0].record);
    if (!target) return;
    const enc = encodeURIComponent(state.pool);
    const reply = await postJson(`pools/${enc}/labels/undo`, { record: target });
    state.labelledThisSession = Math.max(0, state.labelledThisSession - 1);
    const current = state.current;
    if (current && current.record && current.record.id !== target) {
      if (current.relabel) state.relabel.push(current);
      else if (current.round !== undefined) {
        // The record we moved on to goes back to the queue (not a skip: it may come back to us).
        await postJson(`pools/${enc}/queue/release`, { round: current.round, position: current.position },
          REPEATABLE);
      }
    }
    // The server hands a taken-back record to its labeller first while the served queue holds it.
    const again = await postJson(`pools/${enc}/queue/next`, {}, REPEATABLE);
    let shown;
    if (again.record && again.record.id === target) {
      shown = { ...again, relabel: true };
    } else {
      const { label: _l, labelled_by: _b, labelled_at: _t, note: _n, ...record } = reply.record;
      shown = { record, relabel: true, reason: 'The served queue no longer holds it; label it again here.' };
    }
    shown.reason = `Taken back (your label was ${reply.withdrawn}). ${shown.reason || ''}`.trim();
    show(shown);
    showProgress(reply.progress);
    await loadRecent();
    say(`Took back ${reply.withdrawn} for ${target}; label it again.`);
  });
}

function toggleBelief() {
  if (!state.current || !state.current.belief) return;
  state.beliefOpen = !state.beliefOpen;
  if (!state.current.spot_check) {
    state.showBelief = state.beliefOpen;
    localStorage.setItem(BELIEF_KEY, String(state.showBelief));
  }
  renderBelief();
}

function onKey(event) {
  if (event.target === $('note')) {
    if (event.key === 'Enter' || event.key === 'Escape') {
      event.preventDefault();
      $('note').blur();
    }
    return;
  }
  if (event.ctrlKey || event.metaKey || event.altKey || $('desk').hidden) return;
  if (['INPUT', 'SELECT', 'TEXTAREA'].includes(event.target.tagName)) return;
  if (event.key === ' ') {
    event.preventDefault();
    skip();
  } else if (event.key === 'Backspace') {
    event.preventDefault();
    undo(null);
  } else if (event.key === '.') {
    toggleBelief();
  } else if (event.key === '/') {
    event.preventDefault();
    $('note').focus();
  } else {
    const c = state.classes.find((x) => x.key && x.key === event.key.toLowerCase());
    if (c) {
      event.preventDefault();
      label(c.name);
    }
  }
}

/** The overview's keep-labelling headline, in one line under the progress line. */
async function showKeep() {
  try {
    const k = await getJson(`pools/${encodeURIComponent(state.pool)}/advice`);
    $('keep-line').textContent = k.headline;
  } catch (e) {
    $('keep-line').textContent = '';
  }
}

function listen() {
  const events = new EventSource(`api/v1/events?pool=${encodeURIComponent(state.pool)}`);
  events.addEventListener('round', (e) => {
    const data = JSON.parse(e.data);
    if (data.status === 'published') {
      showProgress({ ...state.progress, served_round: data.round });
      showKeep();
      say(`Round ${data.round} is ready: ${data.queued} records picked.`);
      if (state.busy) {
        state.wantNext = true;
      } else if (!state.current || !state.current.record) {
        guarded(next);
      }
    } else if (data.status === 'failed') {
      say(`Round ${data.round} failed; the current queue stays in service.`, true);
    }
  });
  events.addEventListener('label', (e) => {
    const data = JSON.parse(e.data);
    showProgress({ ...state.progress, labels_to_next_round: data.labels_to_next_round });
  });
}

async function begin() {
  if (document.activeElement) document.activeElement.blur();
  $('desk').hidden = false;
  const pool = await getJson(`pools/${encodeURIComponent(state.pool)}`);
  state.classes = pool.classes;
  state.scales = scalesOf(pool);
  renderChoices();
  showProgress();
  showKeep();
  listen();
  await Promise.all([next(), loadRecent()]);
}

function start() {
  state.pool = new URLSearchParams(location.search).get('pool');
  if (!state.pool) {
    location.href = './';
    return;
  }
  document.title = `Dowser · desk · ${state.pool}`;
  $('desk-pool').textContent = `labelling ${state.pool}`;
  $('to-overview').href = `overview.html?pool=${encodeURIComponent(state.pool)}`;
  $('skip').addEventListener('click', skip);
  // A closed tab gives its record back at once instead of holding it until the lease runs out.
  window.addEventListener('pagehide', () => {
    const a = state.current;
    if (a && a.record && a.round !== undefined) {
      postJsonOnLeave(`pools/${encodeURIComponent(state.pool)}/queue/release`, { round: a.round, position: a.position });
    }
  });
  $('undo').addEventListener('click', () => undo(null));
  $('belief-toggle').addEventListener('click', toggleBelief);
  document.addEventListener('keydown', onKey);
  showAccount()
    .then((me) => {
      state.person = me.name;
      return begin();
    })
    .catch((e) => say(e.message, true));
}

start();
