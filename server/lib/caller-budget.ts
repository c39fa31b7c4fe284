import type { Request, RequestHandler } from 'express';
import { AppError } from './errors.js';

/**
 * One budget per caller across the whole API, in cost units: a cheap read costs 1, expensive work (pooling,
 * syntheses, exports, imports) costs more, growing with its size. Each caller (a signed-in user or token holder
 * by user id, anyone else by address) holds up to `perMinute` units, refilled evenly over a minute; a request
 * that costs more than the caller holds is refused with 429 and Retry-After, and no other caller pays for it.
 */
export class CallerBudget {
  private readonly buckets = new Map<string, { balance: number; at: number }>();
  private readonly perMs: number;

  constructor(
    readonly perMinute: number,
    private readonly now: () => number = Date.now,
  ) {
    this.perMs = perMinute / 60_000;
  }

  /** What the caller holds now (refilled since it last spent). */
  balance(key: string): number {
    const b = this.buckets.get(key);
    if (!b) return this.perMinute;
    return Math.min(this.perMinute, b.balance + (this.now() - b.at) * this.perMs);
  }

  /**
   * Spends `units` (capped at a full minute's budget, so every request can be paid for eventually) when the
   * caller holds them; otherwise spends nothing and says how long to wait.
   */
  spend(key: string, units: number): { ok: true; left: number } | { ok: false; cost: number; left: number; retryAfterS: number } {
    const cost = Math.min(this.perMinute, Math.max(0, units));
    const held = this.balance(key);
    if (held + 1e-9 < cost) return { ok: false, cost, left: Math.floor(held), retryAfterS: Math.max(1, Math.ceil((cost - held) / this.perMs / 1000)) };
    if (this.buckets.size >= 50_000 && !this.buckets.has(key)) this.prune();
    this.buckets.set(key, { balance: held - cost, at: this.now() });
    return { ok: true, left: Math.floor(held - cost) };
  }

  /** Forgets callers whose budget is full again (they hold what a newcomer holds). */
  private prune() {
    for (const key of [...this.buckets.keys()]) if (this.balance(key) >= this.perMinute) this.buckets.delete(key);
  }
}

export class RateLimitedError extends AppError {
  constructor(
    message: string,
    readonly retryAfterS: number,
    details: { cost: number; left: number; perMinute: number; retryAfterSeconds: number },
  ) {
    super(429, 'rate_limited', message, details);
  }
}

/** Cost units of the work of the expensive routes, beyond the 1 every request pays on entry (small work is free). */
export const costs = {
  /** a synthesis computed over k settled effects; an answer already kept for this registry version costs an eighth */
  synthesis: (k: number, kept = false) => Math.floor(k / (kept ? 2000 : 250)),
  /** POST /api/compute/pool over k effects */
  pool: (k: number) => Math.floor(k / 1000),
  /** a large body, paid before it is parsed (about what pooling the effects it can hold costs) */
  body: (bytes: number) => Math.floor(bytes / 50_000),
  /** an export of n rows (references, effects) */
  export: (n: number) => Math.floor(n / 1000),
  /** references formatted as BibTeX or CSL-JSON (citation-js is slow per entry) */
  references: (n: number) => Math.floor(n / 100),
  /** an import of this many characters of BibTeX, RIS or DOIs */
  import: (chars: number) => Math.floor(chars / 10_000),
};

/** per request: whose budget pays, what it paid in all (entry included) and for its work */
const callers = new WeakMap<Request, { budget: CallerBudget; key: string; paid: number; work: number }>();

/** Tells the caller what this request cost in all and what is left (headers, so a script can pace itself). */
function tell(req: Request, paid: number, left: number) {
  req.res?.set({ 'X-Request-Cost': String(paid), 'X-Budget-Remaining': String(left) });
}

/** The caller a budget belongs to: the user behind a session or token, otherwise the address. */
export function callerKey(req: Request): string {
  return req.user ? `user:${req.user.id}` : `ip:${req.ip ?? 'unknown'}`;
}

function refuse(budget: CallerBudget, what: string, r: { cost: number; left: number; retryAfterS: number }): RateLimitedError {
  const size = r.cost > 1 ? `${what} costs ${r.cost} units` : `${what} costs 1 unit`;
  return new RateLimitedError(
    `Too many requests from you: ${size} and you have ${r.left} of your ${budget.perMinute} a minute left. Try again in ${r.retryAfterS} second${r.retryAfterS === 1 ? '' : 's'}.`,
    r.retryAfterS,
    { cost: r.cost, left: r.left, perMinute: budget.perMinute, retryAfterSeconds: r.retryAfterS },
  );
}

/** Every request pays one unit on entry (health checks excepted); a caller without one is refused here. */
export function budgetGate(budget: CallerBudget, exempt: (req: Request) => boolean = () => false): RequestHandler {
  return (req, _res, next) => {
    if (exempt(req)) return next();
    const key = callerKey(req);
    const r = budget.spend(key, 1);
    if (!r.ok) return next(refuse(budget, 'A request', r));
    callers.set(req, { budget, key, paid: 1, work: 0 });
    req.res?.set('X-Budget-Per-Minute', String(budget.perMinute));
    tell(req, 1, r.left);
    next();
  };
}

/**
 * Charges the caller so that this request has paid `units` for its work in all (a body paid for before it was
 * read counts); throws 429, spending nothing, when the caller cannot pay.
 */
export function chargeCaller(req: Request, units: number, what: string): void {
  const caller = callers.get(req);
  const due = units - (caller?.work ?? 0);
  if (!caller || due <= 0) return;
  const r = caller.budget.spend(caller.key, due);
  if (!r.ok) throw refuse(caller.budget, what, r);
  caller.work = units;
  caller.paid += due;
  tell(req, caller.paid, r.left);
}

/** Middleware for routes with large bodies: pays by the declared length before the body is read. */
export function prepayBody(cost: (bytes: number) => number = costs.body): RequestHandler {
  return (req, _res, next) => {
    const bytes = Number(req.headers['content-length'] ?? 0);
    chargeCaller(req, Number.isFinite(bytes) ? cost(bytes) : 0, `A body of ${Math.ceil(bytes / 1024)} kB`);
    next();
  };
}
