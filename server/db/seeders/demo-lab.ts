import type { Role } from '../../../shared/domain/roles.js';
import { UserModel } from '../../features/people/user.model.js';
import { hashPassword } from '../../features/people/people.service.js';
import { seedDemoBookings } from './demo-bookings.js';
import { seedDemoInventory } from './demo-inventory.js';
import type { ImageStore } from '../../lib/uploads.js';

/**
 * The demo lab: an invented university's microwave circuits lab with invented people.
 * Accounts are a contract of the README and the tests: keep their e-mails and roles.
 */
export const demoAccounts: { email: string; name: string; role: Role }[] = [
  { email: 'manager@lab.test', name: 'Ilse Marwood', role: 'manager' },
  { email: 'researcher@lab.test', name: 'Tobiah Renwick', role: 'researcher' },
  { email: 'researcher2@lab.test', name: 'Sunniva Okoro-Vale', role: 'researcher' },
  { email: 'visitor@lab.test', name: 'Pell Hartigan', role: 'visitor' },
];

/**
 * Seed the demo lab when the database has no users yet; returns whether it seeded. Safe to run again:
 * a database that holds anything is left alone. `today` is the lab's date (calibration dates are relative to it).
 */
export async function seedDemoLab({ password, today, timeZone, images }: { password: string; today: string; timeZone: string; images: ImageStore }): Promise<boolean> {
  if ((await UserModel.count()) > 0) return false;
  const passwordHash = await hashPassword(password);
  const users = await UserModel.bulkCreate(demoAccounts.map((a) => ({ ...a, passwordHash })));
  const user = (email: string) => users.find((u) => u.email === email)!;
  const manager = user('manager@lab.test');
  const instruments = await seedDemoInventory(today, images, {
    manager: { id: manager.id, email: manager.email, name: manager.name, role: manager.role },
    researcherIds: [user('researcher@lab.test').id, user('researcher2@lab.test').id],
  });
  await seedDemoBookings(UserModel.sequelize!, {
    today,
    timeZone,
    now: new Date(),
    people: { ilse: manager.id, tobiah: user('researcher@lab.test').id, sunniva: user('researcher2@lab.test').id },
    instruments,
  });
  return true;
}

/** The demo accounts that exist and are active, for the start-up banner. */
export async function activeDemoAccounts(): Promise<{ email: string; role: Role }[]> {
  const rows = await UserModel.findAll({ where: { email: demoAccounts.map((a) => a.email), active: true } });
  const byEmail = new Map(rows.map((r) => [r.email, r]));
  return demoAccounts.filter((a) => byEmail.has(a.email)).map((a) => ({ email: a.email, role: byEmail.get(a.email)!.role }));
}
