// The cable finder in the setup editor: a researcher asks for the interferer at −35° (and the desired source at
// broadside) at 3.5 GHz with half-wavelength spacing (d = 42.827 mm, Δτ = d·sin(−35°)/c = −81.94 ps), applies the
// first proposal, and the live preview shows the emulated angle within what ±0.5 ps per path allows.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn } from '../support/test-app.js';
import { launchBrowser, screenshot, signInThroughForm, startLiveApp, type LiveApp } from '../support/browser.js';
import { at } from '../support/time.js';

let live: LiveApp;
let browser: Browser;
let setupId: number;

const C = 299_792_458;
const spacingMm = (C / (2 * 3.5e9)) * 1e3;
/** The angle that relative delay Δτ (ps) emulates at this spacing, degrees. */
const angleFor = (dtPs: number) => (Math.asin((dtPs * 1e-12 * C) / (spacingMm * 1e-3)) * 180) / Math.PI;
const targetDtPs = ((spacingMm * 1e-3 * Math.sin((-35 * Math.PI) / 180)) / C) * 1e12;
/** The preview's angle text (`−35.13°`) as a number. */
const parseAngle = (text: string | null) => Number((text ?? '').replace('−', '-').replace('°', ''));

beforeAll(async () => {
  [live, browser] = await Promise.all([startLiveApp(), launchBrowser()]);
  await live.db.sequelize.query('DELETE FROM waitlist_entries; DELETE FROM bookings;');
  const researcher = await signIn(live.url, 'researcher@lab.test');
  const instruments = (await researcher.agent.get('/api/instruments').expect(200)).body.instruments as { id: number; tag: string }[];
  const parts = (await researcher.agent.get('/api/parts').expect(200)).body.parts as { id: number; tag: string }[];
  const part = (tag: string) => ({ partId: parts.find((p) => p.tag === tag)!.id });
  const booking = await researcher.agent
    .post('/api/bookings')
    .set('x-csrf-token', researcher.csrf)
    .send({ instrumentIds: [instruments.find((i) => i.tag === 'SG-2')!.id], startsAt: at(3, 19), endsAt: at(3, 20), purpose: 'Interferer at −35°' })
    .expect(201);
  const setup = await researcher.agent
    .post('/api/setups')
    .set('x-csrf-token', researcher.csrf)
    .send({
      bookingId: booking.body.booking.id,
      document: {
        title: 'Rejection at 3.5 GHz',
        analysis: {
          array: { elements: 2, spacingHalfWavelengthAtHz: 3.5e9 },
          sources: [
            { key: 'desired', role: 'desired', frequencyHz: 3.5e9, powerDbm: -20 },
            { key: 'interferer', role: 'interferer', frequencyHz: 3.5e9, powerDbm: -20 },
          ],
          // A first guess: the matched pair for the desired source, two unrelated cables for the interferer.
          paths: [
            { source: 'desired', channel: 0, segments: [part('C-003')] },
            { source: 'desired', channel: 1, segments: [part('C-004')] },
            { source: 'interferer', channel: 0, segments: [part('C-005')] },
            { source: 'interferer', channel: 1, segments: [part('C-006')] },
          ],
          combiner: { delaysPs: [0, 0] },
        },
      },
    })
    .expect(201);
  setupId = setup.body.setup.id;
});
afterAll(async () => {
  await browser?.close();
  await live?.close();
});

