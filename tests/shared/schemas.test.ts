import { describe, expect, it } from 'vitest';
import { toFieldIssues } from '../../shared/errors.js';
import { signInInputSchema } from '../../shared/schemas/auth.js';
import { createUserInputSchema, idParamsSchema, updateUserInputSchema } from '../../shared/schemas/people.js';

const valid = { email: ' New.Person@Lab.Test ', name: ' Ada Quill ', role: 'researcher', password: 'long-enough-1' };

describe('createUserInputSchema', () => {
  it('normalises e-mail to trimmed lower case and trims the name', () => {
    expect(createUserInputSchema.parse(valid)).toEqual({ ...valid, email: 'new.person@lab.test', name: 'Ada Quill' });
  });

  it.each([
    ['email', { ...valid, email: 'not-an-address' }],
    ['name', { ...valid, name: '   ' }],
    ['role', { ...valid, role: 'boss' }],
    ['password', { ...valid, password: 'short' }],
    ['password', { ...valid, password: 'é'.repeat(37) }], // 74 bytes: bcrypt would silently truncate
  ])('refuses a bad %s with a message on that field', (field, input) => {
    const result = createUserInputSchema.safeParse(input);
    expect(result.success).toBe(false);
    expect(toFieldIssues(result.error!.issues).map((i) => i.path)).toContain(field);
  });

  it('refuses unknown fields rather than ignoring them', () => {
    expect(createUserInputSchema.safeParse({ ...valid, admin: true }).success).toBe(false);
  });
});

describe('updateUserInputSchema', () => {
  it('accepts any one of name, role, active', () => {
    expect(updateUserInputSchema.parse({ active: false })).toEqual({ active: false });
    expect(updateUserInputSchema.parse({ role: 'manager' })).toEqual({ role: 'manager' });
  });

  it('refuses an empty change and a non-boolean active', () => {
    expect(updateUserInputSchema.safeParse({}).success).toBe(false);
    expect(updateUserInputSchema.safeParse({ active: 'no' }).success).toBe(false);
  });
});

describe('idParamsSchema', () => {
  it.each(['abc', '0', '-3', '1.5', '99999999999'])('refuses the id %s', (id) => {
    expect(idParamsSchema.safeParse({ id }).success).toBe(false);
  });
  it('coerces a numeric path segment', () => {
    expect(idParamsSchema.parse({ id: '42' })).toEqual({ id: 42 });
  });
});

describe('signInInputSchema', () => {
  it('needs both fields, with a message for each', () => {
    const result = signInInputSchema.safeParse({ email: '', password: '' });
    expect(toFieldIssues(result.error!.issues).map((i) => i.path).sort()).toEqual(['email', 'password']);
  });
});

describe('toFieldIssues', () => {
  it('joins nested paths with dots', () => {
    expect(toFieldIssues([{ path: ['sources', 0, 'powerDbm'], message: 'm' }])).toEqual([{ path: 'sources.0.powerDbm', message: 'm' }]);
  });
});
