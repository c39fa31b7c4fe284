import { useState } from 'react';
import { Button } from '../../../components/ui/Button';
import { ErrorNote, Loading } from '../../../components/ui/Notice';
import { useRule, useSetRule } from '../api/screening-rule';

const OPTIONS = [
  { n: 1 as const, label: 'One screener', help: 'each record is decided by one person; the decision counts at once' },
  { n: 2 as const, label: 'Two independent screeners', help: 'each record needs two people’s decisions, made blind; a curator settles disagreements' },
];

/** The project's screening rule, set by a curator (every change is audited). */
export function ScreeningRuleForm() {
  const rule = useRule();
  const save = useSetRule();
  const [picked, setPicked] = useState<1 | 2 | null>(null);
  if (rule.isLoading) return <Loading what="Loading the screening rule" />;
  if (rule.error) return <ErrorNote error={rule.error} />;
  if (!rule.data) return null;
  const current = rule.data.screeners;
  const value = picked ?? current;
  return (
    <form
      aria-label="Screening rule"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate({ screeners: value }, { onSuccess: () => setPicked(null) });
      }}
    >
      <fieldset className="rounded border border-paper-edge p-3">
        <legend className="px-1 font-semibold">Who screens each record</legend>
        {OPTIONS.map((o) => (
          <label key={o.n} className="block py-0.5">
            <input type="radio" name="screeners" value={o.n} checked={value === o.n} onChange={() => setPicked(o.n)} /> {o.label}
            <span className="block pl-5 text-xs text-ink-soft">{o.help}</span>
          </label>
        ))}
        <p className="mt-1 text-xs text-ink-faint">
          Now: {current === 1 ? 'one screener' : 'two screeners'}
          {rule.data.updatedBy ? `, set by ${rule.data.updatedBy.login} on ${rule.data.updatedAt?.slice(0, 16).replace('T', ' ')} UTC` : ' (never changed)'}.
        </p>
        <Button type="submit" variant="primary" disabled={save.isPending || value === current}>
          {save.isPending ? 'Saving…' : 'Save rule'}
        </Button>
        {save.isSuccess && picked === null && <span className="ml-2 text-sm">✓ Saved: {current === 1 ? 'one screener' : 'two screeners'}.</span>}
      </fieldset>
      <ErrorNote error={save.error} />
    </form>
  );
}
