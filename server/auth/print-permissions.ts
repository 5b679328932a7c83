// Prints the README's "Roles and permissions" table from shared/permissions.ts, or with --write
// puts it into README.md between its markers. `npx tsx server/auth/print-permissions.ts --write`
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { actions, can, permissionTable, roles } from '../../shared/permissions';

export const BEGIN = '<!-- permissions-table:begin (generated from shared/permissions.ts) -->';
export const END = '<!-- permissions-table:end -->';

/** The README's table: one row per action, one column per role. */
export function permissionsMarkdown(): string {
  const head = `| action | lets a person | ${roles.join(' | ')} |`;
  const rule = `| --- | --- | ${roles.map(() => ':---:').join(' | ')} |`;
  const rows = actions.map((a) => `| \`${a}\` | ${permissionTable[a].lets} | ${roles.map((r) => (can(r, a) ? '✓' : '—')).join(' | ')} |`);
  return [head, rule, ...rows].join('\n');
}

export function withTable(readme: string): string {
  const a = readme.indexOf(BEGIN);
  const b = readme.indexOf(END);
  if (a < 0 || b < a) throw new Error(`README.md lacks the markers ${BEGIN} … ${END}`);
  return `${readme.slice(0, a + BEGIN.length)}\n${permissionsMarkdown()}\n${readme.slice(b)}`;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  if (process.argv.includes('--write')) {
    const file = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../README.md');
    fs.writeFileSync(file, withTable(fs.readFileSync(file, 'utf8')));
    process.stdout.write(`updated ${file}\n`);
  } else {
    process.stdout.write(`${permissionsMarkdown()}\n`);
  }
}
