/**
 * Whether the OAuth provider answers, asked with a short timeout before a browser is sent to it. Any answer
 * below 500 counts as up; an answer is kept for a few seconds so a burst of sign-ins asks once.
 */
export function providerProbe(url: string, timeoutMs = 1500, keepMs = 5000) {
  let kept: { up: boolean; at: number } | undefined;
  let inflight: Promise<boolean> | undefined;
  return async function providerUp(): Promise<boolean> {
    if (kept && Date.now() - kept.at < keepMs) return kept.up;
    inflight ??= fetch(url, { method: 'HEAD', redirect: 'manual', signal: AbortSignal.timeout(timeoutMs) })
      .then((res) => res.status < 500)
      .catch(() => false)
      .then((up) => {
        kept = { up, at: Date.now() };
        return up;
      })
      .finally(() => {
        inflight = undefined;
      });
    return inflight;
  };
}

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** The page a browser gets instead of a redirect to a provider that does not answer. */
export function providerDownPage(back: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Sign-in unavailable · Chronometa</title></head>
<body style="font-family: system-ui, sans-serif; max-width: 36rem; margin: 3rem auto; padding: 0 1rem; color: #1f2937">
<h1>⚠ Sign-in is unavailable just now</h1>
<p>The GitHub sign-in service cannot be reached, so you cannot sign in at the moment. Try again in a minute.</p>
<p>Everything open to readers (settled effects, the atlas, snapshots, search) still works without signing in.</p>
<p><a href="${escape(back)}">Back to Chronometa</a> · <a href="/auth/github${back === '/' ? '' : `?returnTo=${encodeURIComponent(back)}`}">Try signing in again</a></p>
</body></html>`;
}
