// Writes docs/screenshot.png: the page at 1280 px wide, opened from file:// with
// the network refused. Run from anywhere: node e2e/screenshot.mjs
// (HIBERNAL_PAGE and HIBERNAL_SHOT override the page and the output path.)
import { resolve } from 'node:path';
import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import { REPO, launch, openPage, assertNoProblems } from './helpers.mjs';

const out = resolve(process.env.HIBERNAL_SHOT || resolve(REPO, 'docs/screenshot.png'));
const browser = await launch();
try {
  const { page, problems } = await openPage(browser, { width: 1280, height: 1000 });
  await page.waitForTimeout(150);
  mkdirSync(dirname(out), { recursive: true });
  await page.screenshot({ path: out, fullPage: true });
  assertNoProblems(problems);
  console.log(out);
} finally {
  await browser.close();
}
