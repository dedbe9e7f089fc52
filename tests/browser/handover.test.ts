// The handover journey: a researcher checks out through the booking page with a note for the next user, and the
// next booker's message (queued in the check-out's transaction, sent over SMTP to the local capture) shows on the
// lab manager's Mail page.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn } from '../support/test-app.js';
import { launchBrowser, screenshot, signInThroughForm, startLiveApp, type LiveApp } from '../support/browser.js';

let live: LiveApp;
let browser: Browser;

beforeAll(async () => {
  [live, browser] = await Promise.all([startLiveApp(), launchBrowser()]);
  // The journey books slots around the moment it runs, where the demo's bookings could be in the way.
  await live.db.sequelize.query('DELETE FROM waitlist_entries; DELETE FROM bookings; DELETE FROM outbox; DELETE FROM captured_mail;');
});
afterAll(async () => {
  await browser?.close();
  await live?.close();
});

const minutes = (n: number) => n * 60_000;
/** Now, rounded up to the next 5 minutes, plus `plus` minutes, as ISO. */
function soon(plus: number): string {
  const step = minutes(5);
  return new Date(Math.ceil(Date.now() / step) * step + minutes(plus)).toISOString();
}

describe('handover to the next booker', () => {
  it('a researcher checks out with a handover note; the next booker’s message shows on the Mail page', async () => {
    const researcher = await signIn(live.url, 'researcher@lab.test');
    const researcher2 = await signIn(live.url, 'researcher2@lab.test');
    const instruments = (await researcher.agent.get('/api/instruments').expect(200)).body.instruments as { id: number; tag: string }[];
    const analyzer = instruments.find((i) => i.tag === 'SA-1')!;

    // Tobiah's slot starts within the 15-minute check-in window; Sunniva has the analyzer after him.
    const mine = await researcher.agent
      .post('/api/bookings')
      .set('x-csrf-token', researcher.csrf)
      .send({ instrumentIds: [analyzer.id], startsAt: soon(5), endsAt: soon(65), purpose: 'Interferer rejection sweep' })
      .expect(201);
    await researcher2.agent
      .post('/api/bookings')
      .set('x-csrf-token', researcher2.csrf)
      .send({ instrumentIds: [analyzer.id], startsAt: soon(125), endsAt: soon(185), purpose: 'Spur search' })
      .expect(201);
    await researcher.agent.post(`/api/bookings/${mine.body.booking.id}/check-in`).set('x-csrf-token', researcher.csrf).expect(200);

    const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, locale: 'en-GB' });
    try {
      const page = await context.newPage();
      await signInThroughForm(page, live.url, 'researcher@lab.test');
      await page.getByRole('link', { name: 'My bookings' }).click();
      await page.getByRole('listitem').filter({ hasText: 'Interferer rejection sweep' }).getByRole('link', { name: 'SA-1' }).click();
      await page.waitForURL(/\/bookings\/\d+$/);
      await page.getByRole('button', { name: 'Check out…' }).click();
      const form = page.getByRole('form', { name: 'Check out' });
      await form.getByLabel('Handover note').fill('Analyzer preamp left ON. Reference level −20 dBm, please keep the 10 dB pad on port 1.');
      await form.getByLabel('Left connected').fill('10 dB pad AT-10-3 on port 1, cable CB-SMA-07');
      await form.getByRole('button', { name: 'Check out' }).click();
      await expect.poll(() => page.getByText('Checked out.', { exact: false }).count()).toBeGreaterThan(0);

      // The lab manager reads what Sunniva was sent.
      await page.getByRole('button', { name: /Sign out/ }).click();
      await page.waitForURL(/\/sign-in/);
      await signInThroughForm(page, live.url, 'manager@lab.test');
      await page.getByRole('link', { name: 'Mail', exact: true }).click();
      const entry = page.getByRole('link', { name: /Handover for SA-1/ });
      await entry.waitFor({ timeout: 15_000 });
      expect(await entry.textContent()).toContain('researcher2@lab.test');
      await entry.click();
      await page.getByRole('tab', { name: 'Plain text' }).click();
      const body = page.getByRole('tabpanel');
      await expect.poll(() => body.textContent()).toContain('Analyzer preamp left ON.');
      const text = (await body.textContent())!;
      expect(text).toContain('Hello Sunniva Okoro-Vale,');
      expect(text).toContain('10 dB pad AT-10-3 on port 1, cable CB-SMA-07');
      expect(text).toContain(`${live.url}/bookings/`);
      await screenshot(page, 'handover-mail');
    } finally {
      await context.close();
    }
  });
});
