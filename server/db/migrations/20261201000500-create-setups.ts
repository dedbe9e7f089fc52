import type { Migration } from '../migrator.js';

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    await q(`
      CREATE TABLE setups (
        id                        serial PRIMARY KEY,
        booking_id                integer NOT NULL REFERENCES bookings (id),
        owner_id                  integer NOT NULL REFERENCES users (id),
        title                     text NOT NULL,
        reloaded_from_revision_id integer,
        created_at                timestamptz NOT NULL DEFAULT now(),
        updated_at                timestamptz NOT NULL DEFAULT now()
      )`);
    await q(`CREATE INDEX setups_booking_id_idx ON setups (booking_id)`);
    await q(`CREATE INDEX setups_owner_id_idx ON setups (owner_id)`);
    await q(`
      CREATE TABLE setup_revisions (
        id        serial PRIMARY KEY,
        setup_id  integer NOT NULL REFERENCES setups (id),
        number    integer NOT NULL CHECK (number > 0),
        document  jsonb NOT NULL,
        analysis  jsonb NOT NULL,
        saved_by  integer NOT NULL REFERENCES users (id),
        saved_at  timestamptz NOT NULL DEFAULT now(),
        note      text NOT NULL DEFAULT '',
        UNIQUE (setup_id, number)
      )`);
    await q(`ALTER TABLE setups ADD CONSTRAINT setups_reloaded_from_fkey FOREIGN KEY (reloaded_from_revision_id) REFERENCES setup_revisions (id)`);
    // Every save is a new revision: the database itself refuses to change or delete one.
    await q(`
      CREATE FUNCTION setup_revisions_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'setup revisions are immutable: save a new revision instead' USING ERRCODE = 'restrict_violation';
      END $$`);
    await q(`CREATE TRIGGER setup_revisions_no_change BEFORE UPDATE OR DELETE ON setup_revisions FOR EACH ROW EXECUTE FUNCTION setup_revisions_immutable()`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query(
    'DROP TABLE IF EXISTS setup_revisions CASCADE; DROP TABLE IF EXISTS setups CASCADE; DROP FUNCTION IF EXISTS setup_revisions_immutable();',
  );
};
