// The accounts page (admins): list, add, change role, disable or enable, set a new password, see
// and revoke anyone's API tokens.
import { getJson, postJson, putJson, deleteJson } from './api.js';
import { showAccount } from './account.js';
import { cell, day, showMessage, stamp } from './dom.js';

const $ = (id) => document.getElementById(id);
const ROLES = ['labeller', 'reviewer', 'admin'];
let me = null;

const say = (text, isError = false) => showMessage('users-message', text, isError);

async function change(name, body, done) {
  try {
    await putJson(`users/${encodeURIComponent(name)}`, body);
    say(done);
    await showUsers();
  } catch (e) {
    say(e.message, true);
  }
}

async function showUsers() {
  const { users } = await getJson('users');
  const body = $('users').tBodies[0];
  body.replaceChildren();
  for (const u of users) {
    const row = document.createElement('tr');
    row.dataset.user = u.name;
    cell(row, u.name);
    const role = document.createElement('select');
    role.setAttribute('aria-label', `role of ${u.name}`);
    for (const r of ROLES) role.append(new Option(r, r, false, r === u.role));
    role.disabled = u.name === me.name;
    role.addEventListener('change', () => change(u.name, { role: role.value }, `${u.name} is now ${role.value}`));
    cell(row, role);
    cell(row, u.disabled ? 'disabled' : 'active');
    cell(row, day(u.created_at));
    cell(row, tokensCell(u, row));
    const actions = document.createElement('div');
    actions.className = 'inline-actions';
    if (u.name !== me.name) {
      const toggle = document.createElement('button');
      toggle.type = 'button';
      toggle.textContent = u.disabled ? 'Enable' : 'Disable';
      toggle.addEventListener('click', () => change(u.name, { disabled: !u.disabled },
        `${u.name} ${u.disabled ? 'enabled' : 'disabled'}`));
      actions.append(toggle);
    }
    const reset = document.createElement('form');
    reset.className = 'inline-form';
    const pw = document.createElement('input');
    pw.type = 'password';
    pw.minLength = 10;
    pw.maxLength = 200;
    pw.required = true;
    pw.autocomplete = 'new-password';
    pw.placeholder = 'new password';
    pw.setAttribute('aria-label', `new password for ${u.name}`);
    const set = document.createElement('button');
    set.type = 'submit';
    set.textContent = 'Set password';
    reset.append(pw, set);
    reset.addEventListener('submit', (event) => {
      event.preventDefault();
      change(u.name, { password: pw.value }, `password of ${u.name} set`);
    });
    actions.append(reset);
    cell(row, actions);
    body.append(row);
  }
}

/** The count of an account's live tokens, and a button that lists them under its row, each to revoke. */
function tokensCell(u, row) {
  const live = u.live_tokens || 0;
  if (!live) return 'none';
  const show = document.createElement('button');
  show.type = 'button';
  show.className = 'tokens-of';
  show.textContent = `${live} live`;
  show.setAttribute('aria-label', `API tokens of ${u.name}`);
  show.addEventListener('click', () => toggleTokens(u.name, row).catch((e) => say(e.message, true)));
  return show;
}

async function toggleTokens(name, row) {
  const open = row.nextElementSibling;
  if (open && open.classList.contains('token-list')) {
    open.remove();
    return;
  }
  const { tokens } = await getJson(`users/${encodeURIComponent(name)}/tokens`);
  const sub = document.createElement('tr');
  sub.className = 'token-list';
  const td = document.createElement('td');
  td.colSpan = row.children.length;
  const list = document.createElement('ul');
  for (const t of tokens) {
    const li = document.createElement('li');
    li.append(document.createTextNode(`“${t.name}”, made ${stamp(t.created_at)} `));
    const revoke = document.createElement('button');
    revoke.type = 'button';
    revoke.textContent = 'Revoke';
    revoke.addEventListener('click', async () => {
      try {
        await deleteJson(`users/${encodeURIComponent(name)}/tokens/${t.id}`);
        say(`Revoked ${name}'s token “${t.name}”.`);
        await showUsers();
      } catch (e) {
        say(e.message, true);
      }
    });
    li.append(revoke);
    list.append(li);
  }
  td.append(list);
  sub.append(td);
  row.after(sub);
}

$('add-user').addEventListener('submit', async (event) => {
  event.preventDefault();
  const form = event.target;
  try {
    await postJson('users', { name: form.account.value.trim(), role: form.role.value, password: form.password.value });
    say(`${form.account.value.trim()} added`);
    form.reset();
    await showUsers();
  } catch (e) {
    say(e.message, true);
  }
});

async function start() {
  try {
    me = await showAccount();
    await showUsers();
  } catch (e) {
    say(e.message, true);
  }
}

start();
