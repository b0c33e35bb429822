// The review page's script: one field at a time, keyboard first. Every answer is posted at once and applied by the
// server through the same code as `formglean review apply`; the page keeps no state of its own that matters.
// Text from the records is only ever set with textContent, never parsed as HTML.

const $ = (id) => document.getElementById(id);
const ANSWERED = new Set(['corrected', 'confirmed']);

const state = { rows: [], view: [], index: 0, history: [], busy: false, newQueueCommand: '' };

function answered(row) {
  return row.now !== null && ANSWERED.has(row.now.status);
}

function say(message) {
  $('message').textContent = message;
  $('error').textContent = '';
}

function fail(message) {
  $('error').textContent = message;
  $('message').textContent = '';
}

function fillSelect(select, values) {
  const keep = select.value;
  while (select.options.length > 1) select.remove(1);
  for (const v of values) select.add(new Option(v, v));
  if (values.includes(keep)) select.value = keep;
}

function fillFilters() {
  const uniq = (xs) => [...new Set(xs)].sort();
  fillSelect($('filter-form'), uniq(state.rows.map((r) => r.form).filter(Boolean)));
  fillSelect($('filter-field'), uniq(state.rows.map((r) => r.field)));
  fillSelect($('filter-reason'), uniq(state.rows.flatMap((r) => r.reasons.map((x) => x.code))));
}

/** The rows the filters let through, in queue order. */
function filtered() {
  const form = $('filter-form').value;
  const field = $('filter-field').value;
  const reason = $('filter-reason').value;
  const open = $('filter-open').checked;
  return state.rows.filter(
    (r) =>
      (!form || r.form === form) &&
      (!field || r.field === field) &&
      (!reason || r.reasons.some((x) => x.code === reason)) &&
      (!open || !answered(r) || r.rowId === currentId()),
  );
}

function currentId() {
  const row = state.view[state.index];
  return row ? row.rowId : null;
}

function progress() {
  const done = state.rows.filter(answered).length;
  const total = state.rows.length;
  const inView = state.view.filter(answered).length;
  $('progress').max = Math.max(1, total);
  $('progress').value = done;
  const filteredNote = state.view.length !== total ? `; ${inView} of ${state.view.length} in this view` : '';
  $('progress-text').textContent = `${done} of ${total} fields answered${filteredNote}`;
}

function setImage(img, name, alt) {
  if (name) {
    img.src = name;
    img.alt = alt;
    img.hidden = false;
  } else {
    img.removeAttribute('src');
    img.alt = '';
    img.hidden = true;
  }
}

function describeNow(row) {
  if (row.now === null) return 'not in the results any more';
  const value = row.now.hasValue ? `"${row.now.value}"` : 'blank';
  const who = row.now.reviewer ? ` by ${row.now.reviewer}` : '';
  const note = row.now.note ? ` (note: ${row.now.note})` : '';
  return `${row.now.status}, ${value}${answered(row) ? who : ''}${note}`;
}

function show() {
  progress();
  const row = state.view[state.index];
  $('card').hidden = !row;
  $('empty').hidden = !!row;
  if (!row) {
    $('empty').textContent = state.rows.length === 0 ? 'The queue is empty: nothing waits for review.' : 'Every field in this view is answered. Change the filters to see others.';
    return;
  }
  $('field-title').textContent = `${row.field} — ${row.document}, page ${row.page}`;
  $('position').textContent = `Field ${state.index + 1} of ${state.view.length} in this view · form ${row.form || 'unknown'}`;
  setImage($('crop'), row.crop, `Scan of field ${row.field}`);
  setImage($('context'), row.contextCrop, `Field ${row.field} among its neighbours`);
  $('value').textContent = row.value === '' ? '(nothing)' : row.value;
  $('ocr').textContent = row.raw === '' ? '(nothing)' : row.raw;
  $('type').textContent = row.type;
  $('confidence').textContent = row.confidence;
  $('now').textContent = describeNow(row);
  const list = $('reasons');
  list.replaceChildren();
  for (const r of row.reasons) {
    const li = document.createElement('li');
    const code = document.createElement('span');
    code.className = 'reason-code';
    code.textContent = r.code;
    li.append(code, ` — ${r.meaning} Check: ${r.check}`);
    list.append(li);
  }
  if (row.reasons.length === 0) list.append(Object.assign(document.createElement('li'), { textContent: 'No reason recorded.' }));
  $('accepts').textContent = row.accepts ?? 'the schema of this document cannot be loaded';
  $('stale').hidden = row.stale === null;
  $('stale').textContent = row.stale ?? '';
  $('correction').value = '';
  $('note').value = row.now?.note ?? '';
  $('correction').focus();
}

