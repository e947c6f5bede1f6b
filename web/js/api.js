// The one place pages talk to the server: JSON in, JSON out, errors as thrown messages.
const BASE = 'api/v1';

export async function getJson(path) {
  const response = await fetch(`${BASE}/${path}`, { headers: { Accept: 'application/json' } });
  return unwrap(response);
}

export async function postBody(path, body, contentType) {
  const response = await fetch(`${BASE}/${path}`, {
    method: 'POST',
    headers: { 'Content-Type': contentType, Accept: 'application/json' },
    body,
  });
  return unwrap(response);
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
  if (!response.ok) {
    throw new Error(data && data.error ? data.error : `request failed with status ${response.status}`);
  }
  return data;
}

export async function postJson(path, value) {
  return postBody(path, JSON.stringify(value), 'application/json');
}

export async function putJson(path, value) {
  const response = await fetch(`${BASE}/${path}`, {
    method: 'PUT',
    headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
    body: JSON.stringify(value),
  });
  return unwrap(response);
}
