import type { Server } from 'node:http';
import nodemailer from 'nodemailer';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { QueryTypes } from 'sequelize';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { freePort } from '../../scripts/lib/postgres.mjs';
import { enqueueMail } from '../../server/features/mail/outbox.service.js';
import { composeMail } from '../../server/features/mail/templates/compose.js';
import { launchBrowser, screenshot, signInThroughForm, startLiveApp, type LiveApp } from '../support/browser.js';
import { startTestApp, type TestApp } from '../support/test-app.js';

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

async function openPage(viewport = { width: 1280, height: 900 }): Promise<Page> {
  context = await browser.newContext({ viewport, locale: 'en-GB' });
  return context.newPage();
}

const ics = ['BEGIN:VCALENDAR', 'VERSION:2.0', 'PRODID:-//Skewbench//mail test//EN', 'BEGIN:VEVENT', 'UID:mail-test@skewbench', 'SUMMARY:VNA-1', 'END:VEVENT', 'END:VCALENDAR', ''].join('\r\n');

/** Queue a message the way every feature does (an outbox row in a transaction), then let the worker send it. */
async function queueThroughOutbox(to: string, subject: string) {
  const lab = { name: live.config.lab.name, publicUrl: live.config.publicUrl };
  const mail = composeMail(lab, {
    subject,
    recipientName: 'Tobiah Renwick',
    lead: ['Your booking of VNA-1 is confirmed.'],
    facts: [['Instrument', 'VNA-1']],
    action: { label: 'Open the booking', url: '/bookings/1' },
    footer: ['You get this because you booked an instrument.'],
    attachments: [{ filename: 'booking.ics', contentType: 'text/calendar', content: Buffer.from(ics).toString('base64') }],
  });
  await live.db.sequelize.transaction((transaction) => enqueueMail(transaction, 'booking-confirmed', { address: to }, mail));
  await live.mail!.worker.kick();
}

