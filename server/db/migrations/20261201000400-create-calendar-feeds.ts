import type { Migration } from '../migrator.js';

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    // A secret-token iCalendar feed. Only the SHA-256 of the token is kept, so a copy of the database does not
    // hand out working feed URLs; the token itself is shown once, when it is made.
    await q(`
      CREATE TABLE calendar_feeds (
        id            serial PRIMARY KEY,
        user_id       integer NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        scope         text NOT NULL CHECK (scope IN ('person', 'instrument')),
        instrument_id integer REFERENCES instruments (id) ON DELETE CASCADE,
        token_hash    text NOT NULL UNIQUE,
        created_at    timestamptz NOT NULL DEFAULT now(),
        CHECK ((scope = 'instrument') = (instrument_id IS NOT NULL))
      )`);
    // One token per person and feed; coalesce because NULLs are never equal in a unique index. Regenerating
    // upserts on this index, and a person's list of feeds reads by its leading user_id.
    await q(`CREATE UNIQUE INDEX calendar_feeds_user_scope_instrument_key ON calendar_feeds (user_id, scope, (coalesce(instrument_id, 0)))`);
    // The feed URL is looked up by token_hash through the index of its UNIQUE constraint.
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query('DROP TABLE IF EXISTS calendar_feeds;');
};
