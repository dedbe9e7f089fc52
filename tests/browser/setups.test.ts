import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, screenshot, signInThroughForm, startLiveApp, type LiveApp } from '../support/browser.js';

let live: LiveApp;
let browser: Browser;
let context: BrowserContext | undefined;

beforeAll(async () => {
  [live, browser] = await Promise.all([startLiveApp(), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await live?.close();
});
afterEach(async () => {
  await context?.close();
  context = undefined;
});

async function openPage(): Promise<Page> {
  context = await browser.newContext({ viewport: { width: 1440, height: 1000 }, locale: 'en-US' });
  return context.newPage();
}

/** The editor's fieldset of one source's path to one chip input, e.g. `desired → input 0`. */
const pathGroup = (page: Page, source: string, channel: number) => page.getByRole('group', { name: `${source} → input ${channel}`, exact: true });

/** Adds an inventory part at the end of a path by typing its tag into the part search and pressing Enter. */
async function addPart(group: Locator, tag: string) {
  await group.getByRole('button', { name: /^Add segment/ }).click();
  const picker = group.getByRole('combobox', { name: 'Part' }).last();
  await picker.fill(tag);
  await picker.press('Enter');
  await expect.poll(() => picker.inputValue()).toMatch(new RegExp(`^${tag} · `));
}

/** The emulated angle of a source, as the analysis summary shows it (`28.68°`, `−30°`). */
const angleOf = (scope: Page | Locator, source: string) => scope.getByTestId(`angle-${source}`).textContent();
const rejectionDb = async (scope: Locator) => Number.parseFloat((await scope.getByTestId('rejection').textContent()) ?? '');

// One journey on one live app (the steps build on each other). The wiring, checked against RF-PRIMER.md §0/§12:
// - desired at 5 GHz on C-003 (250 mm, VF 0.695) to input 0 and C-004 (260 mm) to input 1 with λ/2 spacing at 5 GHz:
//   10 mm more cable on input 1, Δτ = 47.99483 ps, θ = +28.68203° (RF-PRIMER W-04);
// - interferer at 5.2 GHz on C-002 (200 mm, 959.896 ps) + AT-10A (38 ps) to input 0, and the measured semi-rigid
//   C-012 (869.9 ps) + AT-10B (38 ps) + a 40 ps ad-hoc line stretcher to input 1: Δτ = 947.9 − 997.896 = −49.996 ps,
//   c·Δτ/d = −0.49997, θ = −29.998°, a physical angle on the other side of broadside (computed from the demo parts);
// - swapping C-012 for its twin C-011 (866.4 ps) makes Δτ = −53.496 ps and θ = −32.34°.
describe('setups', () => {
  let firstSetupUrl = '';

  it('a researcher records a two-input setup from inventory cables for his booking, with a live preview, the suggested null and a photo', async () => {
    const page = await openPage();
    await signInThroughForm(page, live.url, 'researcher@lab.test');
    await page.getByRole('link', { name: 'My bookings' }).click();
    const upcoming = page.getByRole('list', { name: 'Upcoming' });
    await upcoming.waitFor();
    await upcoming.getByRole('link').first().click();
    await page.getByRole('link', { name: 'Record the setup' }).click();
    await page.getByRole('form', { name: 'Setup' }).waitFor();
    const bookingUrl = page.url().replace(/\/setups\/new\?bookingId=(\d+)$/, '/bookings/$1');
    expect(bookingUrl).toMatch(/\/bookings\/\d+$/);

    await page.getByLabel('Title').fill('Interferer at −30°, desired at +28.7°');
    // The interferer: a second source on the next free generator.
    await page.getByRole('button', { name: 'Add source' }).click();
    const interferer = page.getByRole('group', { name: 'Source 2' });
    expect(await interferer.getByLabel('Key').inputValue()).toBe('interferer');
    expect(await interferer.getByLabel('Role').inputValue()).toBe('interferer');
    await interferer.getByLabel('Frequency (GHz)').fill('5.2');
    await interferer.getByLabel('Power (dBm)').fill('-10');

    const preview = page.getByRole('complementary', { name: 'Live preview' });
    await addPart(pathGroup(page, 'desired', 0), 'C-003');
    await addPart(pathGroup(page, 'desired', 1), 'C-004');
    await addPart(pathGroup(page, 'interferer', 0), 'C-002');
    await addPart(pathGroup(page, 'interferer', 0), 'AT-10A');
    await addPart(pathGroup(page, 'interferer', 1), 'C-012');
    await addPart(pathGroup(page, 'interferer', 1), 'AT-10B');
    // The preview already knows the desired angle while the interferer's wiring is still being added.
    await expect.poll(() => angleOf(preview, 'desired')).toBe('28.68°');
    await expect.poll(() => angleOf(preview, 'interferer')).toBe('−64.15°');

    // An ad-hoc part: a line stretcher set to 40 ps, at the end of the interferer's path to input 1.
    const lastPath = pathGroup(page, 'interferer', 1);
    await lastPath.getByRole('button', { name: /^Add segment/ }).click();
    const stretcher = lastPath.getByRole('listitem', { name: 'Segment 3' });
    await stretcher.getByLabel('Segment is').selectOption('ad-hoc');
    await stretcher.getByLabel('Kind').selectOption('other');
    await stretcher.getByLabel('Label').fill('Line stretcher');
    await stretcher.getByLabel('Delay (ps)').fill('-40');
    await stretcher.getByLabel('Delay (ps)').blur();
    // The shared schema's message shows on the field, and the preview waits for a valid path.
    await expect.poll(() => stretcher.getByText('Delay cannot be negative').count()).toBe(1);
    await stretcher.getByLabel('Delay (ps)').fill('40');
    await expect.poll(() => stretcher.getByText('Delay cannot be negative').count()).toBe(0);
    await expect.poll(() => angleOf(preview, 'interferer')).toBe('−30°');
    expect(await angleOf(preview, 'desired')).toBe('28.68°');
    // Δτ and the free-space path difference c·Δτ of the desired source (RF-PRIMER W-04: 47.99483 ps, 14.38849 mm).
    expect(await preview.getByRole('cell', { name: '47.99 ps', exact: true }).count()).toBe(1);
    expect(await preview.getByRole('cell', { name: '14.388 mm', exact: true }).count()).toBe(1);

    await page.getByLabel('Input 0 maximum safe level (dBm)').fill('0');
    await page.getByLabel('Input 1 maximum safe level (dBm)').fill('0');
    expect(await page.getByText('Check every RF input’s maximum safe level before connecting; your lab’s rules come first.').count()).toBe(1);
    await page.getByRole('button', { name: 'Add setting' }).click();
    await page.getByRole('group', { name: 'Setting 1' }).getByLabel('Setting').fill('Centre frequency');
    await page.getByRole('group', { name: 'Setting 1' }).getByLabel('Value').fill('5.1 GHz');
    await page.getByLabel('Chip', { exact: true }).fill('TTD4 rev B');
    await page.getByLabel('Die').fill('Die 7');

    const before = await rejectionDb(preview);
    // The beam pattern follows the wiring; with equal chip delays the interferer's null is nowhere near it.
    const pattern = preview.getByRole('img', { name: /^Beam pattern: / });
    expect(await pattern.getAttribute('aria-label')).toMatch(/interferer −3\.3 dB at −30°; null at −74°$/);
    await screenshot(page, 'setup-editor-preview');
    await page.getByRole('button', { name: 'Use suggested null' }).click();
    // Input 1's copy of the interferer arrives 50 ps early; 146 ps more on input 1 puts the two copies 180° apart at
    // 5.2 GHz (96 ps is half a period) while the desired copies stay within 11° of each other at 5 GHz.
    await expect.poll(() => page.getByLabel('Input 1 chip delay (ps)').inputValue()).toBe('146');
    expect(await page.getByLabel('Input 0 chip delay (ps)').inputValue()).toBe('0');
    await expect.poll(() => rejectionDb(preview)).toBeGreaterThan(before + 20);
    await expect.poll(() => pattern.getAttribute('aria-label')).toMatch(/interferer −42\.8 dB at −30°; null at −30°$/);
    // λ/2 at 5 GHz is more than λ/2 at 5.2 GHz: the preview says so.
    expect(await preview.getByText(/grating lobes can appear/).count()).toBe(1);
    await page.getByLabel('What changed').fill('First wiring for die 7');
    await page.getByRole('button', { name: 'Save setup' }).click();

    await expect.poll(() => page.getByText('Saved as revision 1.').count()).toBe(1);
    firstSetupUrl = page.url();
    expect(firstSetupUrl).toMatch(/\/setups\/\d+$/);
    const wiring = page.getByRole('region', { name: 'Wiring of interferer' });
    expect(await wiring.getByRole('cell', { name: 'C-012', exact: true }).count()).toBe(1);
    expect(await wiring.getByRole('cell', { name: 'Line stretcher' }).count()).toBe(1);
    // The stored analysis is the server's, and agrees with the preview.
    await expect.poll(() => angleOf(page, 'interferer')).toBe('−30°');
    expect(await page.getByTestId('chip-delays').textContent()).toBe('in 0: 0 ps · in 1: 146 ps');

    const dir = mkdtempSync(path.join(os.tmpdir(), 'skewbench-setup-photo-'));
    try {
      const file = path.join(dir, 'bench.png');
      writeFileSync(file, await sharp({ create: { width: 640, height: 400, channels: 3, background: '#b87333' } }).png().toBuffer());
      const form = page.getByRole('form', { name: 'Add a photo' });
      await form.getByLabel('Image').setInputFiles(file);
      await form.getByLabel('Caption').fill('Both generators and the pads on PS-1');
      await form.getByRole('button', { name: 'Add photo' }).click();
      await expect.poll(() => page.getByRole('img', { name: 'Both generators and the pads on PS-1' }).count()).toBe(1);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
    await screenshot(page, 'setup-detail');

    await page.getByRole('link', { name: 'Rebuild sheet' }).click();
    const sheet = page.getByRole('article', { name: 'Rebuild sheet' });
    await sheet.waitFor();
    expect(await sheet.getByRole('checkbox', { name: /^Connected: / }).count()).toBe(7);
    await sheet.getByRole('checkbox', { name: 'Connected: C-003, segment 1 of desired → input 0' }).check();
    await page.emulateMedia({ media: 'print' });
    await screenshot(page, 'setup-rebuild-print');
    await page.emulateMedia({ media: 'screen' });

    // The booking page lists the setup recorded for it.
    await page.goto(bookingUrl);
    const listed = page.getByRole('list', { name: 'Setups of this booking' });
    await listed.waitFor();
    expect(await listed.getByRole('link', { name: 'Interferer at −30°, desired at +28.7°' }).count()).toBe(1);
    await screenshot(page, 'booking-page-setups');
  });

  it('he reloads it into another of his bookings, swaps C-012 for its twin C-011, and the comparison shows what moved', async () => {
    expect(firstSetupUrl).not.toBe('');
    const page = await openPage();
    await signInThroughForm(page, live.url, 'researcher@lab.test');
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    await page.goto(firstSetupUrl);
    await page.getByRole('button', { name: 'Reload into another booking' }).click();
    const dialog = page.getByRole('dialog', { name: 'Reload into another booking' });
    await dialog.waitFor();
    await dialog.getByRole('radio').nth(1).check();
    await dialog.getByRole('button', { name: 'Reload' }).click();
    await expect.poll(() => page.getByText(/^A new setup for this booking, from /).count()).toBe(1);
    expect(page.url()).not.toBe(firstSetupUrl);
    expect(await page.getByRole('link', { name: /, revision 1$/ }).count()).toBe(1);

    await page.getByRole('link', { name: 'Edit', exact: true }).click();
    const segment = pathGroup(page, 'interferer', 1).getByRole('listitem', { name: 'Segment 1' });
    const picker = segment.getByRole('combobox', { name: 'Part' });
    await picker.fill('C-011');
    await picker.press('Enter');
    const preview = page.getByRole('complementary', { name: 'Live preview' });
    await expect.poll(() => angleOf(preview, 'interferer')).toBe('−32.34°');
    await page.getByLabel('What changed').fill('C-012 is on the other bench: swapped for its twin C-011');
    await page.getByRole('button', { name: 'Save as a new revision' }).click();
    await expect.poll(() => page.getByText('Saved as revision 2.').count()).toBe(1);

    const compare = page.getByRole('form', { name: 'Compare revisions' });
    expect(await compare.getByLabel('From').locator('option:checked').textContent()).toMatch(/^Revision 1/);
    expect(await compare.getByLabel('To').locator('option:checked').textContent()).toMatch(/^Revision 2/);
    await compare.getByRole('button', { name: 'Compare' }).click();
    const segments = page.getByRole('region', { name: 'Segments changed' });
    await segments.waitFor();
    const row = segments.getByRole('row').filter({ hasText: 'interferer → input 1' });
    expect(await row.count()).toBe(1);
    expect(await row.getByRole('cell').allTextContents()).toEqual(['interferer → input 1', '1', 'changed', 'C-012', 'C-011']);
    const results = page.getByRole('region', { name: 'How the results moved' });
    expect(await results.getByText('interferer: angle −30.00° → −32.34°', { exact: false }).count()).toBe(1);
    expect(await results.getByText(/^Rejection: /).count()).toBe(1);
    await screenshot(page, 'setup-compare');

    // Both setups are his: the original with one revision, the reloaded one with two.
    await page.getByRole('link', { name: 'Setups', exact: true }).click();
    await expect.poll(() => page.getByRole('row').filter({ hasText: 'Interferer at −30°' }).count()).toBe(2);
  });

  it('a visitor reads the setups but is offered no way to change them', async () => {
    expect(firstSetupUrl).not.toBe('');
    const page = await openPage();
    await signInThroughForm(page, live.url, 'visitor@lab.test');
    await page.getByRole('link', { name: 'Setups', exact: true }).click();
    await expect.poll(() => page.getByRole('row').filter({ hasText: 'Interferer at −30°' }).count()).toBe(2);
    await page.goto(firstSetupUrl);
    await page.getByRole('region', { name: 'Wiring of desired' }).waitFor();
    expect(await page.getByRole('link', { name: 'Edit', exact: true }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Reload into another booking' }).count()).toBe(0);
    expect(await page.getByRole('form', { name: 'Add a photo' }).count()).toBe(0);
    expect(await page.getByRole('img', { name: 'Both generators and the pads on PS-1' }).count()).toBe(1);
  });
});
