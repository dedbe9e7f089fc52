// The lab managers' morning digest of calibrations: overdue first, then those falling due soon.
import type { RenderedMail } from '../outbox.service.js';
import { absoluteUrl, composeMail, type MailLab } from './compose.js';

export interface CalibrationDue {
  id: number;
  tag: string;
  name: string;
  /** YYYY-MM-DD */
  dueOn: string;
  /** Whole days from the lab's today to the due date; negative when overdue. */
  daysLeft: number;
}

const days = (n: number) => `${n} day${n === 1 ? '' : 's'}`;

function dueText(i: CalibrationDue): string {
  if (i.daysLeft < 0) return `overdue since ${i.dueOn} (${days(-i.daysLeft)})`;
  if (i.daysLeft === 0) return `due today, ${i.dueOn}`;
  return `due ${i.dueOn} (in ${days(i.daysLeft)})`;
}

/** `today` is the lab's date (YYYY-MM-DD); `windowDays` how far ahead "due soon" reaches. */
export function calibrationDigestMail(lab: MailLab, recipientName: string, today: string, windowDays: number, due: CalibrationDue[]): RenderedMail {
  const overdue = due.filter((i) => i.daysLeft < 0);
  const soon = due.filter((i) => i.daysLeft >= 0);
  const counts = [overdue.length && `${overdue.length} overdue`, soon.length && `${soon.length} due within ${windowDays} days`].filter(Boolean).join(', ');
  const lead = [`On ${today}, ${due.length === 1 ? 'one instrument is' : `${due.length} instruments are`} overdue for calibration or fall${due.length === 1 ? 's' : ''} due within ${windowDays} days.`];
  if (overdue.length) lead.push('Overdue instruments can be booked only with a lab manager’s override until their new due date is entered.');
  return composeMail(lab, {
    subject: `Calibration: ${counts} (${today})`,
    recipientName,
    lead,
    // One link per instrument, to its page, which says what it is and where; overdue ones first.
    links: [...overdue, ...soon].map((i) => ({ label: `${i.tag} (${i.name}): ${dueText(i)}`, url: `/instruments/${i.id}` })),
    action: { label: 'Open the instruments', url: '/instruments' },
    after: ['After a calibration, enter the next due date on the instrument’s page.'],
    footer: [`You receive this each morning as a lab manager of ${lab.name}, on days with something to report.`, `It can be switched off on your account page ("Calibration digest"): ${absoluteUrl(lab, '/account')}`],
  });
}
