import { useState } from 'react';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { Pager } from '../../components/ui/Pager';
import { SortHeader } from '../../components/ui/SortHeader';
import { useAgreement, useReferenceAgreement, type AgreementSummary, type ReferenceAgreementQuery } from '../../features/agreement/api/get-agreement';
import { kappaCells } from '../../features/agreement/format';
import { useHasRole } from '../../features/auth/api/get-me';
import { ICC_MIN_PAIRS } from '../../../shared/agreement/reporting';
import { fixed, percent as pct } from '../../lib/format';
import { RequireRole } from './RequireRole';

const f = (x: number | null | undefined) => fixed(x, 2);

function SummaryTables({ s }: { s: AgreementSummary }) {
  return (
    <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
      <table>
        <caption className="text-left text-sm font-semibold">Categorical fields (Cohen's kappa)</caption>
        <thead>
          <tr>
            <th>Field</th>
            <th className="num">Items</th>
            <th className="num">Agreement (%, 1 dp)</th>
            <th className="num">κ (2 dp)</th>
            <th className="num">SE (2 dp)</th>
          </tr>
        </thead>
        <tbody>
          {s.categorical.map((c) => (
            <tr key={c.field}>
              <td>{c.field}</td>
              <td className="num">{c.items}</td>
              <td className="num">{pct(c.percentAgreement)}</td>
              <td className="num">{kappaCells(c.kappa, c.kappaSe).kappa}</td>
              <td className="num">{kappaCells(c.kappa, c.kappaSe).se}</td>
            </tr>
          ))}
          <tr>
            <td>
              <strong>Summary over all fields</strong>
              <span className="block text-xs text-ink-soft">one kappa over field-and-value categories pooled together: a summary, not Cohen's κ of any one field</span>
            </td>
            <td className="num">{s.allCategorical.items}</td>
            <td className="num">{pct(s.allCategorical.percentAgreement)}</td>
            <td className="num">{kappaCells(s.allCategorical.kappa, null).kappa}</td>
            <td className="num">—</td>
          </tr>
        </tbody>
      </table>
      <table>
        <caption className="text-left text-sm font-semibold">Effect sizes (ICC(2,1), absolute agreement)</caption>
        <thead>
          <tr>
            <th>Metric</th>
            <th className="num">Paired effects</th>
            <th className="num">ICC (2 dp)</th>
          </tr>
        </thead>
        <tbody>
          {s.effectSizes.map((e) => (
            <tr key={e.metric}>
              <td>{e.metric}</td>
              <td className="num">{e.items}</td>
              <td className="num">{e.iccNote ? <span className="text-xs">{e.iccNote}</span> : f(e.icc)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function AgreementPage() {
  const curator = useHasRole('curator');
  const reviewer = useHasRole('reviewer');
  return <RequireRole>{curator || reviewer ? <AgreementBody /> : <ErrorNote error="This page needs the Curator or Reviewer role." />}</RequireRole>;
}

function AgreementBody() {
  const { data, error, isLoading } = useAgreement();
  const [q, setQ] = useState<ReferenceAgreementQuery>({ page: 1, pageSize: 25, sort: 'agreement', order: 'asc' });
  const refs = useReferenceAgreement(q);
  return (
    <>
      <h1>Inter-coder agreement</h1>
      <p className="mb-3 text-sm text-ink-soft">
        From every double-coded pair once both coders submitted, aligned by study and effect. Kappa: Cohen (1960) with the Fleiss, Cohen & Everitt (1969) standard error.
        ICC(2,1): Shrout & Fleiss (1979), two-way random effects, single rater, absolute agreement; not computed from fewer than {ICC_MIN_PAIRS} pairs of values.
      </p>
      <ErrorNote error={error} />
      {isLoading && <Loading what="Computing agreement" />}
      {data && data.overall.pairs === 0 && <EmptyState>No pair has been compared yet. Agreement appears once both coders of a reference have submitted.</EmptyState>}
      {data && data.overall.pairs > 0 && (
        <>
          <h2>Overall ({data.overall.pairs} pairs)</h2>
          <SummaryTables s={data.overall} />
          <h2>By coder pair</h2>
          {data.coderPairs.map((p) => (
            <section key={p.coders} className="mb-4">
              <h3 className="font-bold">
                {p.coders} ({p.pairs} pairs)
              </h3>
              <SummaryTables s={p} />
            </section>
          ))}
          <h2>By reference</h2>
          {refs.data && (
            <>
              <table>
                <thead>
                  <tr>
                    <SortHeader field="reference" label="Reference" sort={q.sort} order={q.order} onSort={(sort, order) => setQ({ ...q, sort, order })} />
                    <th>Coders</th>
                    <th className="num">Items</th>
                    <SortHeader field="agreement" label="Agreement (%, 1 dp)" sort={q.sort} order={q.order} onSort={(sort, order) => setQ({ ...q, sort, order })} numeric />
                    <th className="num">Summary κ (2 dp)</th>
                    <th>ICC by metric (2 dp)</th>
                  </tr>
                </thead>
                <tbody>
                  {refs.data.items.map((r) => (
                    <tr key={r.assignmentId}>
                      <td>{r.referenceLabel}</td>
                      <td>{r.coders}</td>
                      <td className="num">{r.items}</td>
                      <td className="num">{pct(r.percentAgreement)}</td>
                      <td className="num">{kappaCells(r.kappa, null).kappa}</td>
                      <td className="text-xs">{r.effectSizes.map((e) => `${e.metric} ${e.iccNote ? `not computed, fewer than ${ICC_MIN_PAIRS} pairs` : f(e.icc)} (${e.items})`).join('; ') || '—'}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              <Pager page={q.page} pageSize={q.pageSize} total={refs.data.total} onPage={(page) => setQ({ ...q, page })} />
            </>
          )}
        </>
      )}
    </>
  );
}
