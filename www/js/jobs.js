// Sliced jobs: the core's long runs (the winter, the building edge, their searches) are
// advanced a slice at a time from timers, so the page stays responsive and shows progress.
// A newer input cancels the job under way.
import { $, el, clear } from './dom.js';
import { state, flow } from './state.js';
import { generalError, listErrors } from './messages.js';

// The time one slice of a job may take.
export const SLICE_MS = 14;

// Drives a sliced core job (`advance(ms)` → {ok, fraction, finished, errors?}) from
// timers: `live()` false stops it (a newer input won, and `stopped()` tidies up); `bar` and
// `status` (ids) show the progress, `busy` in words; `failed(errors)` or `done(ms)` end it.
export function driveJob(job, o) {
  const t0 = performance.now();
  const slice = () => {
    if (!o.live()) { if (o.stopped) o.stopped(); return; }
    const st = job.advance(SLICE_MS);
    $(o.bar).value = st.fraction;
    if (!st.ok) { o.failed(st.errors || []); return; }
    if (!st.finished) {
      $(o.status).textContent = o.busy + ' ' + Math.round(st.fraction * 100) + ' %';
      setTimeout(slice, 0);
      return;
    }
    o.done(performance.now() - t0);
  };
  $(o.status).textContent = o.busy;
  $(o.bar).value = 0;
  slice();
}

export const msWords = (ms) => (ms < 1000 ? Math.round(ms) + ' ms' : (ms / 1000).toFixed(1) + ' s');

// ---------- a section's run ----------
// The run of a section (the winter, the edge), started `delayMs` after the recompute so
// typing several characters runs it once. o: { key (the scenario's section), results,
// errors, bar, status (ids), busy (words while it runs), what (its name in an error),
// delayMs, clearFirst? (a selector: the field messages cleared before it starts), make()
// (the core's job), describe(path) (a field named away from its input), render() (shows
// `report` and draws from `job`) }.
//
// `#<results>` carries data-state (idle, pending, running, done, stale) and, for the
// tests, data-runs, data-outcomes and data-ms; `changed(state)`, if given, hears each
// change of it (after render() for done).
export function slicedRun(o) {
  const r = {
    job: null, // the job that finished last (drawn from), or null
    running: null, // the job under way
    report: null,
    generation: 0, // a newer generation cancels the run under way
    timer: 0,
  };
  const changed = (st) => { if (o.changed) o.changed(st); };
  r.cancel = () => {
    clearTimeout(r.timer);
    r.generation++;
    if (r.running) { r.running.free(); r.running = null; }
  };
  // Marks the results out of date (`why` in the status line).
  r.stale = (stale, why) => {
    const res = $(o.results);
    res.classList.toggle('is-stale', stale);
    if (stale) {
      res.dataset.state = 'stale';
      res.dataset.outcomes = String(Number(res.dataset.outcomes || 0) + 1);
      $(o.status).textContent = why || 'Out of date: fix the marked inputs.';
      changed('stale');
    }
  };
  // Its part of the recompute: a run a little later, or, `blocked`, results out of date.
  r.schedule = (blocked) => {
    r.cancel();
    const res = $(o.results);
    if (!state.scenario[o.key]) { res.dataset.state = 'idle'; changed('idle'); return; }
    if (blocked) { r.stale(true); return; }
    res.dataset.state = 'pending';
    changed('pending');
    r.timer = setTimeout(start, o.delayMs);
  };
  // The section is gone or another scenario opened: no run, no results.
  r.drop = () => {
    r.cancel();
    if (r.job) { r.job.free(); r.job = null; }
    r.report = null;
  };
  const showErrors = (errors) => listErrors($(o.errors), errors, o.describe);
  function start() {
    if (o.clearFirst) for (const m of document.querySelectorAll(o.clearFirst + ' .field-msg')) clear(m);
    const res = $(o.results);
    const list = $(o.errors);
    clear(list); list.hidden = true;
    const gen = ++r.generation;
    let job;
    try {
      job = o.make();
    } catch (err) {
      console.error(err);
      generalError(o.what + ' failed unexpectedly: ' + String(err && err.message || err));
      return;
    }
    const errs = job.errors();
    if (errs && errs.length) {
      job.free();
      showErrors(errs);
      r.stale(true);
      return;
    }
    r.running = job;
    res.dataset.state = 'running';
    changed('running');
    driveJob(job, {
      bar: o.bar, status: o.status, busy: o.busy,
      live: () => gen === r.generation,
      failed: (errors) => {
        r.running = null;
        job.free();
        showErrors(errors);
        r.stale(true, 'The run stopped.');
      },
      done: (ms) => {
        r.running = null;
        if (r.job) r.job.free();
        r.job = job;
        r.report = job.report();
        res.classList.remove('is-stale');
        res.dataset.state = 'done';
        res.dataset.runs = String(Number(res.dataset.runs || 0) + 1);
        res.dataset.outcomes = String(Number(res.dataset.outcomes || 0) + 1);
        res.dataset.ms = String(Math.round(ms));
        $(o.status).textContent = 'Done in ' + msWords(ms) + '.';
        o.render();
        changed('done');
      },
    });
  }
  return r;
}

