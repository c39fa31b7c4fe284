import { ESLint } from 'eslint';

// The lint zones of eslint.config.js, run on probe files at the paths they would have.
let eslint: ESLint | undefined;
const linter = () => (eslint ??= new ESLint());

/** The messages a probe file at `filePath` gets from `rule` (by default the import zones). */
export async function lintProbe(filePath: string, source: string, rule = 'no-restricted-imports'): Promise<string[]> {
  const [result] = await linter().lintText(`${source}\nexport const probe = 1;\n`, { filePath });
  return result.messages.filter((m) => m.ruleId === rule).map((m) => m.message);
}
