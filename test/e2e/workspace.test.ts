import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderDemoStems } from '../../server/seed/demo-stems';
import { startAppServer, type AppServer } from '../helpers/app-server';
import { openedDialog } from '../helpers/browser';

// The whole job in a real browser: a new song, generated stems, detection, a tuck
// drawn by dragging, a range of hits turned off, CSV and MIDI exports checked.
// Needs a prior `ng build` (dist/web/browser).
const screenshots = join(import.meta.dirname, '../../docs/screenshots');

describe('song workspace in Chromium', () => {
  let server: AppServer;
  let context: BrowserContext;
  let page: Page;
  let work: string;

  beforeAll(async () => {
    server = await startAppServer();
    work = mkdtempSync(join(tmpdir(), 'tuckline-e2e-ws-'));
    mkdirSync(screenshots, { recursive: true });
    // 120 BPM, 4 bars, four on the floor; the sub is silent in bar 3 so the bass gate has work.
    const stems = renderDemoStems({ bpm: 120, bars: 4, pattern: [0, 4, 8, 12], silentBassBars: [2] });
    writeFileSync(join(work, 'Kick_bounce.wav'), stems.kickWav);
    writeFileSync(join(work, '808 main.wav'), stems.bassWav);
    writeFileSync(join(work, 'liner-notes.txt'), 'not audio');
    context = await chromium.launchPersistentContext(join(work, 'profile'), {
      executablePath: '/usr/bin/chromium',
      headless: true,
      acceptDownloads: true,
      viewport: { width: 1440, height: 1000 },
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    page = context.pages()[0] ?? (await context.newPage());
  });

  afterAll(async () => {
    await context?.close();
    await server?.stop();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  const shot = (name: string) => page.screenshot({ path: join(screenshots, `${name}.png`), fullPage: true });
  const step = (name: string) => page.locator('tl-step-bar').getByRole('button', { name: new RegExp(`^\\s*${name}`) });

  it('signs in as the engineer and starts a song', async () => {
    await page.goto(`${server.url}/sign-in`);
    await page.getByLabel('E-mail').fill('engineer@tuckline.test');
    await page.getByLabel('Password').fill('tuckline-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/songs$/);
    await page.getByRole('button', { name: 'New song' }).first().click();
    const dialog = await openedDialog(page);
    await dialog.getByLabel('Title').fill('Tidewater');
    await dialog.getByLabel('Tempo').fill('120');
    await dialog.getByRole('button', { name: 'Create song' }).click();
    await page.waitForURL(/\/songs\/[^/?]+/);
    await expect.poll(() => page.locator('h1').textContent()).toBe('Tidewater');
  });

  it('uploads several stems with roles suggested from their names; refuses a text file beside it', async () => {
    await page.locator('tl-stems-panel input[type=file]').setInputFiles([join(work, 'Kick_bounce.wav'), join(work, '808 main.wav'), join(work, 'liner-notes.txt')]);
    const items = page.locator('tl-stems-panel li.item');
    await expect.poll(() => items.count()).toBe(3);
    expect(await items.nth(0).locator('mat-select').textContent()).toContain('kick');
    expect(await items.nth(1).locator('mat-select').textContent()).toContain('bass');
    expect(await items.nth(1).locator('input').inputValue()).toBe('808');
    expect(await items.nth(2).getByRole('alert').textContent()).toContain('WAV');
    await page.getByRole('button', { name: /^Upload 2 files/ }).click();
    await expect.poll(() => page.locator('tl-stems-panel li.state-done').count(), { timeout: 60_000 }).toBe(2);
    await expect.poll(() => page.locator('tl-stems-panel article.slot').count()).toBe(2);
    await expect.poll(() => step('Hits').textContent()).toContain('16 hits');
    await shot('workspace-stems');
  });

  it('shows the hits on the timeline and in the table, with the bass gate’s skips', async () => {
    await step('Hits').click();
    await expect.poll(() => page.locator('tl-hit-table tr.hit-row').count()).toBe(16);
    // Tuck needs a lane: add one, then the gate's skips show in bar 3.
    await step('Tuck').click();
    await page.getByRole('button', { name: 'Add lane' }).click();
    await expect.poll(() => page.locator('tl-tuck-panel li[role=option]').count()).toBe(1);
    await expect.poll(() => page.locator('tl-timeline g.hit.status-gated').count()).toBeGreaterThanOrEqual(3);
    await step('Hits').click();
    await expect.poll(() => page.locator('tl-hit-table tr.hit-row').count()).toBe(16);
    await shot('workspace-hits');
    await page.locator('tl-hit-table .filter mat-select').click();
    await page.getByRole('option', { name: 'Skipped by the bass gate' }).click();
    await expect.poll(() => page.locator('tl-hit-table tr.hit-row').count()).toBeGreaterThanOrEqual(3);
    expect(await page.locator('tl-hit-table tr.hit-row').count()).toBeLessThan(16);
  });

  it('drags a breakpoint and the whole song re-stamps at once', async () => {
    await step('Tuck').click();
    const curve = page.locator('tl-timeline path.curve').first();
    const before = await curve.getAttribute('d');
    const depthField = page.locator('tl-tuck-editor').getByLabel('Depth');
    expect(await depthField.inputValue()).toBe('-18');
    const point = page.locator('tl-tuck-editor circle.point[data-index="1"]');
    const box = (await point.boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width / 2 + 2, box.y + box.height / 2 + 40, { steps: 6 });
    await page.mouse.up();
    await expect.poll(() => curve.getAttribute('d')).not.toBe(before);
    // Wait until the drag has settled (two equal reads in a row) before reading its depth.
    let depth = Number.NaN;
    await expect
      .poll(async () => {
        const v = Number(await depthField.inputValue());
        const settled = v === depth;
        depth = v;
        return settled;
      })
      .toBe(true);
    expect(depth).toBeLessThan(-18);
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-index'))).toBe('1');
    // The keyboard twin: the point keeps focus; ArrowUp raises it 1 dB, Shift+ArrowUp 0.1 dB.
    await page.keyboard.press('ArrowUp');
    await page.keyboard.press('Shift+ArrowUp');
    await expect.poll(async () => Number(await depthField.inputValue())).toBeCloseTo(depth + 1.1, 5);
    // Undo brings the drawn depth back, one key press at a time; the drag is one step of its own.
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(async () => Number(await depthField.inputValue())).toBeCloseTo(depth + 1, 5);
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(async () => Number(await depthField.inputValue())).toBeCloseTo(depth, 5);
    await page.getByRole('button', { name: 'Undo' }).click();
    expect(Number(await depthField.inputValue())).toBe(-18);
    await page.getByRole('button', { name: 'Redo' }).click();
    await expect.poll(async () => Number(await depthField.inputValue())).toBeCloseTo(depth, 5);
    await expect.poll(() => page.locator('tl-tuck-panel .unsaved').count()).toBe(1);
    await shot('workspace-tuck');
    await page.getByRole('button', { name: 'Save to lane' }).click();
    await expect.poll(() => page.locator('tl-tuck-panel .unsaved').count()).toBe(0);
  });

  it('turns off every hit in a range selected on the timeline', async () => {
    const svg = page.locator('tl-timeline svg');
    const box = (await svg.boundingBox())!;
    const y = box.y + 60;
    await page.keyboard.down('Shift');
    await page.mouse.move(box.x + 70, y);
    await page.mouse.down();
    await page.mouse.move(box.x + 70 + (box.width - 80) * 0.3, y, { steps: 5 });
    await page.mouse.up();
    await page.keyboard.up('Shift');
    await page.getByRole('button', { name: 'Turn hits off' }).click();
    await expect.poll(() => page.locator('tl-timeline g.hit.status-off').count()).toBeGreaterThanOrEqual(2);
    const off = await page.locator('tl-timeline g.hit.status-off').count();
    // Hit edits undo and redo too.
    await step('Hits').click();
    await page.getByRole('button', { name: 'Undo hit edit' }).click();
    await expect.poll(() => page.locator('tl-timeline g.hit.status-off').count()).toBe(0);
    await page.locator('tl-hits-panel').getByRole('button', { name: 'Redo' }).click();
    await expect.poll(() => page.locator('tl-timeline g.hit.status-off').count()).toBe(off);
  });

  it('exports CSV and MIDI and downloads files with the song in their names', async () => {
    await step('Export').click();
    await page.getByRole('button', { name: 'New export…' }).click();
    let dialog = await openedDialog(page);
    const csvDownload = page.waitForEvent('download');
    await shot('export-dialog');
    await dialog.getByRole('button', { name: 'Export and download' }).click();
    const csv = await csvDownload;
    expect(csv.suggestedFilename()).toMatch(/^tidewater_.*\.csv$/i);
    const csvText = readFileSync((await csv.path())!, 'utf8');
    const lines = csvText.trim().split(/\r?\n/);
    expect(lines[0].toLowerCase()).toContain('time');
    expect(lines.length).toBeGreaterThan(20);

    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
    await page.getByRole('button', { name: 'New export…' }).click();
    dialog = await openedDialog(page);
    await dialog.getByRole('radio', { name: /MIDI CC file/ }).check();
    await dialog.getByLabel('Controller', { exact: true }).fill('11');
    const midiDownload = page.waitForEvent('download');
    await dialog.getByRole('button', { name: 'Export and download' }).click();
    const midi = await midiDownload;
    expect(midi.suggestedFilename()).toMatch(/\.mid$/);
    const bytes = readFileSync((await midi.path())!);
    expect(bytes.subarray(0, 4).toString('latin1')).toBe('MThd');
    // CC 11 events (status 0xB0, controller 11) are in the track data.
    expect(bytes.includes(Buffer.from([0xb0, 11])) || bytes.includes(Buffer.from([11]))).toBe(true);

    await expect.poll(() => page.locator('tl-export-panel tr.export-row').count()).toBe(2);
    await shot('workspace-export');
  });

  it('asks before leaving with unsaved tuck edits', async () => {
    await step('Tuck').click();
    const point = page.locator('tl-tuck-editor circle.point[data-index="2"]');
    await point.focus();
    await page.keyboard.press('ArrowRight');
    await page.getByRole('link', { name: 'All songs' }).click();
    await expect.poll(() => page.getByRole('dialog').textContent()).toContain('Leave without saving');
    await page.getByRole('button', { name: 'Cancel' }).click();
    expect(page.url()).toMatch(/\/songs\/[^/?]+/);
  });

  it('shows the seeded demo song in the light theme', async () => {
    await page.getByRole('button', { name: 'Discard' }).click();
    await page.getByRole('link', { name: 'All songs' }).click();
    await page.waitForURL(/\/songs$/);
    await page.getByRole('link', { name: 'Night Ferry' }).click();
    await page.waitForURL(/\/songs\/[^/?]+/);
    await step('Tuck').click();
    await page.getByRole('button', { name: 'Use the light theme' }).click();
    await expect.poll(() => page.locator('tl-timeline g.hit').count()).toBeGreaterThan(10);
    await page.waitForTimeout(300);
    await shot('workspace-tuck-light');
    await page.getByRole('button', { name: 'Use the dark theme' }).click();
  });
});
