import { describe, expect, it } from 'vitest';
import { lintProbe as restricted } from '../../support/lint';

describe('lint: a feature never imports another feature', () => {
  it.each([
    ['src/features/atlas/components/Probe.tsx', "import { filtersHref } from '../../synthesis/codec';"],
    ['src/features/atlas/api/probe.ts', "import type { Sheet } from '../../extraction/api/types';"],
    ['src/features/plots/probe.ts', "import { x } from '../synthesis/labels';"],
    ['src/features/references/forms/deep/probe.ts', "import { x } from '../../../screening/api/decide';"],
  ])('refuses %s importing another feature', async (file, source) => {
    const messages = await restricted(file, source);
    expect(messages).toHaveLength(1);
    expect(messages[0]).toMatch(/must not import another feature/);
  });

  it.each([
    ['src/features/atlas/components/Probe.tsx', "import { fixed } from '../../../lib/format';"],
    ['src/features/atlas/components/Probe.tsx', "import { Button } from '../../../components/ui/Button';"],
    ['src/features/atlas/components/Probe.tsx', "import { useAtlas } from '../api/get-atlas';"],
    ['src/features/atlas/components/Probe.tsx', "import { OUTCOMES } from '../../../../shared/vocabulary/outcomes';"],
    ['src/features/plots/probe.ts', "import { loadPlotly } from './load-plotly';"],
    ['src/app/routes/Probe.tsx', "import { filtersHref } from '../../features/synthesis/codec';"],
  ])('allows %s: %s', async (file, source) => {
    expect(await restricted(file, source)).toEqual([]);
  });
});

describe('lint: the client never imports server code', () => {
  it.each([
    ['src/lib/probe.ts', "import { db } from '../../server/db/knex';"],
    ['src/features/atlas/components/Probe.tsx', "import { x } from '../../../../server/services/atlas';"],
  ])('refuses %s', async (file, source) => {
    expect((await restricted(file, source)).join(' ')).toMatch(/never imports server code/);
  });
});
