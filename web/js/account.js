// The account corner of the masthead on every signed-in page: who, their role, the pages their
// role may open, and signing out. Parts of a page marked data-role="admin" or "reviewer" are
// removed for roles below that; the server refuses those calls anyway, this only keeps the page honest.
import { session, deleteJson } from './api.js';
import { el } from './dom.js';

const RANK = { labeller: 0, reviewer: 1, admin: 2 };

export function allows(me, role) {
  return RANK[me.role] >= RANK[role];
}

export async function showAccount() {
  const me = await session();
  for (const el of document.querySelectorAll('[data-role]')) {
    if (!allows(me, el.dataset.role)) el.remove();
  }
  const corner = document.getElementById('account');
  if (!corner) return me;
  corner.replaceChildren();
  const links = [['./', 'pools']];
  if (allows(me, 'reviewer')) links.push(['review.html', 'review']);
  if (allows(me, 'admin')) links.push(['users.html', 'accounts']);
  for (const [href, label] of links) {
    const a = document.createElement('a');
    a.className = 'masthead-link';
    a.href = href;
    a.textContent = label;
    corner.append(a);
  }
  const who = document.createElement('a');
  who.className = 'who';
  who.href = 'account.html';
  who.title = 'your account and API tokens';
  who.append(me.name, el('span', 'role', ` · ${me.role}`));
  const out = document.createElement('button');
  out.type = 'button';
  out.className = 'sign-out';
  out.id = 'sign-out';
  out.textContent = 'Sign out';
  out.addEventListener('click', async () => {
    try {
      await deleteJson('session');
    } finally {
      location.assign('login.html');
    }
  });
  corner.append(who, out);
  return me;
}
