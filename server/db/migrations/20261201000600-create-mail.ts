import type { Migration } from '../migrator.js';

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    // Every notification is first a row here, written in the transaction of the change that causes it; the
    // outbox worker sends pending rows and marks them sent. Rendered when queued: the message says what was
    // true when it happened, even if it is delivered an hour later.
    await q(`
      CREATE TABLE outbox (
        id                bigserial PRIMARY KEY,
        kind              text NOT NULL,
        recipient_id      integer REFERENCES users (id) ON DELETE SET NULL,
        to_address        text NOT NULL,
        subject           text NOT NULL,
        text_body         text NOT NULL,
        html_body         text NOT NULL,
        attachments       jsonb NOT NULL DEFAULT '[]',
        status            text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending', 'sent', 'failed')),
        attempts          integer NOT NULL DEFAULT 0,
        next_attempt_at   timestamptz NOT NULL DEFAULT now(),
        last_error        text,
        message_id        text,
        created_at        timestamptz NOT NULL DEFAULT now(),
        sent_at           timestamptz
      )`);
    // The worker's read: pending rows that are due, oldest first.
    await q(`CREATE INDEX outbox_pending_idx ON outbox (next_attempt_at, id) WHERE status = 'pending'`);
    // The manager's view of the queue, newest first.
    await q(`CREATE INDEX outbox_created_at_idx ON outbox (created_at)`);

    // Messages accepted by the local SMTP capture server (used when SMTP_URL is not set), parsed by mailparser.
    await q(`
      CREATE TABLE captured_mail (
        id            bigserial PRIMARY KEY,
        received_at   timestamptz NOT NULL DEFAULT now(),
        envelope_from text NOT NULL DEFAULT '',
        envelope_to   text[] NOT NULL,
        from_header   text NOT NULL DEFAULT '',
        to_header     text NOT NULL DEFAULT '',
        subject       text NOT NULL DEFAULT '',
        message_id    text,
        text_body     text,
        html_body     text,
        attachments   jsonb NOT NULL DEFAULT '[]',
        size_bytes    integer NOT NULL DEFAULT 0
      )`);
    await q(`CREATE INDEX captured_mail_received_at_idx ON captured_mail (received_at, id)`);

    // One-time links: invitations (7 days) and password resets (1 hour). Only the SHA-256 of the token is kept.
    await q(`
      CREATE TABLE user_tokens (
        id          serial PRIMARY KEY,
        user_id     integer NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        purpose     text NOT NULL CHECK (purpose IN ('invitation', 'password-reset')),
        token_hash  text NOT NULL UNIQUE,
        expires_at  timestamptz NOT NULL,
        used_at     timestamptz,
        created_at  timestamptz NOT NULL DEFAULT now()
      )`);
    await q(`CREATE INDEX user_tokens_user_id_idx ON user_tokens (user_id)`);

    // An invited person has no password until they set one from the link.
    await q(`ALTER TABLE users ALTER COLUMN password_hash DROP NOT NULL`);
    // Which optional notifications a person has switched off: {"bookingUpdates": false, ...}; absent = on.
    await q(`ALTER TABLE users ADD COLUMN notification_settings jsonb NOT NULL DEFAULT '{}'`);

    // Daily jobs that must run once per lab day across all server instances: the INSERT claims the day.
    await q(`
      CREATE TABLE mail_digests (
        kind     text NOT NULL,
        lab_date date NOT NULL,
        sent_at  timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (kind, lab_date)
      )`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query(`
    DROP TABLE IF EXISTS mail_digests; DROP TABLE IF EXISTS user_tokens; DROP TABLE IF EXISTS captured_mail;
    DROP TABLE IF EXISTS outbox; ALTER TABLE users DROP COLUMN IF EXISTS notification_settings;`);
};