describe('cable finder', () => {
  it('a researcher asks for −35° for the interferer, applies the first proposal and the preview shows it within tolerance', async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 1000 }, locale: 'en-US' });
    try {
      const page = await context.newPage();
      await signInThroughForm(page, live.url, 'researcher@lab.test');
      await page.getByRole('navigation', { name: 'Main' }).waitFor();
      await page.goto(`${live.url}/setups/${setupId}/edit`);
      const preview = page.getByRole('complementary', { name: 'Live preview' });
      // The first guess: C-004 is 10 mm longer than C-003, 47.99 ps, asin(14.388 mm / 42.827 mm) = 19.63°.
      await expect.poll(() => preview.getByTestId('angle-desired').textContent()).toBe('19.63°');
      await page.getByRole('button', { name: 'Find cables for an angle' }).click();
      const dialog = page.getByRole('dialog', { name: 'Find cables for an angle' });
      await dialog.waitFor();
      // The targets start from what the wiring emulates now.
      expect(await dialog.getByLabel('Target angle of desired (°)').inputValue()).toBe('19.63');
      await dialog.getByLabel('Target angle of desired (°)').fill('0');
      await dialog.getByLabel('Target angle of interferer (°)').fill('-35');
      expect(await dialog.getByLabel('Tolerance (ps)').inputValue()).toBe('0.5');
      expect(await dialog.getByLabel('Most segments per path').inputValue()).toBe('3');
      const find = dialog.getByRole('button', { name: 'Find cables', exact: true });

      // A tolerance of 0 is refused on its field, by the shared schema, before anything is sent.
      await dialog.getByLabel('Tolerance (ps)').fill('0');
      await find.click();
      await expect.poll(() => dialog.getByText('Tolerance must be above 0 ps').count()).toBe(1);
      // 0.01 ps with single cables cannot be met: the closest proposals come with what limits them, in words.
      await dialog.getByLabel('Tolerance (ps)').fill('0.01');
      await dialog.getByLabel('Most segments per path').selectOption('1');
      await find.click();
      await expect.poll(() => dialog.getByText('No combination of free parts meets ±0.01 ps on every path. The closest proposals follow.').count()).toBe(1);
      const limits = dialog.getByRole('list', { name: 'What limits the proposals' });
      expect(await limits.getByText(/^No combination of the usable parts comes closer than \d+\.\d\d ps \(tolerance 0\.01 ps\)/).count()).toBe(1);
      expect(await dialog.getByRole('region', { name: 'Proposal 1' }).getByText(/^Closest: \d+\.\d\d ps off$/).count()).toBe(1);
      await page.setViewportSize({ width: 1440, height: 1800 });
      await page.evaluate(() => window.scrollTo(0, 0));
      await screenshot(page, 'solver-limits');
      await page.setViewportSize({ width: 1440, height: 1000 });

      await dialog.getByLabel('Tolerance (ps)').fill('0.5');
      await dialog.getByLabel('Most segments per path').selectOption('3');
      await find.click();
      await expect.poll(() => dialog.getByText(/proposals meet ±0\.5 ps on every path, best first\./).count()).toBe(1);

      const first = dialog.getByRole('region', { name: 'Proposal 1' });
      await first.waitFor();
      expect(await first.getByText('Within ±0.5 ps').count()).toBe(1);
      const proposed = parseAngle((await first.getByTestId('proposal-angle-interferer').textContent())!.match(/emulates (\S+)/)![1]!);
      // Each path within ±0.5 ps: Δτ within ±1 ps of the target.
      expect(proposed).toBeGreaterThanOrEqual(angleFor(targetDtPs - 1) - 0.005);
      expect(proposed).toBeLessThanOrEqual(angleFor(targetDtPs + 1) + 0.005);
      const rows = first.getByRole('row');
      expect(await rows.count()).toBe(5); // header + 4 paths
      const chainOf = async (path: string) => (await first.getByRole('row', { name: new RegExp(`^${path}`) }).locator('span.font-mono').allTextContents());
      const wiring: Record<string, string[]> = {};
      for (const path of ['desired → input 0', 'desired → input 1', 'interferer → input 0', 'interferer → input 1']) wiring[path] = await chainOf(path);
      const all = Object.values(wiring).flat();
      expect(new Set(all).size).toBe(all.length);
      // Tall enough for the whole dialog in one picture.
      await page.setViewportSize({ width: 1440, height: 2600 });
      await page.evaluate(() => window.scrollTo(0, 0));
      await screenshot(page, 'solver-proposals');
      await page.setViewportSize({ width: 1440, height: 1000 });

      await first.getByRole('button', { name: 'Apply proposal 1' }).click();
      await dialog.waitFor({ state: 'detached' });
      expect(await page.getByText(/^Proposal 1 is wired into the paths below/).count()).toBe(1);
      // The paths now hold the proposed chains, part by part.
      for (const [path, tags] of Object.entries(wiring)) {
        const pickers = page.getByRole('group', { name: path, exact: true }).getByRole('combobox', { name: 'Part' });
        await expect.poll(() => pickers.count()).toBe(tags.length);
        for (let i = 0; i < tags.length; i++) expect(await pickers.nth(i).inputValue()).toMatch(new RegExp(`^${tags[i]} · `));
      }
      await expect.poll(async () => Math.abs(parseAngle(await preview.getByTestId('angle-interferer').textContent()) - proposed)).toBeLessThanOrEqual(0.005);
      const shown = parseAngle(await preview.getByTestId('angle-interferer').textContent());
      expect(shown).toBeGreaterThanOrEqual(angleFor(targetDtPs - 1) - 0.005);
      expect(shown).toBeLessThanOrEqual(angleFor(targetDtPs + 1) + 0.005);
      expect(Math.abs(parseAngle(await preview.getByTestId('angle-desired').textContent()))).toBeLessThanOrEqual(angleFor(1) + 0.005);
      await screenshot(page, 'solver-applied');

      // Saved as usual: the server's analysis agrees.
      await page.getByLabel('What changed').fill('Cables from the finder for −35°');
      await page.getByRole('button', { name: 'Save as a new revision' }).click();
      await expect.poll(() => page.getByText('Saved as revision 2.').count()).toBe(1);
      expect(Math.abs(parseAngle(await page.getByTestId('angle-interferer').textContent()) - proposed)).toBeLessThanOrEqual(0.005);
    } finally {
      await context.close();
    }
  });
});
