// The boundaries DEVELOPERS.md states, kept by the linter (run by `npm test` after tsc, and by
// `npm run lint`). Each rule's message says which rule of the guide it keeps and where the code
// should go instead. eslint.config.test.ts breaks each boundary on purpose and expects the error.
import fs from 'node:fs';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import { importX } from 'eslint-plugin-import-x';
import reactHooks from 'eslint-plugin-react-hooks';
import { createTypeScriptImportResolver } from 'eslint-import-resolver-typescript';

const features = fs
  .readdirSync(new URL('./src/features', import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name);

/** A feature imports no other feature: what two features share moves up to src/components, src/lib or shared/. */
const featureZones = features.map((name) => ({
  target: `./src/features/${name}`,
  from: './src/features',
  except: [`./${name}`],
  message: `a feature never imports another feature: move what ${name} shares to src/components, src/lib or shared/ (or compose the features in src/app).`,
}));

// esquery's regular expressions cannot hold a slash: 'api.sync' stands for /api/sync.
const SYNC_ROUTE = 'api.sync';
const syncRouteCalls = [
  { selector: `Literal[value=/${SYNC_ROUTE}/]`, message: 'only src/features/sync/api calls the sync routes (/api/sync…).' },
  { selector: `TemplateElement[value.raw=/${SYNC_ROUTE}/]`, message: 'only src/features/sync/api calls the sync routes (/api/sync…).' },
];

/** A link to a page is built with pathTo (src/paths.ts), so it names a page the router mounts. */
const PATHS = "build the link with pathTo('<page>', { …ids }) from src/paths.ts, so it names a page the router mounts.";
const handWrittenLinks = [
  { selector: "JSXAttribute[name.name='to'] > Literal", message: PATHS },
  { selector: "JSXAttribute[name.name='to'] > JSXExpressionContainer > :matches(Literal, TemplateLiteral)", message: PATHS },
  { selector: "CallExpression[callee.name='navigate'] > :matches(Literal, TemplateLiteral).arguments:first-child", message: PATHS },
];

export default tseslint.config(
  { ignores: ['node_modules/', 'dist/', '.data/', 'bench-results/', 'public/', 'fonts/', 'docs/'] },
  {
    files: ['**/*.{ts,tsx,js,mjs}'],
    extends: [js.configs.recommended, ...tseslint.configs.recommended],
    plugins: { 'import-x': importX, 'react-hooks': reactHooks },
    languageOptions: { ecmaVersion: 2022, sourceType: 'module' },
    settings: {
      // How import-x reads TypeScript files it follows (for no-cycle), and resolves `@/` and `@shared/`.
      'import-x/extensions': importX.flatConfigs.typescript.settings['import-x/extensions'],
      'import-x/parsers': importX.flatConfigs.typescript.settings['import-x/parsers'],
      'import-x/resolver-next': [createTypeScriptImportResolver({ project: './tsconfig.json' })],
    },
    rules: {
      // A leading underscore marks what is left out on purpose (`{ drop: _drop, ...rest }`).
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', ignoreRestSiblings: true }],
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
      // Cycles are looked for in our own modules only (packages are not walked: most of the lint time otherwise).
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            { target: './src', from: './server', message: 'the client never imports the server: what both sides need lives in shared/.' },
            { target: './shared', from: ['./src', './server'], message: 'shared/ is used by both sides and imports neither src/ nor server/.' },
            {
              target: ['./src/components', './src/lib'],
              from: ['./src/features', './src/app'],
              message: 'src/components and src/lib are shared by every feature and import no feature and no app wiring.',
            },
            ...featureZones,
          ],
        },
      ],
    },
  },
  {
    // Only src/lib/db touches IndexedDB (Dexie), and only the sync feature's api/ calls the sync routes.
    files: ['src/**/*.{ts,tsx}'],
    ignores: ['src/lib/db/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [
            { name: 'dexie', message: 'only src/lib/db touches IndexedDB: read and write through its functions.' },
            { name: 'dexie-react-hooks', message: 'only src/lib/db touches IndexedDB: use its live-query hooks (src/lib/db/live.ts).' },
          ],
        },
      ],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    ignores: ['src/features/sync/api/**'],
    rules: { 'no-restricted-syntax': ['error', ...syncRouteCalls, ...handWrittenLinks] },
  },
  {
    files: ['src/features/sync/api/**/*.{ts,tsx}'],
    rules: { 'no-restricted-syntax': ['error', ...handWrittenLinks] },
  },
);
