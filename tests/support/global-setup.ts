// Once per `npm test`: a template database with every migration applied and the demo lab seeded.
// Each test file clones it (CREATE DATABASE ... TEMPLATE), so files run in parallel without sharing rows.
import pg from 'pg';
import { connectDatabase } from '../../server/db/connect.js';
import { migrate } from '../../server/db/migrator.js';
import { seedDemoLab } from '../../server/db/seeders/demo-lab.js';
import { labToday } from '../../server/features/instruments/instruments.service.js';
import { setLogLevel } from '../../server/lib/logger.js';
import { createImageStore } from '../../server/lib/uploads.js';
import { TEMPLATE_DB, testCluster, testConfig } from './test-env.js';

export default async function setup() {
  setLogLevel('warn');
  const admin = new pg.Client({ ...testCluster(), database: 'postgres' });
  await admin.connect();
  await admin.query(`DROP DATABASE IF EXISTS ${TEMPLATE_DB}`);
  await admin.query(`CREATE DATABASE ${TEMPLATE_DB}`);
  await admin.end();

  const config = testConfig(TEMPLATE_DB);
  const db = connectDatabase(config);
  await migrate(db.sequelize);
  await seedDemoLab({ password: config.demoPassword, today: labToday(config.lab.timeZone), timeZone: config.lab.timeZone, images: createImageStore(config.uploads) });
  await db.close();
}
