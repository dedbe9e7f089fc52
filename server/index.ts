// Boot: read the config, check the database, listen; stop cleanly on SIGINT/SIGTERM.
import { createApp } from './app.js';
import { loadConfig } from './config.js';
import { connectDatabase } from './db/connect.js';
import { activeDemoAccounts } from './db/seeders/demo-lab.js';
import { markNoShows } from './features/bookings/bookings.service.js';
import { runDailyDigests } from './features/mail/digests.service.js';
import { startMail } from './features/mail/mail.runtime.js';
import { logger, setLogLevel } from './lib/logger.js';

const config = loadConfig();
setLogLevel(config.logLevel);
const db = connectDatabase(config);
await db.sequelize.authenticate();

const mail = await startMail(db.sequelize, config.mail, config.publicUrl).catch((err: NodeJS.ErrnoException) => {
  const hint = err.code === 'EADDRINUSE' ? ` (port ${config.mail.capturePort} is taken: set SMTP_CAPTURE_PORT to a free port, or SMTP_URL to the lab's relay)` : '';
  console.error(`Skewbench could not start its mail: ${err.message}${hint}`);
  process.exit(1);
});

const app = createApp({ config, sequelize: db.sequelize, sessionPool: db.sessionPool });
const server = app.listen(config.port, config.host, async () => {
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.port;
  const lines = [`Skewbench is running at http://${config.host}:${port}  (${config.lab.name})`, `Mail: ${mail.describe}.`];
  if (process.env.SKEWBENCH_SHOW_DEMO === '1') {
    const accounts = await activeDemoAccounts();
    if (accounts.length) {
      lines.push(`Demo accounts (password "${config.demoPassword}" unless changed):`);
      for (const a of accounts) lines.push(`  ${a.role.padEnd(10)} ${a.email}`);
    }
  }
  lines.push('Press Ctrl-C to stop.');
  console.log(lines.join('\n'));
});

// Bookings not checked in 30 minutes after their start become no-shows and release their slot; once per lab day
// from 07:00 the managers get their calibration digest. Both queue their messages as they go.
const lab = { ...config.lab, publicUrl: config.publicUrl };
const noShowSweep = setInterval(() => {
  markNoShows(new Date(), lab)
    .then((n) => n && logger.info(`marked ${n} booking(s) as no-show`))
    .catch((err) => logger.warn(`no-show sweep failed: ${(err as Error).message}`));
  runDailyDigests(new Date(), lab).catch((err) => logger.warn(`daily digests failed: ${(err as Error).message}`));
}, 60_000);
noShowSweep.unref();

let stopping = false;
async function stop(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info(`${signal}: stopping the web server`);
  clearInterval(noShowSweep);
  server.close();
  server.closeAllConnections();
  await mail.stop();
  await db.close();
  process.exit(0);
}
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));
process.on('unhandledRejection', (reason) => {
  logger.error('unhandled rejection, exiting', reason);
  process.exit(1);
});
