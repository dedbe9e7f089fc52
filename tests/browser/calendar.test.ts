import type { Browser, BrowserContext, Page } from 'playwright-core';
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

/** A page whose browser runs in `timezoneId`, on purpose never the lab's zone: the calendar must show the lab's clock anyway. */
async function openPage(timezoneId: string): Promise<Page> {
  context = await browser.newContext({ viewport: { width: 1280, height: 900 }, timezoneId, locale: 'en-US' });
  return context.newPage();
}

/** Opens the calendar and goes to next week (future, inside every demo booking window); returns its Thursday, YYYY-MM-DD. */
async function nextWeeksThursday(page: Page): Promise<string> {
  await page.getByRole('link', { name: 'Calendar' }).click();
  await page.locator('.fc-timegrid').waitFor();
  const before = await page.locator('.fc-col-header-cell').first().getAttribute('data-date');
  await page.getByRole('button', { name: /Next/ }).click();
  await expect.poll(() => page.locator('.fc-col-header-cell').first().getAttribute('data-date')).not.toBe(before);
  // Weeks start on Monday, so Thursday is the fourth column.
  const thursday = await page.locator('.fc-col-header-cell').nth(3).getAttribute('data-date');
  expect(thursday).toMatch(/^\d{4}-\d{2}-\d{2}$/);
  return thursday!;
}

/** Drags down a day's column from the start of the `from` slot to the end of the `last` slot, as a person would with the mouse. */
async function dragSlots(page: Page, day: string, from: string, last: string) {
  const first = page.locator(`.fc-timegrid-slot-lane[data-time="${from}:00"]`);
  const final = page.locator(`.fc-timegrid-slot-lane[data-time="${last}:00"]`);
  await final.scrollIntoViewIfNeeded();
  await first.scrollIntoViewIfNeeded();
  const column = (await page.locator(`.fc-timegrid-col[data-date="${day}"]`).boundingBox())!;
  const top = (await first.boundingBox())!;
  const bottom = (await final.boundingBox())!;
  const x = column.x + column.width / 2;
  await page.mouse.move(x, top.y + 4);
  await page.mouse.down();
  await page.mouse.move(x, top.y + (bottom.y - top.y) / 2, { steps: 8 });
  await page.mouse.move(x, bottom.y + bottom.height - 4, { steps: 8 });
  await page.mouse.up();
}

