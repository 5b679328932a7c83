// The boundaries of DEVELOPERS.md are lint rules (eslint.config.js): each one is broken here on
// purpose and must be reported, and the allowed counterpart must not be, so a rule that silently
// stopped matching (a renamed folder, a resolver that no longer resolves `@/`) fails this test.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { ESLint } from 'eslint';

const repoRoot = path.resolve(import.meta.dirname, '../..');
let eslint: ESLint;
beforeAll(() => {
  // no-cycle walks every import graph it meets: slow, and tested on its own below.
  eslint = new ESLint({ cwd: repoRoot, overrideConfig: { rules: { 'import-x/no-cycle': 'off' } } });
});

/** The rules that fire on `code` as if it were the file at `file` (relative to the repository). */
async function rulesFiring(file: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: path.join(repoRoot, file) });
  return result.messages.map((m) => m.ruleId ?? `fatal: ${m.message}`);
}

describe('the import boundaries', { timeout: 60_000 }, () => {
  it('src never imports server', async () => {
    expect(await rulesFiring('src/features/vehicles/x.ts', "import { lucia } from '../../../server/auth/lucia';\nvoid lucia;\n")).toContain(
      'import-x/no-restricted-paths',
    );
    expect(await rulesFiring('src/features/vehicles/x.ts', "import { can } from '@shared/permissions';\nvoid can;\n")).toEqual([]);
  });

  it('shared imports neither src nor server', async () => {
    expect(await rulesFiring('shared/x.ts', "import { api } from '../src/lib/api-client';\nvoid api;\n")).toContain('import-x/no-restricted-paths');
    expect(await rulesFiring('shared/x.ts', "import { config } from '../server/config';\nvoid config;\n")).toContain('import-x/no-restricted-paths');
  });

  it('no feature imports another feature, through the alias or a relative path', async () => {
    const other = "import { SessionListPage } from '@/features/sessions/components/session-list-page';\nvoid SessionListPage;\n";
    expect(await rulesFiring('src/features/vehicles/components/x.tsx', other)).toContain('import-x/no-restricted-paths');
    const relative = "import { SessionListPage } from '../../sessions/components/session-list-page';\nvoid SessionListPage;\n";
    expect(await rulesFiring('src/features/vehicles/components/x.tsx', relative)).toContain('import-x/no-restricted-paths');
    expect(await rulesFiring('src/features/sessions/components/x.tsx', other)).toEqual([]);
    expect(await rulesFiring('src/app/x.tsx', other)).toEqual([]);
  });

  it('src/components and src/lib import no feature', async () => {
    const feature = "import { TeamPage } from '@/features/team/components/team-page';\nvoid TeamPage;\n";
    expect(await rulesFiring('src/components/x.tsx', feature)).toContain('import-x/no-restricted-paths');
    expect(await rulesFiring('src/lib/x.ts', feature)).toContain('import-x/no-restricted-paths');
  });

  it('only src/lib/db imports Dexie', async () => {
    const dexie = "import Dexie from 'dexie';\nvoid Dexie;\n";
    expect(await rulesFiring('src/features/sessions/x.ts', dexie)).toContain('no-restricted-imports');
    expect(await rulesFiring('src/features/sessions/x.ts', "import { useLiveQuery } from 'dexie-react-hooks';\nvoid useLiveQuery;\n")).toContain(
      'no-restricted-imports',
    );
    expect(await rulesFiring('src/lib/db/x.ts', dexie)).toEqual([]);
  });

  it('only the sync feature calls the sync routes', async () => {
    expect(await rulesFiring('src/features/sessions/x.ts', "export const u = '/api/sync/push';\n")).toContain('no-restricted-syntax');
    expect(await rulesFiring('src/features/sessions/x.ts', 'export const u = (id: string) => `/api/sync/conflicts/${id}/resolve`;\n')).toContain(
      'no-restricted-syntax',
    );
    expect(await rulesFiring('src/features/sync/components/x.ts', "export const u = '/api/sync/push';\n")).toContain('no-restricted-syntax');
    expect(await rulesFiring('src/features/sync/api/x.ts', "export const u = '/api/sync/push';\n")).toEqual([]);
    expect(await rulesFiring('src/features/sessions/x.ts', "export const u = '/api/sessions';\n")).toEqual([]);
  });
});

describe('import cycles', { timeout: 60_000 }, () => {
  // no-cycle follows imports on disk, so the two modules are real files for the length of the test.
  const dir = path.join(repoRoot, 'src', 'lib', `lint-cycle-${process.pid}`);
  beforeAll(() => {
    fs.mkdirSync(dir, { recursive: true });
    fs.writeFileSync(path.join(dir, 'a.ts'), "import { b } from './b';\nexport const a = () => b;\n");
    fs.writeFileSync(path.join(dir, 'b.ts'), "import { a } from './a';\nexport const b = () => a;\n");
  });
  afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

  it('are refused', async () => {
    const [result] = await new ESLint({ cwd: repoRoot }).lintFiles([path.join(dir, 'a.ts')]);
    expect(result.messages.map((m) => m.ruleId)).toContain('import-x/no-cycle');
  });
});

describe('links', { timeout: 60_000 }, () => {
  it('are built with pathTo, never written by hand', async () => {
    const fired = (code: string) => rulesFiring('src/features/vehicles/components/x.tsx', code);
    expect(await fired('import { Link } from \'react-router-dom\';\nexport const A = () => <Link to="/desk">Desk</Link>;\n')).toContain('no-restricted-syntax');
    expect(
      await fired("import { Link } from 'react-router-dom';\nexport const A = ({ id }: { id: string }) => <Link to={`/desk/vehicles/${id}`}>Truck</Link>;\n"),
    ).toContain('no-restricted-syntax');
    expect(await fired("export const go = (navigate: (to: string) => void) => navigate('/field');\n")).toContain('no-restricted-syntax');
    expect(
      await fired(
        "import { Link } from 'react-router-dom';\nimport { pathTo } from '@/paths';\nexport const A = () => <Link to={pathTo('desk')}>Desk</Link>;\n",
      ),
    ).toEqual([]);
  });
});
