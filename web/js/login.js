// Signing in, then back to the page that sent you here (on this site only).
import { showMessage } from './dom.js';

const $ = (id) => document.getElementById(id);

const say = (text) => showMessage('login-message', text, true);

/**
 * The page to return to: only a path on this very site. The address is resolved the way the
 * browser would resolve it (so `/\evil.example`, `//evil.example` or `https:evil.example` show
 * their true origin) and refused unless it stays on this origin.
 */
export function nextPage(search = location.search, origin = location.origin) {
  const next = new URLSearchParams(search).get('next');
  if (!next || !next.startsWith('/') || /[\u0000-\u001f\\]/.test(next)) return './';
  try {
    const url = new URL(next, origin);
    return url.origin === origin ? url.pathname + url.search + url.hash : './';
  } catch (e) {
    return './';
  }
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

$('sign-in').addEventListener('submit', async (event) => {
  event.preventDefault();
  const form = event.target;
  try {
    await post('session', { name: form.account.value.trim(), password: form.password.value });
    location.assign(nextPage());
  } catch (e) {
    say(e.message);
    form.password.value = '';
    form.password.focus();
  }
});

$('sign-in').querySelector('input').focus();
