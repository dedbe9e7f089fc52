// Benchmark data in plain SQL (generate_series), one statement per table: a million bookings take about two
// minutes, most of it in booking_instruments (exclusion constraint, indexes and foreign keys checked per row).
import pg from 'pg';
import bcrypt from 'bcryptjs';

export const BENCH_EMAIL = 'bench@lab.test';
export const BENCH_PASSWORD = 'skewbench-bench';
/** Four back-to-back bookings a day on every instrument. */
const SLOT_HOURS = 6;
const INSTRUMENTS = 60;
/** Each instrument's last booking ends this long after the measured week begins: 19 six-hour slots fall in it. */
export const DATA_END_AFTER_WEEK_START_HOURS = 4 * 24 + 18;

/**
 * The measured week: Monday 00:00 UTC three weeks from now. Every instrument's bookings run back to back up to
 * Friday 18:00 of that week, so 10 instruments give 10 × 19 = 190 rows whatever the size, with history before.
 */
export function benchWeek(now = new Date()) {
  const monday = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate()));
  monday.setUTCDate(monday.getUTCDate() - ((monday.getUTCDay() + 6) % 7) + 21);
  const to = new Date(monday.getTime() + 7 * 86_400_000);
  return { from: monday.toISOString(), to: to.toISOString(), expectedRows: 10 * (DATA_END_AFTER_WEEK_START_HOURS / SLOT_HOURS) };
}

/** One researcher, 60 instruments and `count` bookings; returns { userId, instrumentIds }. */
export async function seedBench(connection, { count, week }) {
  const client = new pg.Client(connection);
  await client.connect();
  try {
    const hash = await bcrypt.hash(BENCH_PASSWORD, 12);
    const { rows: [user] } = await client.query(
      `INSERT INTO users (email, name, role, password_hash) VALUES ($1, 'Bench Researcher', 'researcher', $2) RETURNING id`,
      [BENCH_EMAIL, hash],
    );
    await client.query(
      `INSERT INTO instruments (tag, name, kind, location, calibration_due_on)
       SELECT format('BX-%s', lpad(n::text, 2, '0')), format('Bench instrument %s', n),
              (ARRAY['probe-station','signal-generator','spectrum-analyzer','oscilloscope','vna','power-supply'])[1 + n % 6],
              format('Room %s', 100 + n % 4), current_date + 365
         FROM generate_series(1, $1::int) n`,
      [INSTRUMENTS],
    );
    // Booking g sits on instrument g % 60, slot g / 60 counted backwards from the data's end, so every instrument
    // ends at the same instant. Past bookings are completed, the running one checked in, later ones confirmed:
    // the server's no-show sweep finds nothing to change while the benchmark runs.
    const dataEnd = new Date(Date.parse(week.from) + DATA_END_AFTER_WEEK_START_HOURS * 3_600_000).toISOString();
    await client.query(
      `INSERT INTO bookings (id, owner_id, status, starts_at, ends_at, purpose, project_code, checked_in_at, checked_out_at)
       SELECT g + 1, $1, CASE WHEN e <= now() THEN 'completed' WHEN s <= now() THEN 'checked-in' ELSE 'confirmed' END,
              s, e, 'Beamformer measurement ' || g, 'TTD-' || (g % 7),
              CASE WHEN s <= now() THEN s END, CASE WHEN e <= now() THEN e END
         FROM generate_series(0, $2::int - 1) g,
              LATERAL (SELECT $3::timestamptz - (g / ${INSTRUMENTS} + 1) * interval '${SLOT_HOURS} hours' AS s) st,
              LATERAL (SELECT st.s + interval '${SLOT_HOURS} hours' AS e) en`,
      [user.id, count, dataEnd],
    );
    await client.query(`SELECT setval('bookings_id_seq', $1::int)`, [count]);
    // One instrument per booking; blocked_until = ends_at and active, as the exclusion constraint checks them.
    await client.query(
      `INSERT INTO booking_instruments (booking_id, instrument_id, starts_at, ends_at, blocked_until, active)
       SELECT b.id, i.ids[1 + (b.id - 1) % ${INSTRUMENTS}], b.starts_at, b.ends_at, b.ends_at, true
         FROM bookings b, (SELECT array_agg(id ORDER BY id) AS ids FROM instruments) i`,
    );
    await client.query('ANALYZE');
    const { rows: instruments } = await client.query('SELECT id FROM instruments ORDER BY id');
    return { userId: user.id, instrumentIds: instruments.map((r) => r.id) };
  } finally {
    await client.end();
  }
}
