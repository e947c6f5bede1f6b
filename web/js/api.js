// The one place pages talk to the server: JSON in, JSON out, errors as thrown messages. Requests
// that change something carry the session's forgery token; a lapsed session leads to the sign-in page.
const BASE = 'api/v1';
const CSRF_HEADER = 'X-Dowser-Csrf';

let sessionPromise = null;
let csrfToken = null;

/** The signed-in account: {name, role, csrf}; asked once per page. */
export function session() {
  if (!sessionPromise) {
    sessionPromise = getJson('session').then((me) => {
      csrfToken = me.csrf;
      return me;
    });
  }
  return sessionPromise;
}

export function toSignIn() {
  const here = location.pathname + location.search;
  location.assign(`login.html?next=${encodeURIComponent(here)}`);
}

export async function getJson(path) {
  const response = await fetch(`${BASE}/${path}`, { headers: { Accept: 'application/json' } });
  return unwrap(response);
}

// A busy answer (503) changed nothing. A call that is safe to repeat waits as the server asks
// (Retry-After, at most BUSY_WAIT_MAX_MS) and goes again, up to BUSY_RETRIES times, before the
// person sees the message.
const BUSY_RETRIES = 3;
const BUSY_WAIT_MAX_MS = 5000;

function busyWaitMs(response, retry) {
  const seconds = Number(response.headers.get('Retry-After'));
  const ms = Number.isFinite(seconds) && seconds > 0 ? seconds * 1000 : 1000 * retry;
  return Math.min(ms, BUSY_WAIT_MAX_MS);
}

async function send(method, path, body, contentType, { retryBusy = false } = {}) {
  const { csrf } = await session();
  const headers = { Accept: 'application/json', [CSRF_HEADER]: csrf };
  if (contentType) headers['Content-Type'] = contentType;
  for (let retry = 1; ; retry += 1) {
    const response = await fetch(`${BASE}/${path}`, { method, headers, body });
    if (response.status !== 503 || !retryBusy || retry > BUSY_RETRIES) return unwrap(response);
    await new Promise((resolve) => { setTimeout(resolve, busyWaitMs(response, retry)); });
  }
}

export function postBody(path, body, contentType) {
  return send('POST', path, body, contentType);
}

/** POSTs JSON; with { retryBusy: true } a busy answer is tried again (only for calls safe to repeat). */
export function postJson(path, value, options) {
  return send('POST', path, JSON.stringify(value), 'application/json', options);
}

export function putJson(path, value) {
  return send('PUT', path, JSON.stringify(value), 'application/json');
}

export function deleteJson(path) {
  return send('DELETE', path, undefined, undefined);
}

/**
 * Sends a file as the body of a POST, calling onProgress(sentBytes, totalBytes) as it goes (fetch
 * cannot report an upload's progress; XMLHttpRequest can). Resolves with the JSON reply.
 */
export async function postFile(path, file, onProgress) {
  const { csrf } = await session();
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `${BASE}/${path}`);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.setRequestHeader('Content-Type', 'application/octet-stream');
    xhr.setRequestHeader(CSRF_HEADER, csrf);
    xhr.upload.onprogress = (e) => onProgress(e.loaded, e.lengthComputable ? e.total : file.size);
    xhr.onerror = () => reject(new Error('the upload was cut off before the server answered; try again'));
    xhr.onload = () => {
      unwrap(new Response(xhr.responseText, { status: xhr.status })).then(resolve, reject);
    };
    xhr.send(file);
  });
}

/**
 * Sends a JSON POST that outlives the page (a tab closing): fire and forget, no answer read. Needs
 * the session to have been asked for already.
 */
export function postJsonOnLeave(path, value) {
  if (!csrfToken) return;
  fetch(`${BASE}/${path}`, {
    method: 'POST',
    keepalive: true,
    headers: { 'Content-Type': 'application/json', [CSRF_HEADER]: csrfToken },
    body: JSON.stringify(value),
  });
}

export function apiUrl(path) {
  return `${BASE}/${path}`;
}

async function unwrap(response) {
  const text = await response.text();
  let data = null;
  try {
    data = text ? JSON.parse(text) : null;
  } catch (e) {
    throw new Error(`the server sent something that is not JSON (status ${response.status})`);
  }
  if (response.status === 401 && !location.pathname.endsWith('login.html')) {
    toSignIn();
  }
  if (!response.ok) {
    throw new Error(data && data.error ? data.error : `request failed with status ${response.status}`);
  }
  return data;
}
