// The first screen's frost answer (#frost-headline), at the top of the results: once the
// scenario has a winter, the winter run's deepest frost and its day, in the same words as
// the winter section's own figure (#w-max-frost), with a link down to that section; while
// the run is waiting or under way, or cannot run, it says so and shows no number; without
// a winter, that the frost depth needs one, with the button that adds it. The steady 0 °C
// plane is never shown here: it comes from constant temperatures, not from a winter.
import { $ } from './dom.js';

const WORDS = {
  'no-winter': ['Needs a winter', 'How deep frost goes depends on a whole winter of weather, not on the steady temperatures below. Add a winter to these layers to find it.'],
  running: ['Working it out…', 'The winter run below is under way; its deepest frost shows here when it is done.'],
  stale: ['Out of date', 'The winter run below could not run with these inputs: fix the marked inputs.'],
};

// h: { state: 'no-winter' | 'running' | 'stale' | 'done', value, when } (value and when:
// the winter's own words, for 'done').
export function showFrostHeadline(h) {
  const box = $('frost-headline');
  const [value, when] = h.state === 'done' ? [h.value, h.when] : WORDS[h.state];
  box.dataset.state = h.state;
  $('h-frost').textContent = value;
  $('h-frost-when').textContent = when;
  $('h-frost-link').hidden = h.state === 'no-winter';
  $('h-winter-add').hidden = h.state !== 'no-winter';
}

export function setUpFrostHeadline() {
  // The same as the winter section's own button (which adds the section and focuses it).
  $('h-winter-add').addEventListener('click', () => $('winter-add').click());
  $('h-frost-link').addEventListener('click', (e) => {
    e.preventDefault();
    const box = $('winter-results');
    if (typeof box.scrollIntoView === 'function') box.scrollIntoView({ block: 'start' });
  });
}
