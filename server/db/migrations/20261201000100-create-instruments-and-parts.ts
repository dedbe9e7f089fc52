import type { Migration } from '../migrator.js';

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    await q(`
      CREATE TABLE instruments (
        id                     serial PRIMARY KEY,
        tag                    text NOT NULL,
        name                   text NOT NULL,
        kind                   text NOT NULL CHECK (kind IN ('probe-station','signal-generator','spectrum-analyzer','oscilloscope','vna','power-supply','other')),
        location               text NOT NULL DEFAULT '',
        status                 text NOT NULL DEFAULT 'in-service' CHECK (status IN ('in-service','maintenance','retired')),
        calibration_due_on     date,
        min_frequency_hz       double precision,
        max_frequency_hz       double precision,
        max_safe_input_dbm     double precision,
        qualification_required boolean NOT NULL DEFAULT false,
        max_booking_hours      double precision,
        min_gap_minutes        integer NOT NULL DEFAULT 0,
        advance_days           integer NOT NULL DEFAULT 60,
        notes                  text NOT NULL DEFAULT '',
        created_at             timestamptz NOT NULL DEFAULT now(),
        updated_at             timestamptz NOT NULL DEFAULT now()
      )`);
    await q(`CREATE UNIQUE INDEX instruments_tag_key ON instruments (tag)`);
    // The calibration badges and the "due soon" reads scan a date range.
    await q(`CREATE INDEX instruments_calibration_due_on_idx ON instruments (calibration_due_on)`);

    await q(`
      CREATE TABLE instrument_qualifications (
        instrument_id integer NOT NULL REFERENCES instruments (id) ON DELETE CASCADE,
        user_id       integer NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        granted_by    integer REFERENCES users (id) ON DELETE SET NULL,
        granted_at    timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (instrument_id, user_id)
      )`);
    await q(`CREATE INDEX instrument_qualifications_user_id_idx ON instrument_qualifications (user_id)`);

    await q(`
      CREATE TABLE parts (
        id                serial PRIMARY KEY,
        tag               text NOT NULL,
        kind              text NOT NULL CHECK (kind IN ('cable','attenuator','adapter','splitter','dc-block','other')),
        description       text NOT NULL DEFAULT '',
        connector_a       text NOT NULL,
        connector_b       text NOT NULL,
        status            text NOT NULL DEFAULT 'ok' CHECK (status IN ('ok','damaged','lost')),
        notes             text NOT NULL DEFAULT '',
        length_mm         double precision CHECK (length_mm > 0),
        dielectric        text CHECK (dielectric IN ('ptfe','solid-pe','foam-pe','air','other')),
        velocity_factor   double precision CHECK (velocity_factor > 0 AND velocity_factor <= 1),
        loss_db_per_m     double precision,
        loss_ref_hz       double precision,
        measured_delay_ps double precision,
        measured_on       date,
        measured_how      text,
        loss_db           double precision,
        delay_ps          double precision,
        max_input_dbm     double precision,
        min_frequency_hz  double precision,
        max_frequency_hz  double precision,
        created_at        timestamptz NOT NULL DEFAULT now(),
        updated_at        timestamptz NOT NULL DEFAULT now()
      )`);
    await q(`CREATE UNIQUE INDEX parts_tag_key ON parts (tag)`);
    await q(`CREATE INDEX parts_kind_idx ON parts (kind)`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query('DROP TABLE IF EXISTS parts; DROP TABLE IF EXISTS instrument_qualifications; DROP TABLE IF EXISTS instruments;');
};
