// Signing in, or on a fresh server creating the first admin with the console's setup code.
import { getJson } from './api.js';
import { showMessage } from './dom.js';

const $ = (id) => document.getElementById(id);

const say = (text) => showMessage('login-message', text, true);

/** Only a path on this site may be the page to return to, never another site. */
function nextPage() {
  const next = new URLSearchParams(location.search).get('next');
  return next && next.startsWith('/') && !next.startsWith('//') ? next : './';
}

async function post(path, value) {
  const response = await fetch(`api/v1/${path}`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
    body: JSON.stringify(value),
  });
  const data = await response.json().catch(() => null);
  if (!response.ok) throw new Error(data && data.error ? data.error : `status ${response.status}`);
  return data;
}

async function signIn(name, password) {
  await post('session', { name, password });
  location.assign(nextPage());
}

$('sign-in').addEventListener('submit', async (event) => {
  event.preventDefault();
  const form = event.target;
  try {
    await signIn(form.account.value.trim(), form.password.value);
  } catch (e) {
    say(e.message);
    form.password.value = '';
    form.password.focus();
  }
});

$('setup').addEventListener('submit', async (event) => {
  event.preventDefault();
  const form = event.target;
  if (form.password.value !== form.again.value) {
    say('the two passwords differ');
    return;
  }
  try {
    await post('setup', { code: form.code.value.trim(), name: form.account.value.trim(), password: form.password.value });
    await signIn(form.account.value.trim(), form.password.value);
  } catch (e) {
    say(e.message);
  }
});

async function start() {
  try {
    const { setup_needed: setupNeeded } = await getJson('setup');
    const form = setupNeeded ? $('setup') : $('sign-in');
    form.hidden = false;
    form.querySelector('input').focus();
  } catch (e) {
    say(e.message);
  }
}

start();
