import { useState, type ComponentType } from 'react';
import { METHOD_LABELS, MODERATOR_LABELS, SYNTHESIS_ROWS_PAGE, type SynthesisRowSort } from '../../../../shared/schemas/synthesis';
import { dependenceSentence } from '../../../../shared/synthesis/methods';
import type { CorrelationSensitivityRow, PlotFigure, PooledRow, SensitivityRow, SynthesisOutput } from '../../../../shared/synthesis/types';
import { Caution } from '../../../components/ui/Notice';
import { Button } from '../../../components/ui/Button';
import { digitsFor, fixed, interval as span, pEquals, pValue } from '../../../lib/format';
import { valueLabel } from '../labels';
import { ResultTable, type Column, type TableSort } from './ResultTable';
import { useSynthesisRows } from '../api/synthesis-rows';
import { AnalysesSection } from './AnalysesSection';
import { estimatorI2, i2Definition } from '../../../../shared/synthesis/analyses';

export type FigureComponent = ComponentType<{ figure: PlotFigure; name: string; label: string; show?: Record<string, boolean> }>;

function Stat({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <tr>
      <th scope="row" className="w-1/2 bg-transparent font-normal text-ink-soft">
        {label}
      </th>
      <td className="num">{children}</td>
    </tr>
  );
}

/**
 * The pooled rows: all in the answer (sorted and paged here), or, for a long synthesis whose answer holds only
 * the first page, paged and sorted by the server (POST /api/syntheses?rows=page).
 */
function PooledRowsTable({ data, caption, columns, rowKey }: { data: SynthesisOutput; caption: string; columns: Column<PooledRow>[]; rowKey: (row: PooledRow) => string | number }) {
  const [page, setPage] = useState(1);
  const [sort, setSort] = useState<TableSort>(null);
  const fromAnswer = page === 1 && sort === null;
  const paged = data.rowsTotal !== undefined;
  const rows = useSynthesisRows(
    data.request,
    { page, pageSize: SYNTHESIS_ROWS_PAGE, sort: (sort?.key ?? 'position') as SynthesisRowSort, order: sort?.dir === -1 ? 'desc' : 'asc' },
    paged && !fromAnswer,
  );
  if (!paged) return <ResultTable caption={caption} columns={columns} rows={data.rows} rowKey={rowKey} />;
  const shown = fromAnswer ? data.rows : (rows.data?.items ?? []);
  return (
    <>
      <ResultTable
        caption={caption}
        columns={columns}
        rows={shown}
        pageSize={SYNTHESIS_ROWS_PAGE}
        rowKey={rowKey}
        server={{
          total: data.rowsTotal!,
          page,
          sort,
          onPage: setPage,
          onSort: (s) => {
            setSort(s);
            setPage(1);
          },
        }}
      />
      {!fromAnswer && rows.isFetching && <p className="text-sm text-ink-soft" role="status">Loading rows…</p>}
      {rows.isError && <p className="text-sm text-refusal" role="alert">✕ These rows could not be loaded: {rows.error.message}</p>}
    </>
  );
}

