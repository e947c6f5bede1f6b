// Your account: who you are signed in as, your password, and your API tokens (made, shown once, revoked).
import { getJson, postJson, putJson, deleteJson } from './api.js';
import { showAccount } from './account.js';
import { cell, showMessage, stamp } from './dom.js';

const $ = (id) => document.getElementById(id);

const say = (text, isError = false) => showMessage('tokens-message', text, isError);

/** Your live tokens; a revoked one leaves the list at once. */
async function showTokens() {
  const { tokens } = await getJson('tokens');
  const body = $('tokens').tBodies[0];
  body.replaceChildren();
  $('tokens-none').hidden = tokens.length > 0;
  // No header over an empty list: the sentence says there is none.
  $('tokens').closest('.table-wrap').hidden = tokens.length === 0;
  for (const t of tokens) {
    const row = document.createElement('tr');
    row.dataset.token = t.id;
    for (const v of [t.name, stamp(t.created_at)]) cell(row, v);
    const revoke = document.createElement('button');
    revoke.type = 'button';
    revoke.textContent = 'Revoke';
    revoke.addEventListener('click', async () => {
      try {
        await deleteJson(`tokens/${t.id}`);
        say(`Revoked the token “${t.name}”: it no longer signs anything in.`);
        await showTokens();
      } catch (e) {
        say(e.message, true);
      }
    });
    cell(row, revoke);
    body.append(row);
  }
}

$('new-token').addEventListener('submit', async (event) => {
  event.preventDefault();
  const form = event.target;
  try {
    const made = await postJson('tokens', { name: form.purpose.value.trim() });
    $('token-text').textContent = made.token;
    $('token-shown').hidden = false;
    say(made.message);
    form.reset();
    await showTokens();
  } catch (e) {
    say(e.message, true);
  }
});

$('change-password').addEventListener('submit', async (event) => {
  event.preventDefault();
  const form = event.target;
  if (form.password.value !== form.again.value) {
    showMessage('password-message', 'the two new passwords differ', true);
    return;
  }
  try {
    const done = await putJson('session/password', { current: form.current.value, password: form.password.value });
    showMessage('password-message', done.message);
    form.reset();
  } catch (e) {
    showMessage('password-message', e.message, true);
  }
});

async function start() {
  const me = await showAccount();
  $('me').textContent = `${me.name} · ${me.role}`;
  await showTokens();
}

start().catch((e) => say(e.message, true));
