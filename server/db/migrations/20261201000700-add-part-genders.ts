import type { Migration } from '../migrator.js';

/**
 * Each end of a part gets a gender (male = plug, female = jack), so the cable solver can tell which parts mate.
 * Parts already stored get the usual genders of their kind: cables male/male, attenuators and DC blocks
 * male/female, adapters and splitters female/female, anything else male/female. A manager corrects the few
 * that differ (e.g. an N male to SMA female adapter). No new read path, so no new index.
 */
export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => queryInterface.sequelize.query(sql, { transaction });
    await q(`
      ALTER TABLE parts
        ADD COLUMN gender_a text CONSTRAINT parts_gender_a_check CHECK (gender_a IN ('male','female')),
        ADD COLUMN gender_b text CONSTRAINT parts_gender_b_check CHECK (gender_b IN ('male','female'))`);
    await q(`
      UPDATE parts SET
        gender_a = 'male',
        gender_b = CASE kind WHEN 'cable' THEN 'male' ELSE 'female' END
      WHERE kind IN ('cable', 'attenuator', 'dc-block', 'other')`);
    await q(`UPDATE parts SET gender_a = 'female', gender_b = 'female' WHERE kind IN ('adapter', 'splitter')`);
    await q(`ALTER TABLE parts ALTER COLUMN gender_a SET NOT NULL, ALTER COLUMN gender_b SET NOT NULL`);
  });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query('ALTER TABLE parts DROP COLUMN IF EXISTS gender_a, DROP COLUMN IF EXISTS gender_b');
};
