// Small helpers every page uses to build elements. Text always goes in as text, never as markup.

/** An element with an optional class and text. */
export function el(tag, className, value) {
  const e = document.createElement(tag);
  if (className) e.className = className;
  if (value !== undefined) e.textContent = value;
  return e;
}

/** Appends a table cell holding text (or an element) to a row; returns the cell. */
export function cell(row, value, className) {
  const td = document.createElement('td');
  if (value instanceof Node) td.append(value);
  else td.textContent = value;
  if (className) td.className = className;
  row.append(td);
  return td;
}

const two = (n) => String(n).padStart(2, '0');

/** A date as the same unambiguous piece on every page and in every locale: 2026-12-02. */
export function day(iso) {
  const d = new Date(iso);
  return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())}`;
}

/** A moment in local time to the minute, in one unbroken piece: 2026-12-02 09:30. */
export function stamp(iso) {
  const d = new Date(iso);
  return `${day(iso)}\u00a0${two(d.getHours())}:${two(d.getMinutes())}`;
}

/** Shows a message in the element with this id, as an error or not. */
export function showMessage(id, text, isError = false) {
  const m = document.getElementById(id);
  m.textContent = text;
  m.className = isError ? 'message error' : 'message';
}
