import type { Agent, TestApp } from './test-app.js';
import { codingTeam } from './coding-team.js';
import { clearSearch } from './references.js';

export interface ScreeningTeam {
  t: TestApp;
  coder: Agent;
  coder2: Agent;
  curator: Agent;
}

/** A fresh app with an empty registry and index, two contributors and a curator signed in. */
export async function screeningTeam(): Promise<ScreeningTeam> {
  const { t, coder1, coder2, curator } = await codingTeam();
  await clearSearch(t);
  return { t, coder: coder1, coder2, curator };
}

/** Imports BibTeX as `agent` and answers the reference ids of its entries, in order. */
export async function importBibtex(agent: Agent, text: string): Promise<number[]> {
  const res = await agent.post('/api/imports').send({ format: 'bibtex', text });
  if (res.status !== 201 && res.status !== 200) throw new Error(`import failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.entries.map((e: { referenceId: number }) => e.referenceId);
}
