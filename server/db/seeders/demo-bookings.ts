import { QueryTypes, type Sequelize } from 'sequelize';
import { addDays, labWallTimeToUtc } from '../../../shared/domain/lab-time.js';

type Who = 'tobiah' | 'sunniva' | 'ilse';

interface Pattern {
  who: Who;
  tags: string[];
  from: string;
  to: string;
  purpose: string;
  project: string;
  kind?: 'maintenance';
}

/**
 * The demo lab's week: two PhD researchers measuring an invented four-input true-time-delay receiver
 * ("TTD4", rev B) on the probe stations. Thursday afternoons stay free on PS-2, SG-1 and SA-1.
 * Index 1 = Monday … 5 = Friday.
 */
const week: Record<number, Pattern[]> = {
  1: [
    { who: 'tobiah', tags: ['PS-1', 'SG-1', 'SG-2', 'SA-1'], from: '13:00', to: '17:00', purpose: 'Two-tone interferer rejection, TTD4 rev B die 7', project: 'TTD4' },
    { who: 'sunniva', tags: ['PS-2', 'OS-1', 'PSU-1'], from: '09:00', to: '12:00', purpose: 'Delay-cell step response', project: 'TTD4' },
  ],
  2: [
    { who: 'tobiah', tags: ['NA-1'], from: '09:00', to: '12:00', purpose: 'S-parameters of the input matching network', project: 'TTD4' },
    { who: 'sunniva', tags: ['PS-2', 'SG-1', 'SA-1'], from: '13:00', to: '16:30', purpose: 'Beam-squint sweep, 4–6 GHz', project: 'TTD4-SQ' },
  ],
  3: [
    { who: 'tobiah', tags: ['PS-1', 'SG-1', 'SA-1', 'SMU-1'], from: '09:00', to: '13:00', purpose: 'Null depth against chip delay code', project: 'TTD4' },
    { who: 'ilse', tags: ['SA-1'], from: '14:00', to: '16:00', purpose: 'Firmware update and self-alignment', project: '', kind: 'maintenance' },
  ],
  4: [
    { who: 'sunniva', tags: ['PS-2', 'SG-2', 'OS-1'], from: '09:00', to: '12:00', purpose: 'Delay-cell linearity', project: 'TTD4' },
    { who: 'tobiah', tags: ['PS-1', 'SMU-1'], from: '14:00', to: '17:00', purpose: 'Bias sweep of the combiner', project: 'TTD4' },
  ],
  5: [
    { who: 'tobiah', tags: ['PS-1', 'SG-1', 'SG-2', 'SA-1'], from: '09:00', to: '12:00', purpose: 'Interferer at −30°, desired at broadside', project: 'TTD4' },
    { who: 'sunniva', tags: ['PS-2', 'OS-1'], from: '13:00', to: '16:00', purpose: 'Group delay of the 4-tap line', project: 'TTD4-SQ' },
  ],
};

const handovers = [
  'Probes lifted, chuck at load position. SG-1 and SG-2 RF off, levels −20 dBm. C-003/C-004 pair and AT-10A/AT-10B left on the inputs.',
  'Bench clean. SP-01 and the semi-rigids stay on PS-1; please do not re-torque them, they are phase-matched.',
  'SA-1 left at 5 GHz centre, 100 MHz span, RBW 100 kHz. DC supplies off. Die 7 still on the chuck, vacuum on.',
  'Oscilloscope probes back in the drawer. PS-2 microscope lamp off. One DC needle looks bent: reported to Ilse.',
];

/**
 * Three weeks of bookings around `today` (two back, one ahead), a maintenance block, completed bookings with
 * handover notes, a no-show, and a waitlist entry. Written with SQL: past bookings would be refused by the rules.
 */
