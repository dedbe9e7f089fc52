import type { Migration } from '../migrator.js';

/**
 * An offer is for the freed time, not for everything the person waits for: when a booking of 15–16 is cancelled,
 * someone waiting for 13–17 is offered 15–16, and the claim books exactly that. The offered range is kept with
 * the entry while it is offered (and after it was claimed, as what was booked); an entry put back to waiting
 * has none. Offers already open get the part of their range from when they were offered, the best that can be
 * said of them now. Read by the entry's id only, so no new index.
 */
export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    await q(`ALTER TABLE waitlist_entries ADD COLUMN offered_starts_at timestamptz, ADD COLUMN offered_ends_at timestamptz`);
    await q(`
      UPDATE waitlist_entries
         SET offered_starts_at = CASE WHEN offered_at > starts_at AND offered_at < ends_at THEN offered_at ELSE starts_at END,
             offered_ends_at = ends_at
       WHERE status = 'offered'`);
    await q(`
      ALTER TABLE waitlist_entries
        ADD CONSTRAINT waitlist_entries_offered_range_check
          CHECK ((offered_starts_at IS NULL) = (offered_ends_at IS NULL) AND (offered_starts_at IS NULL OR offered_ends_at > offered_starts_at)),
        ADD CONSTRAINT waitlist_entries_offer_has_range_check
          CHECK (status <> 'offered' OR offered_starts_at IS NOT NULL)`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query('ALTER TABLE waitlist_entries DROP COLUMN IF EXISTS offered_starts_at, DROP COLUMN IF EXISTS offered_ends_at');
};
