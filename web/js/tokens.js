// Your account: who you are signed in as, your password, and your API tokens (made, shown once, revoked).
import { getJson, postJson, putJson, deleteJson } from './api.js';
import { showAccount } from './account.js';

const $ = (id) => document.getElementById(id);

function say(text, isError = false) {
  $('tokens-message').textContent = text;
  $('tokens-message').className = isError ? 'message error' : 'message';
}

async function showTokens() {
  const { tokens } = await getJson('tokens');
  const body = $('tokens').tBodies[0];
  body.replaceChildren();
  for (const t of tokens) {
    const row = document.createElement('tr');
    for (const v of [t.name, new Date(t.created_at).toLocaleString(), t.revoked_at ? 'revoked' : 'live']) {
      const td = document.createElement('td');
      td.textContent = v;
      row.append(td);
    }
    const td = document.createElement('td');
    if (!t.revoked_at) {
      const revoke = document.createElement('button');
      revoke.type = 'button';
      revoke.textContent = 'Revoke';
      revoke.addEventListener('click', async () => {
        try {
          await deleteJson(`tokens/${t.id}`);
          say(`token for ${t.name} revoked`);
          await showTokens();
        } catch (e) {
          say(e.message, true);
        }
      });
      td.append(revoke);
    }
    row.append(td);
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
  const message = $('password-message');
  if (form.password.value !== form.again.value) {
    message.textContent = 'the two new passwords differ';
    message.className = 'message error';
    return;
  }
  try {
    const done = await putJson('session/password', { current: form.current.value, password: form.password.value });
    message.textContent = done.message;
    message.className = 'message';
    form.reset();
  } catch (e) {
    message.textContent = e.message;
    message.className = 'message error';
  }
});

async function start() {
  const me = await showAccount();
  $('me').textContent = `${me.name} · ${me.role}`;
  await showTokens();
}

start().catch((e) => say(e.message, true));