export async function seedDemoBookings(
  sequelize: Sequelize,
  { today, timeZone, now, people, instruments }: { today: string; timeZone: string; now: Date; people: Record<Who, number>; instruments: Map<string, number> },
) {
  await sequelize.transaction(async (transaction) => {
    const q = <T extends object>(sql: string, replacements: Record<string, unknown>) =>
      sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT, transaction });
    const gaps = new Map(
      (await q<{ id: number; min_gap_minutes: number }>('SELECT id, min_gap_minutes FROM instruments', {})).map((r) => [r.id, r.min_gap_minutes]),
    );
    let n = 0;
    let noShowDone = false;
    let waitlisted = false;
    for (let offset = -14; offset <= 7; offset++) {
      const date = addDays(today, offset);
      const weekday = new Date(`${date}T00:00:00Z`).getUTCDay();
      for (const p of week[weekday] ?? []) {
        const start = labWallTimeToUtc(date, p.from, timeZone);
        const end = labWallTimeToUtc(date, p.to, timeZone);
        const ended = end <= now;
        const started = start <= now;
        // The second-latest Tuesday afternoon slot of Sunniva was a no-show: the chip was not back from bonding.
        const noShow = !noShowDone && ended && weekday === 2 && p.who === 'sunniva' && offset < -3;
        if (noShow) noShowDone = true;
        const status = p.kind === 'maintenance' ? (ended ? 'completed' : 'confirmed') : noShow ? 'no-show' : ended ? 'completed' : started ? 'checked-in' : 'confirmed';
        const handover = status === 'completed' && p.kind !== 'maintenance' ? handovers[n++ % handovers.length]! : null;
        const [row] = await q<{ id: number }>(
          `INSERT INTO bookings (kind, status, owner_id, starts_at, ends_at, purpose, project_code, handover_note, left_connected, checked_in_at, checked_out_at, created_at)
           VALUES (:kind, :status, :owner, :start, :end, :purpose, :project, :handover, :left, :checkedIn, :checkedOut, :created) RETURNING id`,
          {
            kind: p.kind ?? 'booking',
            status,
            owner: people[p.who],
            start,
            end,
            purpose: p.purpose,
            project: p.project,
            handover,
            left: handover ? 'See the handover note; setup record on the bench binder.' : null,
            checkedIn: status === 'completed' || status === 'checked-in' ? new Date(start.getTime() - 5 * 60_000) : null,
            checkedOut: status === 'completed' ? end : null,
            created: new Date(start.getTime() - 3 * 86_400_000),
          },
        );
        for (const tag of p.tags) {
          const instrumentId = instruments.get(tag)!;
          const gap = p.kind === 'maintenance' ? 0 : gaps.get(instrumentId) ?? 0;
          await q(
            `INSERT INTO booking_instruments (booking_id, instrument_id, starts_at, ends_at, blocked_until, active)
             VALUES (:id, :instrumentId, :start, :end, (:end)::timestamptz + make_interval(mins => :gap), :active) RETURNING booking_id`,
            { id: row!.id, instrumentId, start, end, gap, active: status !== 'no-show' },
          );
        }
        await q(`INSERT INTO booking_events (booking_id, actor_id, action, at, after) VALUES (:id, :owner, 'created', :at, :after) RETURNING id`, {
          id: row!.id,
          owner: people[p.who],
          at: new Date(start.getTime() - 3 * 86_400_000),
          after: JSON.stringify({ instruments: p.tags, startsAt: start.toISOString(), endsAt: end.toISOString(), purpose: p.purpose }),
        });
        if (status === 'completed' && handover) {
          await q(`INSERT INTO booking_events (booking_id, actor_id, action, at, after) VALUES (:id, :owner, 'checked-out', :at, :after) RETURNING id`, {
            id: row!.id,
            owner: people[p.who],
            at: end,
            after: JSON.stringify({ status: 'completed', handoverNote: handover }),
          });
        }
        // Sunniva waits for Tobiah's next Monday afternoon on SG-1, in case his die is not ready.
        if (!waitlisted && !started && weekday === 1 && p.who === 'tobiah') {
          waitlisted = true;
          await q(`INSERT INTO waitlist_entries (instrument_id, user_id, starts_at, ends_at, note) VALUES (:i, :u, :s, :e, :note) RETURNING id`, {
            i: instruments.get('SG-1')!,
            u: people.sunniva,
            s: start,
            e: end,
            note: 'Only need SG-1 for two hours of the afternoon.',
          });
        }
      }
    }
  });
}
