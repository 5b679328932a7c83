// The README's "Roles and permissions" table is the permission table: kept equal here.
import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { actions } from '../../shared/permissions';
import { BEGIN, END, permissionsMarkdown, withTable } from './print-permissions';

const readme = fs.readFileSync(path.resolve(import.meta.dirname, '../../README.md'), 'utf8');

describe('the README table of roles and permissions', () => {
  it('is printed in the README as it is (regenerate: npx tsx server/auth/print-permissions.ts --write)', () => {
    expect(readme).toContain(BEGIN);
    expect(readme).toContain(END);
    expect(withTable(readme)).toBe(readme);
  });

  it('has one row per action', () => {
    expect(permissionsMarkdown().split('\n')).toHaveLength(actions.length + 2);
  });
});
