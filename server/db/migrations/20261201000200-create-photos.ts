import type { Migration } from '../migrator.js';

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    // One table for photos of every kind of subject, so the subject is (type, id) and has no foreign key:
    // the service checks that the subject exists before it stores anything.
    await q(`
      CREATE TABLE photos (
        id           serial PRIMARY KEY,
        subject_type text NOT NULL CHECK (subject_type IN ('instrument','part','setup')),
        subject_id   integer NOT NULL,
        owner_id     integer NOT NULL REFERENCES users (id),
        caption      text NOT NULL DEFAULT '',
        width        integer NOT NULL CHECK (width > 0),
        height       integer NOT NULL CHECK (height > 0),
        bytes        integer NOT NULL CHECK (bytes > 0),
        thumb_width  integer NOT NULL CHECK (thumb_width > 0),
        thumb_height integer NOT NULL CHECK (thumb_height > 0),
        file_key     text NOT NULL,
        created_at   timestamptz NOT NULL DEFAULT now()
      )`);
    // The gallery of one subject reads by (subject_type, subject_id).
    await q(`CREATE INDEX photos_subject_idx ON photos (subject_type, subject_id)`);
    await q(`CREATE UNIQUE INDEX photos_file_key_key ON photos (file_key)`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query('DROP TABLE IF EXISTS photos;');
};
