import { describe, expect, it } from 'vitest';
import { hasRole, roles } from '../../shared/domain/roles.js';

describe('hasRole', () => {
  it.each([
    ['visitor', 'visitor', true],
    ['visitor', 'researcher', false],
    ['visitor', 'manager', false],
    ['researcher', 'visitor', true],
    ['researcher', 'researcher', true],
    ['researcher', 'manager', false],
    ['manager', 'visitor', true],
    ['manager', 'researcher', true],
    ['manager', 'manager', true],
  ] as const)('a %s meets the minimum %s: %s', (role, minimum, expected) => {
    expect(hasRole(role, minimum)).toBe(expected);
  });

  it('knows exactly the three roles of the contract', () => {
    expect(roles).toEqual(['visitor', 'researcher', 'manager']);
  });
});
