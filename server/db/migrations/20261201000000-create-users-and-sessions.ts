import type { Migration } from '../migrator.js';

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    await q(`
      CREATE TABLE users (
        id              serial PRIMARY KEY,
        email           text NOT NULL CHECK (email = lower(email)),
        name            text NOT NULL,
        role            text NOT NULL CHECK (role IN ('visitor', 'researcher', 'manager')),
        password_hash   text NOT NULL,
        active          boolean NOT NULL DEFAULT true,
        last_sign_in_at timestamptz,
        created_at      timestamptz NOT NULL DEFAULT now(),
        updated_at      timestamptz NOT NULL DEFAULT now()
      )`);
    await q(`CREATE UNIQUE INDEX users_email_key ON users (email)`);
    // The session store of connect-pg-simple, in its documented shape.
    await q(`
      CREATE TABLE sessions (
        sid    varchar NOT NULL PRIMARY KEY,
        sess   json NOT NULL,
        expire timestamp(6) NOT NULL
      )`);
    await q(`CREATE INDEX sessions_expire_idx ON sessions (expire)`);
    // Deactivating a user ends that user's sessions at once: find them by user id.
    await q(`CREATE INDEX sessions_user_id_idx ON sessions (((sess ->> 'userId')))`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query('DROP TABLE IF EXISTS sessions; DROP TABLE IF EXISTS users;');
};