/** Every number of a synthesis (live or frozen) with its cautions beside it, the figures and the tables. */
export function SynthesisResults({ data, Figure, fileStem, onUseMultilevel }: { data: SynthesisOutput; Figure: FigureComponent; fileStem: string; onUseMultilevel?: () => void }) {
  const [showFill, setShowFill] = useState(false);
  const r = data.result;
  const d = digitsFor(data.metric);
  const lvl = `${Math.round(r.level * 1000) / 10}%`;
  const metricName = valueLabel('metric', data.metric);
  const interval = (lo: number | null, hi: number | null) => span(lo, hi, d);
  const df = (x: number) => (Number.isInteger(x) ? String(x) : fixed(x, 1));
  const stat = r.statistic_df == null ? `z = ${fixed(r.statistic, 2)}` : `t(${df(r.statistic_df)}) = ${fixed(r.statistic, 2)}`;
  const ml = data.dependence.mode === 'multilevel' ? data.multilevel : null;
  const several = data.papersWithSeveralEffects ?? 0;
  const unit = ml ? 'Effect' : 'Study';
  // one I² definition per estimator on the whole screen (the three-level model's comes from its variance components)
  const rowI2 = (x: { I2: number | null; I2_tau?: number | null }) => (ml ? x.I2 : estimatorI2(r.method, x));
  const i2Label = ml ? 'I² %' : `I² % (${valueLabel('i2Definition', r.method === 'FE' ? 'q' : i2Definition(r.method))})`;
  const corrCols: Column<CorrelationSensitivityRow>[] = [
    { key: 'r', label: 'Assumed r', numeric: true, value: (x) => x.r, render: (x) => fixed(x.r, 1) },
    { key: 'k', label: 'k', numeric: true, value: (x) => x.k },
    { key: 'estimate', label: 'Estimate', numeric: true, value: (x) => x.estimate, render: (x) => fixed(x.estimate, d) },
    { key: 'ci', label: `${lvl} CI`, numeric: true, value: (x) => x.ci_lower, render: (x) => interval(x.ci_lower, x.ci_upper) },
    { key: 'p', label: 'p', numeric: true, value: (x) => x.p, render: (x) => pValue(x.p) },
    { key: 'tau2', label: 'τ²', numeric: true, value: (x) => x.tau2, render: (x) => fixed(x.tau2, 4) },
    { key: 'I2', label: i2Label, numeric: true, value: (x) => rowI2(x), render: (x) => fixed(rowI2(x), 1) },
  ];

  const studyCols: Column<PooledRow>[] = [
    { key: 'label', label: unit, value: (x) => x.label },
    { key: 'year', label: 'Year', numeric: true, value: (x) => x.year },
    { key: 'n', label: 'n', numeric: true, value: (x) => x.n },
    { key: 'effect', label: `${metricName} (${d} dp)`, numeric: true, value: (x) => x.effect, render: (x) => fixed(x.effect, d) },
    { key: 'se', label: 'SE', numeric: true, value: (x) => Math.sqrt(x.variance), render: (x) => fixed(Math.sqrt(x.variance), d) },
    { key: 'weight', label: 'Weight %', numeric: true, value: (x) => x.weight, render: (x) => fixed(x.weight, 1) },
    { key: 'effects', label: 'Effects', numeric: true, value: (x) => x.effectIds.length },
    ...(data.request.subgroup ? [{ key: 'subgroup', label: 'Subgroup', value: (x: PooledRow) => x.subgroup ?? '' }] : []),
    ...(data.request.moderator ? [{ key: 'moderator', label: MODERATOR_LABELS[data.request.moderator], numeric: true, value: (x: PooledRow) => x.moderator ?? null, render: (x: PooledRow) => fixed(x.moderator, 0) }] : []),
  ];
  const sensCols = (first: string): Column<SensitivityRow>[] => [
    { key: 'label', label: first, value: (x) => x.label },
    { key: 'year', label: 'Year', numeric: true, value: (x) => x.year },
    { key: 'k', label: 'k', numeric: true, value: (x) => x.k },
    { key: 'estimate', label: 'Estimate', numeric: true, value: (x) => x.estimate, render: (x) => fixed(x.estimate, d) },
    { key: 'ci', label: `${lvl} CI`, numeric: true, value: (x) => x.ci_lower, render: (x) => interval(x.ci_lower, x.ci_upper) },
    { key: 'p', label: 'p', numeric: true, value: (x) => x.p, render: (x) => pValue(x.p) },
    { key: 'tau2', label: 'τ²', numeric: true, value: (x) => x.tau2, render: (x) => fixed(x.tau2, 4) },
    { key: 'I2', label: i2Label, numeric: true, value: (x) => rowI2(x), render: (x) => fixed(rowI2(x), 1) },
  ];

  return (
    <section aria-label="Synthesis results" className="mt-4">
      <div className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="rounded border-l-4 border-caution bg-caution-light/60 p-3">
          <h2 className="mt-0">Pooled estimate</h2>
          <p className="mb-2 text-sm">
            <span className="font-semibold">◆ {metricName}</span> ·{' '}
            {ml ? `Three-level model (REML${ml.robust ? ', CR2 robust variance' : ''})` : `${METHOD_LABELS[r.method]}${r.hksj ? ' with HKSJ' : ''}`} · {data.counts.studies} studies ({data.counts.effects} effects,{' '}
            {data.counts.references} {ml ? 'papers' : 'references'})
          </p>
          <p className="mb-2 text-2xl tabular-nums" data-testid="pooled-estimate">
            <strong>{fixed(r.estimate, d)}</strong> <span className="text-base">{lvl} CI {interval(r.ci_lower, r.ci_upper)}</span>
          </p>
          <table className="text-sm">
            <caption className="sr-only">Pooled estimate and heterogeneity</caption>
            <tbody>
              <Stat label="Prediction interval">{interval(r.pi_lower, r.pi_upper)}</Stat>
              <Stat label="Test of the pooled effect">
                {stat}, {pEquals(r.p)}
              </Stat>
              {ml ? (
                <>
                  {ml.robust && (
                    <Stat label="Model-based (REML) CI, p">
                      {interval(ml.model.ci_lower, ml.model.ci_upper)}, {pEquals(ml.model.p)}
                    </Stat>
                  )}
                  <Stat label="σ² between papers">{fixed(ml.sigma2_between, 4)}</Stat>
                  <Stat label="σ² within papers">{fixed(ml.sigma2_within, 4)}</Stat>
                  <Stat label="I² between / within papers">
                    {fixed(ml.I2_between, 1)}% / {fixed(ml.I2_within, 1)}%
                  </Stat>
                </>
              ) : (
                <>
                  <Stat label="τ² (Q-profile CI)">
                    {fixed(r.tau2, 4)} {r.tau2_ci_lower != null ? `[${fixed(r.tau2_ci_lower, 4)}, ${fixed(r.tau2_ci_upper, 4)}]` : ''}
                  </Stat>
                  <Stat label="τ">{fixed(r.tau, 4)}</Stat>
                  <Stat label={`I² (${valueLabel('i2Definition', i2Definition(r.method))})`}>{rowI2(r) == null ? '—' : `${fixed(rowI2(r), 1)}%`}</Stat>
                  <Stat label="H²">{fixed(i2Definition(r.method) === 'tau' && r.I2_tau != null ? 100 / (100 - r.I2_tau) : r.H2, 2)}</Stat>
                </>
              )}
              <Stat label="Q (df), p">
                {r.Q == null ? '—' : `${fixed(r.Q, 2)} (${r.Q_df}), ${pEquals(r.Q_p)}`}
              </Stat>
            </tbody>
          </table>
          <p className="mt-2 text-xs text-ink-soft">{dependenceSentence(data.dependence, data.counts.references)}</p>
          {!ml && several > 0 && (
            <div role="note" aria-label="Recommended model" className="mt-2 flex flex-wrap items-center gap-2 rounded border border-action/40 p-2 text-sm">
              <span>
                ☆ {several} {several === 1 ? 'paper contributes' : 'papers contribute'} more than one effect: the three-level model (effects within papers, robust variance) is the
                recommended way to pool them.
              </span>
              {onUseMultilevel && <Button onClick={onUseMultilevel}>Use the three-level model</Button>}
            </div>
          )}
        </div>
        <aside aria-label="Cautions">
          {data.cautions.map((c) => (
            <Caution key={c.code} title={c.code === 'not_clinical' ? 'Not clinical guidance' : 'Caution'}>
              {c.text}
            </Caution>
          ))}
        </aside>
      </div>

      <h2>Forest plot</h2>
      <Figure figure={data.figures.forest} name={`${fileStem}-forest`} label="Forest plot" />

      {data.figures.funnel && (
        <>
          <h2>Funnel plot</h2>
          <label className="flex items-center gap-1.5 text-sm">
            <input type="checkbox" checked={showFill} onChange={(e) => setShowFill(e.target.checked)} disabled={!data.trimFill} />
            Show the studies trim-and-fill imputes {data.trimFill ? `(${data.trimFill.k0})` : '(not available)'}
          </label>
          <Figure figure={data.figures.funnel} name={`${fileStem}-funnel`} label="Funnel plot" show={{ trimfill: showFill }} />
        </>
      )}

      <AnalysesSection data={data} Figure={Figure} fileStem={fileStem} />

      {data.correlationSensitivity && (
        <>
          <h2>Sensitivity to the assumed correlation</h2>
          <ResultTable
            caption={`The analysis repeated with the effects of each study combined at each r (${data.dependence.mode === 'aggregate' && data.dependence.weighted ? 'inverse-variance composite' : 'mean of the effects'}); this synthesis uses r = ${data.dependence.mode === 'aggregate' ? fixed(data.dependence.r, 2) : '—'}`}
            columns={corrCols}
            rows={data.correlationSensitivity}
            rowKey={(x) => x.r}
          />
        </>
      )}

      <h2>{ml ? 'Effects pooled' : 'Studies pooled'}</h2>
      <PooledRowsTable
        data={data}
        caption={ml ? `One row per effect, weights from the three-level model; ${data.rowsTotal ?? data.rows.length} effects in ${data.counts.references} papers` : `One row per study after combining its effects; ${data.rowsTotal ?? data.rows.length} in all`}
        columns={studyCols}
        rowKey={(x) => (ml ? x.effectIds[0] : x.studyId)}
      />

      {data.leaveOneOut && (
        <>
          <h2>{ml ? 'Leave-one-paper-out' : 'Leave-one-out'}</h2>
          <ResultTable caption={ml ? 'The model refitted without each paper in turn' : 'The analysis refitted without each study in turn'} columns={sensCols(ml ? 'Paper left out' : 'Study left out')} rows={data.leaveOneOut} rowKey={(x) => `${x.studyId}-${x.label}`} />
        </>
      )}
      {data.cumulative && (
        <>
          <h2>{ml ? 'Cumulative by paper year' : 'Cumulative by year'}</h2>
          <ResultTable
            caption={ml ? 'Each row fits every paper up to and including this one, oldest first (from the second paper)' : 'Each row pools every study up to and including this one, oldest first'}
            columns={sensCols(ml ? 'Paper added' : 'Study added')}
            rows={data.cumulative}
            rowKey={(x) => `${x.studyId}-${x.label}`}
          />
        </>
      )}

      {data.unavailable.length > 0 && (
        <>
          <h2>Not run here</h2>
          <ul className="list-disc pl-5 text-sm">
            {data.unavailable.map((u) => (
              <li key={u.analysis}>
                <strong>{u.analysis}</strong>: {u.reason}
              </li>
            ))}
          </ul>
        </>
      )}
    </section>
  );
}
