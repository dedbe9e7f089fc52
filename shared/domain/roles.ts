/**
 * Roles of a Skewbench account, from least to most trusted.
 * - visitor: reads the calendar and setups;
 * - researcher: also books instruments and records own setups;
 * - manager: everything, including people and inventory.
 */
export const roles = ['visitor', 'researcher', 'manager'] as const;
export type Role = (typeof roles)[number];

export const roleLabels: Record<Role, string> = {
  visitor: 'Visitor',
  researcher: 'Researcher',
  manager: 'Lab manager',
};

/** True when `role` is at least as trusted as `minimum` (manager ⊇ researcher ⊇ visitor). */
export function hasRole(role: Role, minimum: Role): boolean {
  return roles.indexOf(role) >= roles.indexOf(minimum);
}
