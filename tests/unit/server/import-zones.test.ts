import { describe, expect, it } from 'vitest';
import { lintProbe as restricted } from '../../support/lint.js';

describe('lint: the house lines (and shared/stats without zod)', () => {
  it.each([
    ['server/routes/probe.ts', "import { findRef } from '../repositories/refs.js';", /Routes call services/],
    ['server/routes/probe.ts', "import { createDb } from '../db/knex.js';", /Routes call services/],
    ['server/repositories/probe.ts', "import { resolveManipulations } from '../services/manipulations.js';", /sit below services/],
    ['server/adapters/probe.ts', "import { queueMails } from '../services/mail.js';", /sit below services/],
    ['server/services/probe.ts', "import type { AppContext } from '../context.js';", /never the app context/],
    ['server/services/probe.ts', "import { effectsRouter } from '../routes/effects.js';", /Services never see HTTP/],
    ['server/services/probe.ts', "import { startFakes } from '../fakes/run.js';", /only through configuration/],
    ['server/app.ts', "import { startFakes } from './fakes/run.js';", /only through configuration/],
    ['shared/schemas/probe.ts', "import type { Db } from '../../server/repositories/db.js';", /imports nothing from server/],
    ['shared/stats/probe.ts', "import { api } from '../../src/lib/api-client';", /imports nothing from server/],
    ['shared/stats/probe.ts', "import { z } from 'zod';", /validates with plain code/],
    ['shared/stats/probe.ts', "import { z } from 'zod/v4';", /validates with plain code/],
  ])('refuses %s: %s', async (file, source, message) => {
    const messages = await restricted(file, source);
    expect(messages.length).toBeGreaterThan(0);
    expect(messages.join('\n')).toMatch(message);
  });

  it.each([
    ['server/routes/probe.ts', "import { listSettledEffects } from '../services/effects.js';"],
    ['server/services/probe.ts', "import { findRef } from '../repositories/refs.js';"],
    ['server/services/probe.ts', "import type { Deps } from './deps.js';"],
    ['server/repositories/probe.ts', "import type { Csl } from '../adapters/citations.js';"],
    ['server/fakes/probe.ts', "import { startSearchIndex } from './search-index/http.js';"],
    ['tests/api/probe.test.ts', "import { startFakes } from '../../server/fakes/run.js';"],
    ['shared/schemas/probe.ts', "import { METRICS } from '../stats/metrics.js';"],
    ['shared/schemas/probe.ts', "import { z } from 'zod';"],
  ])('allows %s: %s', async (file, source) => {
    expect(await restricted(file, source)).toEqual([]);
  });
});

describe('lint: no explicit any on the server', () => {
  it.each([
    ['server/services/probe.ts', true],
    ['server/repositories/probe.ts', true],
    ['src/lib/probe.ts', false],
  ])('%s: refused = %s', async (filePath, refused) => {
    expect((await restricted(filePath, 'export const loose = (x: any) => x;', '@typescript-eslint/no-explicit-any')).length > 0).toBe(refused);
  });
});