function refilter(keepId) {
  state.view = filtered();
  const at = state.view.findIndex((r) => r.rowId === keepId);
  state.index = at >= 0 ? at : Math.max(0, state.view.findIndex((r) => !answered(r)));
  show();
}

async function load() {
  const res = await fetch('api/rows', { cache: 'no-store' });
  if (!res.ok) throw new Error(`the queue could not be loaded (${res.status})`);
  const data = await res.json();
  state.rows = data.rows;
  state.newQueueCommand = data.newQueueCommand;
  fillFilters();
  state.view = filtered();
  state.index = Math.max(0, state.view.findIndex((r) => !answered(r)));
  show();
}

function move(step) {
  if (state.view.length === 0) return;
  const id = currentId();
  state.view = filtered();
  const at = state.view.findIndex((r) => r.rowId === id);
  const from = at >= 0 ? at : state.index;
  state.index = (from + step + state.view.length) % state.view.length;
  show();
  say('');
}

/** After an answer: the next field still waiting, after this one in queue order. */
function advance(fromId) {
  state.view = filtered();
  const from = Math.max(0, state.view.findIndex((r) => r.rowId === fromId));
  for (let k = 1; k <= state.view.length; k++) {
    const i = (from + k) % state.view.length;
    if (!answered(state.view[i])) {
      state.index = i;
      return show();
    }
  }
  state.view = state.view.filter((r) => !$('filter-open').checked || !answered(r));
  state.index = state.view.length;
  show();
}

async function post(row, body) {
  if (state.busy) return;
  state.busy = true;
  try {
    const res = await fetch('api/answer', {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ rowId: row.rowId, ...body }),
    });
    const out = await res.json();
    if (out.row) state.rows = state.rows.map((r) => (r.rowId === out.row.rowId ? out.row : r));
    if (!out.ok) {
      fail(out.message);
      $('correction').focus();
      return;
    }
    if (body.action === 'revert') {
      state.history = state.history.filter((id) => id !== row.rowId);
      refilter(row.rowId);
      say(`${row.field}: answer undone; the field waits again.`);
      return;
    }
    state.history.push(row.rowId);
    advance(row.rowId);
    say(`${row.field} of ${row.document}: ${out.message}, saved.`);
  } catch (err) {
    fail(`Not saved: ${err.message}`);
  } finally {
    state.busy = false;
  }
}

function current() {
  return state.view[state.index];
}

function save() {
  const row = current();
  if (!row) return;
  const text = $('correction').value.trim();
  const note = $('note').value.trim();
  if (text !== '') return post(row, { action: 'correct', text, note });
  if (row.now && !row.now.hasValue && row.value === '') {
    return fail('Nothing was read here: type the value, or press Alt+B if the field is really blank on the form.');
  }
  return post(row, { action: 'confirm', note });
}

function blank() {
  const row = current();
  if (row) post(row, { action: 'blank', note: $('note').value.trim() });
}

function undo() {
  let row = current();
  if (!row || !answered(row)) {
    const last = state.history[state.history.length - 1];
    row = state.rows.find((r) => r.rowId === last);
    if (!row) return fail('Nothing to undo.');
  }
  post(row, { action: 'revert' });
}

$('answer').addEventListener('submit', (e) => {
  e.preventDefault();
  save();
});
$('blank').addEventListener('click', blank);
$('undo').addEventListener('click', undo);
$('prev').addEventListener('click', () => move(-1));
$('next').addEventListener('click', () => move(1));
for (const id of ['filter-form', 'filter-field', 'filter-reason', 'filter-open']) $(id).addEventListener('change', () => refilter(currentId()));

document.addEventListener('keydown', (e) => {
  // e.code, not e.key: Alt+letter types a character on some keyboard layouts (macOS Option).
  if (e.altKey && !e.ctrlKey && !e.metaKey) {
    const action = { KeyB: blank, KeyU: undo, ArrowRight: () => move(1), ArrowLeft: () => move(-1) }[e.code];
    if (action) {
      e.preventDefault();
      action();
    }
    return;
  }
  if (e.key === 'PageDown' || e.key === 'PageUp') {
    e.preventDefault();
    move(e.key === 'PageDown' ? 1 : -1);
  } else if (e.key === 'Escape' && (e.target === $('correction') || e.target === $('note'))) {
    e.target.value = '';
  }
});

load().catch((err) => fail(err.message));