/** The lab's wall clock of an instant, with Intl directly (independent of the app's own helpers). */
function labClock(instant: string): string {
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat('en-US', { timeZone: live.config.lab.timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit' })
      .formatToParts(new Date(instant))
      .map((p) => [p.type, p.value]),
  );
  return `${parts.year}-${parts.month}-${parts.day} ${parts.hour}:${parts.minute}`;
}

// The journeys build on each other (one live app, one database): the first books the slot that the
// second runs into and the third looks at; the fourth moves and cancels it, which offers it to the second. Slot: next
// week's Thursday, 13:00–17:00 on the lab's clock.
describe('calendar', () => {
  let thursday = '';

  it('a researcher drags across next Thursday afternoon, books PS-2, SG-1 and SA-1, and sees the booking in lab time', async () => {
    const page = await openPage('America/New_York');
    await signInThroughForm(page, live.url, 'researcher@lab.test');
    thursday = await nextWeeksThursday(page);
    await dragSlots(page, thursday, '13:00', '16:30');

    const dialog = page.getByRole('dialog', { name: 'New booking' });
    await dialog.waitFor();
    // The form is prefilled with the dragged range on the lab's clock, not New York's.
    expect(await dialog.getByLabel('Start').inputValue()).toBe(`${thursday}T13:00`);
    expect(await dialog.getByLabel('End').inputValue()).toBe(`${thursday}T17:00`);
    expect(await dialog.getByText(/maximum safe level before connecting a source/).count()).toBe(1);
    expect(await dialog.getByLabel('Maintenance block').count()).toBe(0);

    await dialog.getByRole('button', { name: 'Book' }).click();
    await expect.poll(() => dialog.getByText('Choose at least one instrument').count()).toBe(1);
    await expect.poll(() => dialog.getByText('Say what the booking is for').count()).toBe(1);

    for (const tag of ['PS-2', 'SG-1', 'SA-1']) await dialog.getByRole('checkbox', { name: new RegExp(`^${tag}\\b`) }).check();
    await dialog.getByLabel('Purpose').fill('Phase noise of the VCO test chip');
    await screenshot(page, 'calendar-booking-form');
    const created = page.waitForResponse((r) => r.url().endsWith('/api/bookings') && r.request().method() === 'POST');
    await dialog.getByRole('button', { name: 'Book' }).click();
    const answer = await created;
    expect(answer.status()).toBe(201);
    const { booking } = (await answer.json()) as { booking: { startsAt: string; endsAt: string } };
    // The instants sent are 13:00 and 17:00 in the lab's zone, whatever the browser's zone.
    expect(labClock(booking.startsAt)).toBe(`${thursday} 13:00`);
    expect(labClock(booking.endsAt)).toBe(`${thursday} 17:00`);

    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
    const event = page.locator(`.fc-timegrid-col[data-date="${thursday}"] .fc-event`, { hasText: 'PS-2 · SA-1 · SG-1 — Tobiah R.' });
    await expect.poll(() => event.count()).toBe(1);
    expect(await event.textContent()).toContain('13:00 - 17:00');
    await expect.poll(() => page.getByRole('status').filter({ hasText: /^Booked PS-2 · SA-1 · SG-1/ }).count()).toBe(1);
    await screenshot(page, 'calendar-researcher-booked');
  });

  it('a second researcher tries the same slot and is told who holds it, then joins the waitlist', async () => {
    expect(thursday).not.toBe('');
    const page = await openPage('Asia/Tokyo');
    await signInThroughForm(page, live.url, 'researcher2@lab.test');
    expect(await nextWeeksThursday(page)).toBe(thursday);
    await expect.poll(() => page.locator(`.fc-timegrid-col[data-date="${thursday}"] .fc-event`, { hasText: 'PS-2 · SA-1 · SG-1 — Tobiah R.' }).count()).toBe(1);
    // The slot is covered by the booking, so a press there opens that booking: book through the button instead,
    // the way a keyboard user does, typing the times on the lab's clock.
    await page.getByRole('button', { name: 'New booking' }).click();
    const dialog = page.getByRole('dialog', { name: 'New booking' });
    await dialog.waitFor();
    await dialog.getByLabel('Start').fill(`${thursday}T13:00`);
    await dialog.getByLabel('End').fill(`${thursday}T17:00`);
    for (const tag of ['PS-2', 'SG-1', 'SA-1']) await dialog.getByRole('checkbox', { name: new RegExp(`^${tag}\\b`) }).check();
    await dialog.getByLabel('Purpose').fill('Wafer map of the LNA die');
    await dialog.getByRole('button', { name: 'Book' }).click();

    const clashes = dialog.getByRole('list', { name: 'Clashing slots' });
    await clashes.waitFor();
    for (const tag of ['PS-2', 'SG-1', 'SA-1']) {
      await expect.poll(() => clashes.getByText(new RegExp(`^${tag} is booked .*13:00–17:00 by Tobiah Renwick$`)).count()).toBe(1);
    }
    await screenshot(page, 'calendar-clash');
    await dialog.getByRole('button', { name: 'Join the waitlist for this slot' }).click();
    await expect.poll(() => dialog.getByText(/^You are on the waitlist for PS-2, SA-1, SG-1, /).count()).toBe(1);

    await page.keyboard.press('Escape');
    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
    await page.getByRole('link', { name: 'My bookings' }).click();
    const waitlist = page.getByRole('list', { name: 'Waitlist entries' });
    await waitlist.waitFor();
    // As the page writes the day (en-US): `Thu, Dec 10`; the demo's own waitlist entry is on a Monday.
    const day = new Intl.DateTimeFormat('en-US', { timeZone: 'UTC', weekday: 'short', day: 'numeric', month: 'short' }).format(new Date(`${thursday}T12:00:00Z`));
    await expect.poll(() => waitlist.getByRole('listitem').filter({ hasText: `${day}, 13:00–17:00` }).filter({ hasText: 'Waiting' }).count()).toBe(3);
    await screenshot(page, 'my-bookings-waitlist');
  });

  it('a visitor sees the booking by its tags only and cannot open the booking form', async () => {
    expect(thursday).not.toBe('');
    const page = await openPage('UTC');
    await signInThroughForm(page, live.url, 'visitor@lab.test');
    expect(await page.getByRole('link', { name: 'My bookings' }).count()).toBe(0);
    expect(await nextWeeksThursday(page)).toBe(thursday);
    const event = page.locator(`.fc-timegrid-col[data-date="${thursday}"] .fc-event`, { hasText: 'PS-2 · SA-1 · SG-1' });
    await expect.poll(() => event.count()).toBe(1);
    expect(await event.textContent()).toContain('13:00 - 17:00');
    expect(await page.getByRole('button', { name: 'New booking' }).count()).toBe(0);

    await dragSlots(page, thursday, '07:00', '07:30');
    expect(await page.getByRole('dialog').count()).toBe(0);
    expect(await page.locator('.fc-highlight').count()).toBe(0);

    await event.click();
    const details = page.getByRole('dialog', { name: 'PS-2 · SA-1 · SG-1' });
    await details.waitFor();
    expect(await details.getByText('Booked by').count()).toBe(0);
    expect(await details.getByRole('link', { name: 'Open the booking page' }).count()).toBe(1);
    expect(await page.getByText(/Tobiah|Renwick/).count()).toBe(0);
    await screenshot(page, 'calendar-visitor');
    await page.keyboard.press('Escape');
    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);

    // This week holds the demo's bookings and its maintenance block (Wednesday, SA-1): hatched, no names either.
    await page.getByRole('button', { name: 'Today' }).click();
    const maintenance = page.locator('.fc-event.sb-maintenance');
    await expect.poll(() => maintenance.count()).toBeGreaterThan(0);
    expect(await maintenance.first().textContent()).toContain('Maintenance');
    await expect.poll(() => page.locator('.fc-event').count()).toBeGreaterThan(3);
    expect(await page.getByText(/Tobiah|Renwick|Sunniva|Okoro|Ilse|Marwood/).count()).toBe(0);
    await screenshot(page, 'calendar-visitor-this-week');
  });

  it('the researcher resizes his booking past PS-2’s 6-hour limit (refused, it snaps back), moves it an hour later, then uses its page', async () => {
    expect(thursday).not.toBe('');
    const page = await openPage('America/New_York');
    await signInThroughForm(page, live.url, 'researcher@lab.test');
    expect(await nextWeeksThursday(page)).toBe(thursday);
    const event = page.locator(`.fc-timegrid-col[data-date="${thursday}"] .fc-event`, { hasText: 'PS-2 · SA-1 · SG-1 — Tobiah R.' });
    await event.waitFor();
    await page.locator('.fc-timegrid-slot-lane[data-time="20:00:00"]').scrollIntoViewIfNeeded();

    await event.hover();
    const handle = (await event.locator('.fc-event-resizer-end').boundingBox())!;
    const lane = (await page.locator('.fc-timegrid-slot-lane[data-time="19:30:00"]').boundingBox())!;
    await page.mouse.move(handle.x + handle.width / 2, handle.y + handle.height / 2);
    await page.mouse.down();
    await page.mouse.move(handle.x + handle.width / 2, lane.y + lane.height - 3, { steps: 12 });
    await page.mouse.up();
    const refused = page.getByRole('alert').filter({ hasText: 'PS-2 · SA-1 · SG-1 stays where it was' });
    await expect.poll(() => refused.count()).toBe(1);
    expect(await refused.getByRole('listitem').count()).toBeGreaterThan(0);
    await expect.poll(() => event.textContent()).toContain('13:00 - 17:00');
    await screenshot(page, 'calendar-resize-refused');

    // Two half-hour slots down: 14:00–18:00 on the lab's clock.
    const slot = (await page.locator('.fc-timegrid-slot-lane[data-time="13:00:00"]').boundingBox())!;
    const box = (await event.boundingBox())!;
    const patched = page.waitForResponse((r) => /\/api\/bookings\/\d+$/.test(r.url()) && r.request().method() === 'PATCH');
    await page.mouse.move(box.x + box.width / 2, box.y + 30);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width / 2, box.y + 30 + slot.height, { steps: 8 });
    await page.mouse.move(box.x + box.width / 2, box.y + 30 + 2 * slot.height, { steps: 8 });
    await page.mouse.up();
    const answer = await patched;
    expect(answer.status()).toBe(200);
    const { booking } = (await answer.json()) as { booking: { startsAt: string; endsAt: string } };
    expect(labClock(booking.startsAt)).toBe(`${thursday} 14:00`);
    expect(labClock(booking.endsAt)).toBe(`${thursday} 18:00`);
    await expect.poll(() => event.textContent()).toContain('14:00 - 18:00');
    await expect.poll(() => page.getByRole('status').filter({ hasText: /^Moved PS-2 · SA-1 · SG-1 to .*14:00–18:00/ }).count()).toBe(1);

    // The details dialog closes on Escape and gives focus back to the event that opened it.
    await event.focus();
    await page.keyboard.press('Enter');
    const details = page.getByRole('dialog', { name: 'PS-2 · SA-1 · SG-1' });
    await details.waitFor();
    expect(await details.getByText('Tobiah Renwick').count()).toBe(1);
    await page.keyboard.press('Escape');
    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
    expect(await page.evaluate(() => document.activeElement?.classList.contains('fc-event'))).toBe(true);

    await event.click();
    await details.getByRole('link', { name: 'Open the booking page' }).click();
    await page.waitForURL(/\/bookings\/\d+$/);
    const trail = page.getByRole('list', { name: 'Audit trail' });
    await trail.waitFor();
    expect(await trail.getByRole('listitem').filter({ hasText: /^Created by Tobiah Renwick/ }).count()).toBe(1);
    const move = trail.getByRole('listitem').filter({ hasText: /^Moved by Tobiah Renwick/ });
    expect(await move.count()).toBe(1);
    expect(await move.textContent()).toMatch(/13:00 → .*14:00/);

    // A week ahead is too early to check in: the server says so, and the page shows it.
    await page.getByRole('button', { name: 'Check in' }).click();
    await expect.poll(() => page.getByRole('alert').count()).toBe(1);
    await page.getByRole('button', { name: 'Cancel…' }).click();
    const cancel = page.getByRole('form', { name: 'Cancel the booking' });
    await cancel.getByRole('button', { name: 'Cancel the booking' }).click();
    await expect.poll(() => cancel.getByText('Give a reason for cancelling').count()).toBe(1);
    await cancel.getByLabel('Reason').fill('Die cracked during dicing');
    await cancel.getByRole('button', { name: 'Cancel the booking' }).click();
    await expect.poll(() => page.getByText('Booking cancelled.').count()).toBe(1);
    await expect.poll(() => page.getByText('Die cracked during dicing').count()).toBeGreaterThan(0);
    await screenshot(page, 'booking-page-cancelled');

    // Cancelled bookings leave the calendar.
    await page.goto(`${live.url}/calendar?date=${thursday}`);
    await page.locator('.fc-timegrid').waitFor();
    await expect.poll(() => page.locator(`.fc-timegrid-col[data-date="${thursday}"] .fc-event`).count()).toBe(0);
  });

  it('the second researcher is offered the freed slot and follows the link, which books it', async () => {
    expect(thursday).not.toBe('');
    const page = await openPage('Europe/Lisbon');
    await signInThroughForm(page, live.url, 'researcher2@lab.test');
    await page.getByRole('link', { name: 'My bookings' }).click();
    const offer = page.getByRole('link', { name: 'The slot is free — book it' }).first();
    await offer.waitFor();
    await offer.click();
    await page.waitForURL(/\/waitlist\/\d+\/claim$/);
    await page.getByRole('status').filter({ hasText: 'The slot is yours' }).waitFor();
    await page.getByRole('link', { name: 'Open the booking' }).click();
    await page.waitForURL(/\/bookings\/\d+$/);
    await expect.poll(() => page.getByText('Sunniva Okoro-Vale').count()).toBeGreaterThan(0);
    await screenshot(page, 'calendar-offered-day');
  });
});
