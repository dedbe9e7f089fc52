// The claim page behind the link of a freed-slot e-mail: opening the link from the message books the slot and
// shows the booking; opening it again explains why nothing more can be booked.
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, screenshot, startLiveApp, type LiveApp } from '../support/browser.js';
import { signIn } from '../support/test-app.js';
import { at } from '../support/time.js';

let live: LiveApp;
let browser: Browser;
let context: BrowserContext | undefined;
const pageErrors: string[] = [];

beforeAll(async () => {
  [live, browser] = await Promise.all([startLiveApp(), launchBrowser()]);
  // The demo's bookings would collide with slots relative to the moment the test runs.
  await live.db.sequelize.query('DELETE FROM waitlist_entries; DELETE FROM bookings; DELETE FROM outbox; DELETE FROM captured_mail;');
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
  context = await browser.newContext({ viewport: { width: 1280, height: 860 }, timezoneId: 'America/Chicago', locale: 'en-US' });
  const page = await context.newPage();
  page.on('pageerror', (e) => pageErrors.push(e.message));
  return page;
}

/** The lab's wall clock of an instant, with Intl directly. */
const labClock = (iso: string) => new Intl.DateTimeFormat('en-GB', { timeZone: live.config.lab.timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(iso));

describe('claiming a freed slot from the e-mail link', () => {
  it('signs in, books the slot and shows it; opening the link again says it is already booked', async () => {
    const [researcher, researcher2, manager] = await Promise.all([signIn(live.app, 'researcher@lab.test'), signIn(live.app, 'researcher2@lab.test'), signIn(live.app, 'manager@lab.test')]);
    const sg2 = ((await manager.agent.get('/api/instruments')).body.instruments as { id: number; tag: string }[]).find((i) => i.tag === 'SG-2')!.id;
    const startsAt = at(6, 18);
    const endsAt = at(6, 20);
    const taken = await researcher.agent.post('/api/bookings').set('x-csrf-token', researcher.csrf).send({ instrumentIds: [sg2], startsAt, endsAt, purpose: 'Mixer conversion loss' });
    expect(taken.status).toBe(201);
    const entry = await researcher2.agent.post('/api/waitlist').set('x-csrf-token', researcher2.csrf).send({ instrumentId: sg2, startsAt, endsAt, note: 'LO for the mixer test' });
    expect(entry.status).toBe(201);
    await researcher.agent.post(`/api/bookings/${taken.body.booking.id}/cancel`).set('x-csrf-token', researcher.csrf).send({ reason: 'Wafer not ready' }).expect(200);

    // The link comes from the message as it reached the local SMTP server.
    await live.mail!.worker.kick();
    const [offer] = (await manager.agent.get('/api/mailbox?to=researcher2@lab.test').expect(200)).body as { id: number; subject: string }[];
    expect(offer!.subject).toMatch(/^Free now: SG-2/);
    const { html } = (await manager.agent.get(`/api/mailbox/${offer!.id}`).expect(200)).body.message as { html: string };
    const link = /href="([^"]+\/claim)"/.exec(html)?.[1];
    expect(link).toBe(`${live.url}/waitlist/${entry.body.entry.id}/claim`);

    const page = await openPage();
    await page.goto(link!);
    // Not signed in yet: the sign-in page keeps where the link was going.
    await page.getByLabel('E-mail').fill('researcher2@lab.test');
    await page.getByLabel('Password').fill('skewbench-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(`**/waitlist/${entry.body.entry.id}/claim`);
    const yours = page.getByRole('status').filter({ hasText: 'The slot is yours' });
    await yours.waitFor();
    expect(await yours.textContent()).toContain(`SG-2, `);
    expect(await yours.textContent()).toContain(`${labClock(startsAt)}–${labClock(endsAt)}`);
    await screenshot(page, 'waitlist-claim-booked');

    const [booking] = (await researcher2.agent.get('/api/bookings/mine').expect(200)).body.upcoming as { id: number; startsAt: string }[];
    expect(booking!.startsAt).toBe(startsAt);
    await page.getByRole('link', { name: 'Open the booking' }).click();
    await page.waitForURL(`**/bookings/${booking!.id}`);

    // The same link again: the offer was used, and the page says so instead of booking twice.
    await page.goto(link!);
    const refused = page.getByRole('status').filter({ hasText: 'The slot could not be booked.' });
    await refused.waitFor();
    expect(await refused.textContent()).toContain('You have already booked this slot from the offer');
    await page.getByRole('link', { name: 'My bookings and waitlist' }).waitFor();
    await screenshot(page, 'waitlist-claim-refused');
    expect((await researcher2.agent.get('/api/bookings/mine').expect(200)).body.upcoming).toHaveLength(1);
    expect(pageErrors).toEqual([]);
  });

  it('for an offer of part of the waited time, shows that part; taken again, the person stays on the waitlist and a later offer books it', async () => {
    const [researcher, researcher2, manager] = await Promise.all([signIn(live.app, 'researcher@lab.test'), signIn(live.app, 'researcher2@lab.test'), signIn(live.app, 'manager@lab.test')]);
    const os1 = ((await manager.agent.get('/api/instruments')).body.instruments as { id: number; tag: string }[]).find((i) => i.tag === 'OS-1')!.id;
    const book = (who: typeof manager, startsAt: string, endsAt: string) =>
      who.agent.post('/api/bookings').set('x-csrf-token', who.csrf).send({ instrumentIds: [os1], startsAt, endsAt, purpose: 'Eye diagrams' });
    const cancel = (who: typeof manager, id: number) => who.agent.post(`/api/bookings/${id}/cancel`).set('x-csrf-token', who.csrf).send({ reason: 'Not needed' }).expect(200);
    // Sunniva waits for 13–17 while OS-1 is taken 13–14 and 15–16; only 15–16 is freed.
    expect((await book(manager, at(8, 13), at(8, 14))).status).toBe(201);
    const freed = await book(researcher, at(8, 15), at(8, 16));
    expect(freed.status).toBe(201);
    const entry = await researcher2.agent.post('/api/waitlist').set('x-csrf-token', researcher2.csrf).send({ instrumentId: os1, startsAt: at(8, 13), endsAt: at(8, 17) });
    expect(entry.status).toBe(201);
    await cancel(researcher, freed.body.booking.id);
    // Someone books the freed hour before Sunniva opens her link.
    const again = await book(manager, at(8, 15), at(8, 16));
    expect(again.status).toBe(201);

    const link = `${live.url}/waitlist/${entry.body.entry.id}/claim`;
    const page = await openPage();
    await page.goto(link);
    await page.getByLabel('E-mail').fill('researcher2@lab.test');
    await page.getByLabel('Password').fill('skewbench-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(`**/waitlist/${entry.body.entry.id}/claim`);
    const refused = page.getByRole('status').filter({ hasText: 'The slot could not be booked.' });
    await refused.waitFor();
    expect(await refused.textContent()).toContain('you stay on the waitlist');
    // The waited-for range comes with the waitlist, which may answer after the claim.
    const offered = page.locator('p').filter({ hasText: 'Offered to you:' }).filter({ hasText: 'the time you are waiting for' });
    await offered.waitFor();
    const offeredText = (await offered.textContent())!;
    expect(offeredText).toContain(`${labClock(at(8, 15))}–${labClock(at(8, 16))}`);
    expect(offeredText).toMatch(new RegExp(`the time you are waiting for, .*${labClock(at(8, 13))}–${labClock(at(8, 17))}\\.$`));
    await screenshot(page, 'waitlist-claim-partial-taken');
    const [waiting] = (await researcher2.agent.get('/api/waitlist/mine').expect(200)).body.entries.filter((e: { id: number }) => e.id === entry.body.entry.id);
    expect(waiting).toMatchObject({ status: 'waiting', offeredStartsAt: null });

    // The hour frees again: offered again, and the same link now books exactly 15–16.
    await cancel(manager, again.body.booking.id);
    await page.goto(link);
    const yours = page.getByRole('status').filter({ hasText: 'The slot is yours' });
    await yours.waitFor();
    expect(await yours.textContent()).toContain(`OS-1, `);
    expect(await yours.textContent()).toContain(`${labClock(at(8, 15))}–${labClock(at(8, 16))}`);
    await page.getByText('That is the part of the time you were waiting for').waitFor();
    await screenshot(page, 'waitlist-claim-partial-booked');
    const upcoming = (await researcher2.agent.get('/api/bookings/mine').expect(200)).body.upcoming as { startsAt: string; endsAt: string; instruments: { tag: string }[] }[];
    expect(upcoming.filter((b) => b.instruments[0]!.tag === 'OS-1').map((b) => [b.startsAt, b.endsAt])).toEqual([[at(8, 15), at(8, 16)]]);
    expect(pageErrors).toEqual([]);
  });
});
