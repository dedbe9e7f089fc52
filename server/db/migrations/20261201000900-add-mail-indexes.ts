import type { Migration } from '../migrator.js';

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    // The outbox page counts and lists failed rows, and counts what went out in the last days, without reading
    // the whole (ever-growing) table.
    await q(`CREATE INDEX outbox_failed_idx ON outbox (created_at, id) WHERE status = 'failed'`);
    await q(`CREATE INDEX outbox_sent_at_idx ON outbox (sent_at) WHERE status = 'sent'`);
    // GET /api/mailbox?to=: the recipient filter (envelope_to @> ARRAY[…]).
    await q(`CREATE INDEX captured_mail_envelope_to_idx ON captured_mail USING gin (envelope_to)`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query('DROP INDEX IF EXISTS outbox_failed_idx; DROP INDEX IF EXISTS outbox_sent_at_idx; DROP INDEX IF EXISTS captured_mail_envelope_to_idx;');
};
