import type { Migration } from '../migrator.js';

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    // btree_gist lets one exclusion constraint combine "same instrument" (=) with "overlapping time" (&&).
    // It is a trusted extension since PostgreSQL 13: the database owner may create it.
    await q(`CREATE EXTENSION IF NOT EXISTS btree_gist`);
    await q(`
      CREATE TABLE bookings (
        id                      serial PRIMARY KEY,
        kind                    text NOT NULL DEFAULT 'booking' CHECK (kind IN ('booking', 'maintenance')),
        status                  text NOT NULL DEFAULT 'confirmed' CHECK (status IN ('confirmed', 'checked-in', 'completed', 'cancelled', 'no-show')),
        owner_id                integer NOT NULL REFERENCES users (id),
        starts_at               timestamptz NOT NULL,
        ends_at                 timestamptz NOT NULL,
        purpose                 text NOT NULL DEFAULT '',
        project_code            text NOT NULL DEFAULT '',
        notes                   text NOT NULL DEFAULT '',
        handover_note           text,
        left_connected          text,
        cancel_reason           text,
        calibration_override_by integer REFERENCES users (id),
        checked_in_at           timestamptz,
        checked_out_at          timestamptz,
        cancelled_at            timestamptz,
        cancelled_by            integer REFERENCES users (id),
        created_at              timestamptz NOT NULL DEFAULT now(),
        updated_at              timestamptz NOT NULL DEFAULT now(),
        CHECK (ends_at > starts_at)
      )`);
    // My bookings (upcoming and past) read one owner's range.
    await q(`CREATE INDEX bookings_owner_id_starts_at_idx ON bookings (owner_id, starts_at)`);
    // The no-show sweep reads confirmed bookings by start.
    await q(`CREATE INDEX bookings_status_starts_at_idx ON bookings (status, starts_at)`);

    // One row per instrument of a booking. The exclusion constraint is the guarantee against double booking:
    // while active, no two rows of one instrument may have overlapping [starts_at, blocked_until). blocked_until
    // is the end plus the instrument's minimum gap, so the gap holds under concurrency too.
    await q(`
      CREATE TABLE booking_instruments (
        booking_id    integer NOT NULL REFERENCES bookings (id) ON DELETE CASCADE,
        instrument_id integer NOT NULL REFERENCES instruments (id),
        starts_at     timestamptz NOT NULL,
        ends_at       timestamptz NOT NULL,
        blocked_until timestamptz NOT NULL,
        active        boolean NOT NULL DEFAULT true,
        PRIMARY KEY (booking_id, instrument_id),
        CHECK (blocked_until >= ends_at OR NOT active),
        CONSTRAINT booking_instruments_no_overlap
          EXCLUDE USING gist (instrument_id WITH =, tstzrange(starts_at, blocked_until, '[)') WITH &&) WHERE (active)
      )`);
    // Calendar range reads: starts_at < to AND starts_at > from − the longest booking AND ends_at > from.
    await q(`CREATE INDEX booking_instruments_instrument_id_starts_at_idx ON booking_instruments (instrument_id, starts_at)`);
    await q(`CREATE INDEX booking_instruments_starts_at_idx ON booking_instruments (starts_at)`);

    await q(`
      CREATE TABLE booking_events (
        id         serial PRIMARY KEY,
        booking_id integer NOT NULL REFERENCES bookings (id) ON DELETE CASCADE,
        actor_id   integer REFERENCES users (id),
        action     text NOT NULL,
        at         timestamptz NOT NULL DEFAULT now(),
        before     jsonb,
        after      jsonb
      )`);
    await q(`CREATE INDEX booking_events_booking_id_at_idx ON booking_events (booking_id, at)`);

    await q(`
      CREATE TABLE waitlist_entries (
        id            serial PRIMARY KEY,
        instrument_id integer NOT NULL REFERENCES instruments (id),
        user_id       integer NOT NULL REFERENCES users (id),
        starts_at     timestamptz NOT NULL,
        ends_at       timestamptz NOT NULL,
        note          text NOT NULL DEFAULT '',
        status        text NOT NULL DEFAULT 'waiting' CHECK (status IN ('waiting', 'offered', 'withdrawn', 'fulfilled')),
        offered_at    timestamptz,
        created_at    timestamptz NOT NULL DEFAULT now(),
        CHECK (ends_at > starts_at)
      )`);
    // Freed slots look up who waits for that instrument around that time.
    await q(`CREATE INDEX waitlist_entries_instrument_id_starts_at_idx ON waitlist_entries (instrument_id, starts_at)`);
    await q(`CREATE INDEX waitlist_entries_user_id_idx ON waitlist_entries (user_id)`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query(
    'DROP TABLE IF EXISTS waitlist_entries; DROP TABLE IF EXISTS booking_events; DROP TABLE IF EXISTS booking_instruments; DROP TABLE IF EXISTS bookings;',
  );
};