const capturedCount = async () =>
  (await live.db.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM captured_mail', { type: QueryTypes.SELECT }))[0]!.n;

describe('the Mail page (lab manager)', () => {
  it('lists captured mail, opens a message with its HTML preview, text, links and attachment, and sees the outbox', async () => {
    await queueThroughOutbox('researcher@lab.test', 'Booking confirmed: VNA-1');
    // A message waiting for a relay that does not answer, due only in an hour, so the worker leaves it alone.
    await live.db.sequelize.query(
      `INSERT INTO outbox (kind, to_address, subject, text_body, html_body, attempts, last_error, next_attempt_at)
       VALUES ('handover', 'researcher2@lab.test', 'Handover from VNA-1', 't', '<p>h</p>', 3, 'ECONNREFUSED connect ECONNREFUSED 10.0.0.25:25', now() + interval '1 hour')`,
    );
    const page = await openPage();
    await signInThroughForm(page, live.url, 'manager@lab.test');
    await page.getByRole('link', { name: 'Mail', exact: true }).click();
    await page.waitForURL(/\/mail$/);
    await page.getByRole('heading', { name: 'Mail', level: 1 }).waitFor();
    expect(await page.getByText('nothing leaves this machine').count()).toBe(1);

    const entry = page.getByRole('link', { name: /Booking confirmed: VNA-1/ });
    await entry.waitFor();
    expect(await entry.textContent()).toContain('researcher@lab.test');
    expect(await entry.getByText('1 attachment').count()).toBe(1);

    // The outbox: the message that went out, and the one waiting with its attempts and the relay's error.
    await expect.poll(() => page.getByTestId('outbox-waiting').textContent(), { timeout: 10_000 }).toBe('1');
    expect(Number(await page.getByTestId('outbox-sent').textContent())).toBeGreaterThanOrEqual(1);
    const waiting = page.getByRole('listitem', { name: 'Waiting: Handover from VNA-1' });
    await waiting.waitFor();
    expect(await waiting.textContent()).toContain('ECONNREFUSED connect ECONNREFUSED 10.0.0.25:25');
    expect(await waiting.getByTestId('outbox-attempts').textContent()).toMatch(/^3 attempts, next try /);
    await screenshot(page, 'mail-list');

    await entry.click();
    await page.waitForURL(/\/mail\?message=\d+$/);
    const id = Number(new URL(page.url()).searchParams.get('message'));
    await page.getByRole('heading', { name: 'Booking confirmed: VNA-1', level: 2 }).waitFor();
    expect(await page.locator('dl dd').first().textContent()).toContain('skewbench@lab.test');

    // The HTML part in a sandboxed frame (no scripts), served by the locked-down route.
    const frame = page.locator('iframe[title^="HTML part"]');
    expect(await frame.getAttribute('sandbox')).toBe('');
    expect(await frame.getAttribute('src')).toBe(`/api/mailbox/${id}/html`);
    await expect.poll(() => page.frameLocator('iframe[title^="HTML part"]').getByText('Hello Tobiah Renwick,').count(), { timeout: 10_000 }).toBe(1);
    expect((await frame.boundingBox())!.height).toBeGreaterThan(380);

    // Its links, to open outside the sandbox.
    const open = page.getByRole('link', { name: 'Open the booking' });
    expect(await open.getAttribute('href')).toBe(`${live.url}/bookings/1`);
    expect(await open.getAttribute('target')).toBe('_blank');

    // The attachment downloads with the manager's session.
    const attachment = page.getByRole('link', { name: /booking\.ics/ });
    expect(await attachment.getAttribute('href')).toBe(`/api/mailbox/${id}/attachments/0`);
    const file = await page.request.get(`${live.url}/api/mailbox/${id}/attachments/0`);
    expect(file.status()).toBe(200);
    expect(await file.text()).toContain('BEGIN:VCALENDAR');
    await screenshot(page, 'mail-message-html');

    await page.getByRole('tab', { name: 'Plain text' }).click();
    const text = page.getByRole('tabpanel');
    expect(await text.textContent()).toContain('Hello Tobiah Renwick,');
    expect(await text.textContent()).toContain(`Open the booking: ${live.url}/bookings/1`);
    expect(await page.locator('iframe').count()).toBe(0);
    await screenshot(page, 'mail-message-text');
  });

  it('shows new mail without a reload, filters by recipient, and reads well in a narrow window', async () => {
    const page = await openPage({ width: 390, height: 844 });
    await signInThroughForm(page, live.url, 'manager@lab.test');
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    await page.goto(`${live.url}/mail`);
    await page.getByRole('heading', { name: 'Mail', level: 1 }).waitFor();

    // Straight to the capture server, as any SMTP client would: the open page picks it up by itself.
    const smtp = nodemailer.createTransport({ host: '127.0.0.1', port: live.mail!.capture!.port, secure: false, ignoreTLS: true });
    await smtp.sendMail({ from: live.config.mail.from, to: 'researcher2@lab.test', subject: 'Waitlist: a slot on PS-1 is free', text: 'Book it at http://127.0.0.1/bookings/new.', html: '<p>Book it <a href="http://127.0.0.1/bookings/new">here</a>.</p>' });
    smtp.close();
    const fresh = page.getByRole('link', { name: /Waitlist: a slot on PS-1 is free/ });
    await expect.poll(() => fresh.count(), { timeout: 15_000 }).toBe(1);

    await page.getByLabel('Recipient').fill('researcher2');
    await expect.poll(() => page.getByRole('link', { name: /Booking confirmed: VNA-1/ }).count()).toBe(0);
    expect(await fresh.count()).toBe(1);
    // A whole address goes to the server as its exact filter.
    await page.getByLabel('Recipient').fill('researcher@lab.test');
    await expect.poll(() => page.getByRole('link', { name: /Booking confirmed: VNA-1/ }).count()).toBe(1);
    expect(await fresh.count()).toBe(0);
    await screenshot(page, 'mail-narrow-list');

    await page.getByRole('link', { name: /Booking confirmed: VNA-1/ }).click();
    await expect.poll(() => page.frameLocator('iframe[title^="HTML part"]').getByText('Hello Tobiah Renwick,').count(), { timeout: 10_000 }).toBe(1);
    // On a narrow window the message takes the place of the list, with a way back.
    expect(await page.getByRole('link', { name: /Booking confirmed: VNA-1/ }).isVisible()).toBe(false);
    const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(scrollWidth).toBeLessThanOrEqual(390);
    // Chromium does not paint a cross-origin frame while it is off screen, even for a full-page picture: bring it
    // into view and let the page draw a couple of frames first.
    await page.locator('iframe[title^="HTML part"]').scrollIntoViewIfNeeded();
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
    await screenshot(page, 'mail-narrow-message');
    await page.getByRole('link', { name: '← All messages' }).click();
    await page.getByRole('link', { name: /Booking confirmed: VNA-1/ }).waitFor();
  });

  it('clears the captured mail after a confirmation', async () => {
    const page = await openPage();
    await signInThroughForm(page, live.url, 'manager@lab.test');
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    await page.goto(`${live.url}/mail`);
    await page.getByRole('link', { name: /Booking confirmed: VNA-1/ }).waitFor();
    await page.getByRole('button', { name: 'Clear captured mail…' }).click();
    const dialog = page.getByRole('dialog', { name: 'Clear captured mail?' });
    await dialog.waitFor();
    await dialog.getByRole('button', { name: 'Keep the mail' }).click();
    await expect.poll(() => dialog.count()).toBe(0);
    expect(await capturedCount()).toBeGreaterThan(0);

    await page.getByRole('button', { name: 'Clear captured mail…' }).click();
    await screenshot(page, 'mail-clear-dialog');
    await page.getByRole('dialog').getByRole('button', { name: 'Clear captured mail' }).click();
    await page.getByText(/Cleared \d+ captured messages?\./).waitFor();
    expect(await capturedCount()).toBe(0);
    await page.getByText('No mail captured yet').waitFor();
  });
});

describe('the Mail page (researcher)', () => {
  it('is not in the navigation, and /mail says why it is not available', async () => {
    const page = await openPage();
    await signInThroughForm(page, live.url, 'researcher@lab.test');
    await page.getByRole('link', { name: 'Calendar' }).waitFor();
    expect(await page.getByRole('link', { name: 'Mail', exact: true }).count()).toBe(0);
    await page.goto(`${live.url}/mail`);
    await page.getByRole('heading', { name: 'Not available for your role' }).waitFor();
    expect(await page.getByText('The Mail page is for lab managers').count()).toBe(1);
    await screenshot(page, 'mail-researcher-403');
  });
});

describe('the Mail page with SMTP_URL set (the lab relay)', () => {
  let relayed: TestApp;
  let server: Server;
  let url: string;
  beforeAll(async () => {
    const port = await freePort();
    url = `http://127.0.0.1:${port}`;
    // A relay nobody listens on, and no worker running: whatever is queued stays waiting.
    relayed = await startTestApp({ CLIENT_DIST: process.env.TEST_CLIENT_DIST ?? '', PUBLIC_URL: url, SMTP_URL: `smtp://127.0.0.1:${await freePort()}` });
    server = await new Promise<Server>((resolve) => {
      const s = relayed.app.listen(port, '127.0.0.1', () => resolve(s));
    });
    await relayed.db.sequelize.query(
      `INSERT INTO outbox (kind, to_address, subject, text_body, html_body, attempts, last_error)
       VALUES ('invitation', 'new.person@lab.test', 'You are invited to Skewbench', 't', '<p>h</p>', 2, 'ECONNREFUSED connect ECONNREFUSED 127.0.0.1:1')`,
    );
  });
  afterAll(async () => {
    server?.closeAllConnections();
    await new Promise((r) => server?.close(r));
    await relayed?.close();
  });

  it('says mail goes to the relay and shows only the outbox', async () => {
    const page = await openPage();
    await signInThroughForm(page, url, 'manager@lab.test');
    await page.getByRole('link', { name: 'Mail', exact: true }).click();
    await page.getByText('Mail goes to the lab’s relay').waitFor();
    expect(await page.getByLabel('Recipient').count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Clear captured mail…' }).count()).toBe(0);
    await page.getByRole('listitem', { name: 'Waiting: You are invited to Skewbench' }).waitFor();
    expect(await page.getByTestId('outbox-waiting').textContent()).toBe('1');
    await screenshot(page, 'mail-relay');
  });
});
