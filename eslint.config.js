import { readdirSync } from 'node:fs';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import globals from 'globals';

// Client zones. ESLint replaces (does not merge) a rule's options when several config objects match one file,
// so every client import restriction is listed here and each src file gets exactly one `no-restricted-imports`.
const clientPatterns = [{ regex: '(^|/)server/', message: 'The client never imports server code; share it through shared/.' }];

// A feature under src/features/<a> never imports src/features/<b>: what both need goes to src/components or
// src/lib, and src/app composes features. From a file `depth` folders below its feature, a relative path reaches
// src/features after depth + 1 "../"; anything but its own folder named right after that is another feature.
const features = readdirSync(new URL('./src/features/', import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name);
const FEATURE_DEPTHS = [0, 1, 2, 3];
const featureZones = features.flatMap((name) =>
  FEATURE_DEPTHS.map((depth) => ({
    files: [`src/features/${name}/${'*/'.repeat(depth)}*.{ts,tsx}`],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            ...clientPatterns,
            {
              regex: `^(\\.\\./){${depth + 1}}(?!${name}/)[^./]`,
              message: `src/features/${name} must not import another feature: move what both need to src/components or src/lib, or compose them in src/app.`,
            },
          ],
        },
      ],
    },
  })),
);

// The house lines (DEVELOPERS.md): routes → services → repositories → tables; statistics and shared code pure;
// the local stand-ins reached only through configuration. Each line is an import pattern a zone may not use.
const LINES = {
  fakes: { regex: '(^|/)fakes/', message: 'App code reaches the local stand-ins only through configuration (their URL in the environment).' },
  repositories: { regex: '(^|/)(repositories|db)/', message: 'Routes call services; only services use repositories and the database.' },
  servicesFromBelow: { regex: '(^|/)(services|routes)/', message: 'Repositories and adapters sit below services: they import no service or route.' },
  composition: { regex: '^\\.\\./(context|app|workers)\\.js$', message: 'Services take their dependencies as arguments (services/deps.ts), never the app context.' },
  routes: { regex: '(^|/)routes/', message: 'Services never see HTTP: routes import services, not the other way round.' },
  outsideShared: { regex: '(^|/)(server|src)/', message: 'shared/ is code for both ends: it imports nothing from server/ or src/.' },
  zod: { regex: '^zod(/|$)', message: 'shared/stats validates with plain code (StatsInputError); put zod schemas in shared/schemas.' },
};

/** `no-restricted-imports` for one zone (a file gets one set of options, so a zone lists every line it keeps). */
const zone = (files, lines, ignores = []) => ({ files, ignores, rules: { 'no-restricted-imports': ['error', { patterns: lines.map((l) => ({ ...l })) }] } });

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      '@typescript-eslint/no-explicit-any': 'off',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  { files: ['server/**/*.ts'], rules: { '@typescript-eslint/no-explicit-any': 'error' } },
  zone(['server/**/*.ts'], [LINES.fakes], ['server/fakes/**']),
  zone(['server/routes/**/*.ts'], [LINES.fakes, LINES.repositories]),
  zone(['server/repositories/**/*.ts', 'server/adapters/**/*.ts', 'server/db/**/*.ts'], [LINES.fakes, LINES.servicesFromBelow]),
  zone(['server/services/**/*.ts'], [LINES.fakes, LINES.composition, LINES.routes]),
  zone(['shared/**/*.ts'], [LINES.fakes, LINES.outsideShared], ['shared/stats/**']),
  // the statistics engine validates with plain code; zod schemas for its inputs live in shared/schemas
  zone(['shared/stats/**/*.ts'], [LINES.fakes, LINES.outsideShared, LINES.zod]),
  // the client's zones: no server code at all (the stand-ins included), no feature importing another
  { files: ['src/**/*.{ts,tsx}'], rules: { 'no-restricted-imports': ['error', { patterns: clientPatterns }] } },
  ...featureZones,
);