// ---------- a search box ----------
// A search box (the winter's least thickness, the edge's least insulation), the element
// `#<id>` (data-state idle, running, done, stale; data-runs) with parts `<id>-errors`,
// `-go`, `-status`, `-progress`, `-answer`. o: { id, draft() (the search being set up),
// typed(draft) (its inputs that are not numbers yet, as {label}), keep(draft) (copies it
// into the scenario: it is saved with it from now on), make() (the core's job),
// describe(path), render() (shows `report`, or clears it when null) }.
export function searchBox(o) {
  const s = {
    report: null, // the report of the search that finished last
    job: null, // the search under way
    basis: null, // the scenario (JSON) it was started on
    gen: 0,
  };
  const part = (name) => $(o.id + '-' + name);
  // The scenario changed since the search: stop it, mark its answer out of date.
  s.stale = () => {
    const box = $(o.id);
    if (s.job) { s.gen++; s.job.free(); s.job = null; part('go').disabled = false; }
    if (box.dataset.state === 'done' || box.dataset.state === 'running') {
      box.dataset.state = 'stale';
      part('status').textContent = 'Out of date: the scenario changed since this search. Run it again.';
      part('answer').classList.add('is-stale');
    }
  };
  // The page recomputed: the search is out of date only if the scenario it ran on changed
  // (compared as JSON, SI throughout; a change of units changes nothing in it).
  s.edited = () => {
    if (s.basis == null || JSON.stringify(state.scenario) !== s.basis) s.stale();
  };
  // The answer shown again (in other units): still marked out of date if it was.
  s.show = () => {
    if (!s.report) return;
    o.render();
    if ($(o.id).dataset.state === 'stale') part('answer').classList.add('is-stale');
  };
  // Another scenario opened: no search, no answer.
  s.reset = () => {
    s.report = null;
    s.basis = null;
    s.stale();
    $(o.id).dataset.state = 'idle';
    part('status').textContent = '';
    o.render();
  };
  // The draft once every typed number parses (else the labels that do not, listed in the
  // box, and null). An edit still waiting for its recompute would mark the new search out
  // of date as soon as it started: recompute first.
  const ready = () => {
    if ($('results').dataset.pending === 'true') flow.run();
    const list = part('errors');
    clear(list); list.hidden = true;
    for (const m of document.querySelectorAll('#' + o.id + ' .field-msg')) clear(m);
    const d = o.draft();
    const typed = o.typed(d);
    if (typed.length) {
      for (const b of typed) list.append(el('li', { text: b.label + ': enter a number' }));
      list.hidden = false;
      return null;
    }
    return d;
  };
  s.start = () => {
    const d = ready();
    if (!d) return;
    o.keep(d);
    const box = $(o.id);
    const list = part('errors');
    const go = part('go');
    const status = part('status');
    if (s.job) { s.job.free(); s.job = null; }
    const gen = ++s.gen;
    let job;
    try {
      job = o.make();
    } catch (err) {
      console.error(err);
      generalError('The search failed unexpectedly: ' + String(err && err.message || err));
      return;
    }
    const refused = (errors, beside) => {
      listErrors(list, errors, o.describe, beside);
      box.dataset.state = 'stale';
    };
    const errs = job.errors();
    if (errs && errs.length) {
      job.free();
      refused(errs, true);
      status.textContent = 'Fix the marked inputs.';
      return;
    }
    s.job = job;
    // The scenario this search answers for (with the search kept into it).
    s.basis = JSON.stringify(state.scenario);
    box.dataset.state = 'running';
    go.disabled = true;
    driveJob(job, {
      bar: o.id + '-progress', status: o.id + '-status', busy: 'Searching…',
      live: () => gen === s.gen,
      stopped: () => { go.disabled = false; },
      failed: (errors) => {
        refused(errors, false);
        status.textContent = 'The search stopped.';
        go.disabled = false;
        job.free(); s.job = null;
      },
      done: (ms) => {
        s.report = job.report();
        job.free(); s.job = null;
        go.disabled = false;
        box.dataset.state = 'done';
        box.dataset.runs = String(Number(box.dataset.runs || 0) + 1);
        status.textContent = 'Done in ' + (ms / 1000).toFixed(1) + ' s, ' + s.report.trials.length + ' winters run.';
        o.render();
      },
    });
  };
  return s;
}
