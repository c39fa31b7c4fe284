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
  { files: ['src/**/*.{ts,tsx}'], rules: { 'no-restricted-imports': ['error', { patterns: clientPatterns }] } },
  ...featureZones,
  {
    // the statistics engine validates with plain code; zod schemas for its inputs live in shared/schemas
    files: ['shared/stats/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [{ name: 'zod', message: 'shared/stats validates with plain code (StatsInputError); put zod schemas in shared/schemas.' }],
          patterns: [{ group: ['zod/*'], message: 'shared/stats validates with plain code (StatsInputError); put zod schemas in shared/schemas.' }],
        },
      ],
    },
  },
);
