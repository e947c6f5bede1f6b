// The accounts page (admins): list, add, change role, disable or enable, set a new password.
import { getJson, postJson, putJson } from './api.js';
import { showAccount } from './account.js';
import { cell, showMessage } from './dom.js';

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
    cell(row, new Date(u.created_at).toLocaleDateString());
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
