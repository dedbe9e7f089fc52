// `node dist-server/server/db/cli.js migrate|seed` (or through tsx): the database steps of npm start.
import { loadConfig } from '../config.js';
import { setLogLevel } from '../lib/logger.js';
import { createImageStore } from '../lib/uploads.js';
import { connectDatabase } from './connect.js';
import { migrate } from './migrator.js';
import { seedDemoLab } from './seeders/demo-lab.js';
import { labToday } from '../features/instruments/instruments.service.js';

const command = process.argv[2];
const config = loadConfig();
setLogLevel(config.logLevel);
const db = connectDatabase(config);
try {
  if (command === 'migrate') {
    const applied = await migrate(db.sequelize);
    console.log(applied.length ? `applied migrations: ${applied.join(', ')}` : 'database schema is up to date');
  } else if (command === 'seed') {
    const seeded = await seedDemoLab({ password: config.demoPassword, today: labToday(config.lab.timeZone), timeZone: config.lab.timeZone, images: createImageStore(config.uploads) });
    console.log(seeded ? 'seeded the demo lab' : 'database already holds data: demo lab not re-seeded');
  } else {
    console.error('usage: cli.ts migrate|seed');
    process.exitCode = 2;
  }
} catch (err) {
  console.error(err);
  process.exitCode = 1;
} finally {
  await db.close();
}
