import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

const here = path.dirname(fileURLToPath(import.meta.url));

/**
 * Runs one of the R scripts in this folder with `args` and returns its JSON output. Never skips: a missing
 * R or package is an error that says how to install it.
 */
export function runR<T>(script: string, args: string[]): T {
  const res = spawnSync('Rscript', ['--vanilla', path.join(here, script), ...args], {
    encoding: 'utf8',
    maxBuffer: 512 * 1024 * 1024,
  });
  if (res.error || res.status !== 0) {
    throw new Error(
      `reference script ${script} failed: ${res.error?.message ?? res.stderr}\n` +
        "These checks need R with metafor and clubSandwich: apt-get install -y --no-install-recommends r-cran-metafor r-cran-clubsandwich",
    );
  }
  return JSON.parse(res.stdout) as T;
}

// Inline scripts: the R source is built in the test (data sets exported from R inside it).

/** Debian's R front end, with r-cran-metafor (installed by .ci/run). */
export const RSCRIPT = 'Rscript';

/**
 * An R function that writes lists, data frames, vectors and factors as JSON with full double precision
 * (%.17g), NA and non-finite as null; a length-1 vector is a scalar unless wrapped in I(). metafor's
 * dependencies do not include a JSON package, so the reference scripts carry their own writer.
 */
const JSON_WRITER = String.raw`
to_json <- function(x) {
  if (is.null(x)) return("null")
  if (is.data.frame(x)) x <- lapply(as.list(x), I)
  if (is.factor(x)) x <- structure(as.character(x), class = class(x)[class(x) == "AsIs"])
  if (is.list(x)) {
    items <- vapply(seq_along(x), function(i) to_json(x[[i]]), "")
    nm <- names(x)
    if (is.null(nm)) return(paste0("[", paste(items, collapse = ","), "]"))
    return(paste0("{", paste(sprintf("\"%s\":%s", nm, items), collapse = ","), "}"))
  }
  asis <- inherits(x, "AsIs")
  x <- unclass(x)
  if (is.factor(x)) x <- as.character(x)
  if (is.character(x)) {
    v <- ifelse(is.na(x), "null", paste0("\"", gsub("\"", "\\\\\"", x), "\""))
  } else if (is.logical(x)) {
    v <- ifelse(is.na(x), "null", ifelse(x, "true", "false"))
  } else {
    x <- as.numeric(x)
    v <- ifelse(is.finite(x), sprintf("%.17g", x), "null")
  }
  if (length(v) == 1 && !asis) return(v)
  paste0("[", paste(v, collapse = ","), "]")
}
suppressPackageStartupMessages(library(metafor))
`;

/** A numeric vector as an R literal that parses back to the same doubles. */
export const rVector = (xs: ArrayLike<number>) => `c(${Array.from(xs, (x) => String(x)).join(', ')})`;
export const rStrings = (xs: ArrayLike<string>) => `c(${Array.from(xs, (x) => JSON.stringify(x)).join(', ')})`;

/**
 * Runs an R script (with metafor loaded and to_json defined) and parses what it prints with
 * cat(to_json(...)). Never skips: a missing R or metafor is an error that says how to install it.
 */
export function runRSource<T>(script: string): T {
  const res = spawnSync(RSCRIPT, ['--vanilla', '-'], { input: `${JSON_WRITER}\n${script}\n`, encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 });
  if (res.error || res.status !== 0) {
    throw new Error(
      `the R reference script failed: ${res.error?.message ?? res.stderr}\n` +
        "These checks need Debian's R with metafor: apt-get install -y --no-install-recommends r-cran-metafor",
    );
  }
  const start = res.stdout.indexOf('{');
  return JSON.parse(res.stdout.slice(start)) as T;
}

/** Collects disagreements beyond `tol` (relative to max(|expected|, scale)) so a failure lists them all. */
export class Agreement {
  readonly errors: string[] = [];
  worst = 0;
  compared = 0;
  /** the largest relative difference per tolerance (closed form, iterative) */
  readonly worstAt = new Map<number, number>();
  check(label: string, actual: number | null | undefined, expected: number | null | undefined, tol: number, scale = 1e-6) {
    this.compared++;
    if (expected === null || expected === undefined) {
      if (actual !== null && actual !== undefined && Number.isFinite(actual)) this.errors.push(`${label}: ${actual} where the reference has none`);
      return;
    }
    if (actual === null || actual === undefined || !Number.isFinite(actual)) {
      this.errors.push(`${label}: missing (reference ${expected})`);
      return;
    }
    const d = Math.abs(actual - expected);
    const rel = d === 0 ? 0 : d / Math.max(Math.abs(expected), scale);
    if (rel > this.worst) this.worst = rel;
    this.worstAt.set(tol, Math.max(rel, this.worstAt.get(tol) ?? 0));
    if (!(rel <= tol)) this.errors.push(`${label}: ${actual} vs ${expected} (relative ${rel.toExponential(2)} > ${tol})`);
  }
}

export const CLOSED = 1e-9;
export const ITERATIVE = 1e-6;

/** With REFERENCE_REPORT=1, prints the largest relative difference of a check (for the measured-agreement table). */
export function report(label: string, a: Agreement) {
  if (!process.env.REFERENCE_REPORT) return;
  const by = [...a.worstAt.entries()].sort((x, y) => x[0] - y[0]).map(([tol, w]) => `${w.toExponential(2)} (tolerance ${tol})`).join(', ');
  console.log(`[agreement] ${label}: ${a.compared} values, largest relative difference ${by}`);
}
