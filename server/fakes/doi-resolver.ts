import express from 'express';
import type { Server } from 'node:http';
import { DEMO_DOI_RECORDS, FAILING_DOI_PREFIX, GENERATED_DOI_PREFIX, SLOW_DOI_PREFIX, generatedRecord } from './doi-records.js';

const CSL_TYPE = 'application/vnd.citationstyles.csl+json';

/**
 * A loopback stand-in for DOI content negotiation (GET /<doi> with Accept: CSL-JSON). Serves the invented
 * demo records under 10.5555 and 404 for anything else. `10.5555/slow.*` answers only after `slowMs`
 * (default 30 s, far beyond the app's time-out) and `10.5555/fail.*` answers 500. `POST /__control`
 * with `{ "delayMs": n }` delays every answer, for tests of progress and time-outs.
 */
export function createDoiResolver(opts: { slowMs?: number } = {}) {
  const app = express();
  let delayMs = 0;
  let served = 0;
  app.use(express.json());

  app.get('/health', (_req, res) => {
    res.json({ status: 'ok', served });
  });
  app.post('/__control', (req, res) => {
    if (typeof req.body?.delayMs === 'number' && req.body.delayMs >= 0) delayMs = req.body.delayMs;
    res.json({ delayMs });
  });

  app.get('/{*doi}', async (req, res) => {
    const doi = decodeURIComponent(req.path.slice(1)).toLowerCase();
    served++;
    // A wait ends early when the caller hangs up, so no timer outlives the request.
    const wait = (ms: number) =>
      new Promise<void>((r) => {
        const timer = setTimeout(r, ms);
        res.on('close', () => (clearTimeout(timer), r()));
      });
    if (delayMs) await wait(delayMs);
    if (doi.startsWith(SLOW_DOI_PREFIX)) {
      await wait(opts.slowMs ?? 30_000);
    }
    if (res.writableEnded || res.destroyed) return;
    if (doi.startsWith(FAILING_DOI_PREFIX)) {
      res.status(500).type('text').send('resolver failure (simulated)');
      return;
    }
    const record = DEMO_DOI_RECORDS[doi] ?? (doi.startsWith(GENERATED_DOI_PREFIX) || doi.startsWith(SLOW_DOI_PREFIX) ? generatedRecord(doi) : undefined);
    if (!record) {
      res.status(404).type('text').send(`DOI not found: ${doi}`);
      return;
    }
    const accept = String(req.headers.accept ?? '');
    if (!accept.includes(CSL_TYPE) && !accept.includes('application/json')) {
      res.status(406).type('text').send(`Ask for ${CSL_TYPE}.`);
      return;
    }
    res.type(CSL_TYPE).send(JSON.stringify({ ...record, DOI: doi.toUpperCase(), URL: `https://doi.org/${doi}` }));
  });
  return app;
}

export async function startDoiResolver(port: number, host = '127.0.0.1'): Promise<Server> {
  const app = createDoiResolver();
  return new Promise((resolve) => {
    const server = app.listen(port, host, () => resolve(server));
  });
}
