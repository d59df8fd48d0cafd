// High-DPI screens: the chart's backing store follows devicePixelRatio, so it stays sharp.
import test from 'node:test';
import assert from 'node:assert/strict';
import { launch, openPage, assertNoProblems, chartInkedPixels } from './helpers.mjs';

test('on a 2× screen the chart is drawn at twice its CSS size', async () => {
  const browser = await launch();
  try {
    const { page, problems } = await openPage(browser, { width: 1280, height: 900 }, 2);
    const box = await page.locator('#profile-chart').boundingBox();
    const ink = await chartInkedPixels(page);
    assert.ok(Math.abs(ink.width - 2 * box.width) <= 2, `backing width ${ink.width} vs CSS ${box.width}`);
    assert.ok(Math.abs(ink.height - 2 * box.height) <= 2, `backing height ${ink.height} vs CSS ${box.height}`);
    assert.ok(ink.n > 10000, `the chart is drawn (${ink.n} inked pixels)`);
    if (process.env.HIBERNAL_HIDPI_SHOT) await page.locator('#profile-chart').screenshot({ path: process.env.HIBERNAL_HIDPI_SHOT });
    assertNoProblems(problems);
  } finally {
    await browser.close();
  }
});
