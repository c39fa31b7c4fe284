import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { hasRole } from '../../../shared/roles';
import { EXCLUSION_REASON_LABELS, SCREENING_STAGE_LABELS, stageOf, type ExclusionReason } from '../../../shared/vocabulary/screening';
import { Button } from '../../components/ui/Button';
import { Caution, EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { useMe } from '../../features/auth/api/get-me';
import { exportHref } from '../../features/references/api/export-references';
import { useReference } from '../../features/references/api/get-reference';
import { Attachments } from '../../features/references/components/Attachments';
import { EditReferenceForm } from '../../features/references/components/EditReferenceForm';
import { Citation, CslFields } from '../../features/references/components/ReferenceRecord';
import { ScreeningStatusWord } from '../../features/references/components/StatusWord';
import { DecisionForm } from '../../features/screening/components/DecisionForm';

export function ReferencePage() {
  const id = Number(useParams().id);
  const { data: me } = useMe();
  const { data, error, isLoading } = useReference(id);
  const [editing, setEditing] = useState(false);
  if (isLoading) return <Loading what="Loading the reference" />;
  if (error) return <ErrorNote error={error} />;
  if (!data) return null;
  const r = data.reference;
  const contributor = !!me && hasRole(me.roles, 'contributor');
  const curator = !!me && hasRole(me.roles, 'curator');
  return (
    <article>
      <p className="text-sm">
        <Link to="/references">← References</Link>
      </p>
      <h1>{r.title}</h1>
      {r.mergedInto && (
        <Caution title="Merged">
          This record was merged into <Link to={`/references/${r.mergedInto}`}>reference #{r.mergedInto}</Link>, which is the one to use.
        </Caution>
      )}
      <Citation r={r} />
      <p className="mt-1 text-sm text-ink-soft">
        Reference #{r.id} · version {r.version} · <ScreeningStatusWord status={r.screeningStatus} /> · from {r.source}
        {r.createdBy ? ` by @${r.createdBy.login}` : ''} on {r.createdAt.slice(0, 10)} · export{' '}
        <a href={exportHref([r.id], 'bibtex')} download>
          BibTeX
        </a>{' '}
        or{' '}
        <a href={exportHref([r.id], 'csl-json')} download>
          CSL-JSON
        </a>
      </p>
      {r.abstract && <p className="reading mt-3 max-w-3xl text-sm">{r.abstract}</p>}

      {data.duplicates.length > 0 && (
        <Caution title="Possible duplicate">
          Same title, year and first author as{' '}
          {data.duplicates.map((d, i) => (
            <span key={d.candidateId}>
              {i ? ', ' : ''}
              <Link to={`/references/${d.otherId}`}>#{d.otherId}</Link>
            </span>
          ))}
          . {curator ? <Link to="/duplicates">Decide on the duplicates page</Link> : 'A curator will decide whether to merge them.'}
        </Caution>
      )}

      <h2>Screening</h2>
      {contributor && !r.mergedInto && <DecisionForm key={r.id} refId={r.id} stage={stageOf(r.screeningStatus, data.screening[0]?.stage ?? null)} version={r.version} current={data.screening[0]} settledEffects={r.settledEffects} curator={curator} />}
      {data.screening.length === 0 ? (
        <EmptyState>No decision yet.{contributor ? ' Record one above, or work through the screening queue.' : ''}</EmptyState>
      ) : (
        <table className="mt-2 max-w-4xl">
          <thead>
            <tr>
              <th className="num">When (UTC)</th>
              <th>Stage</th>
              <th>Decision</th>
              <th>Reason</th>
              <th>Note</th>
              <th>By</th>
            </tr>
          </thead>
          <tbody>
            {data.screening.map((s) => (
              <tr key={s.id}>
                <td className="num">{s.decidedAt.slice(0, 16).replace('T', ' ')}</td>
                <td>{SCREENING_STAGE_LABELS[s.stage]}</td>
                <td>
                  <ScreeningStatusWord status={s.decision} />
                </td>
                <td>{s.reason ? EXCLUSION_REASON_LABELS[s.reason as ExclusionReason] ?? s.reason : '—'}</td>
                <td>{s.note ?? ''}</td>
                <td>{s.decidedBy ? `@${s.decidedBy.login}` : '—'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}

      <h2>Bibliographic record</h2>
      {editing ? (
        <EditReferenceForm detail={data} onDone={() => setEditing(false)} />
      ) : (
        <>
          {contributor && !r.mergedInto && (
            <Button className="mb-2" onClick={() => setEditing(true)}>
              Edit title, authors, year, journal, DOI or abstract
            </Button>
          )}
          <CslFields csl={r.csl} />
        </>
      )}

      <h2>Attachments</h2>
      <Attachments detail={data} canUpload={contributor && !r.mergedInto} signedIn={!!me} />

      {data.imports.length > 0 && (
        <>
          <h2>Import history</h2>
          <ul className="text-sm">
            {data.imports.map((i) => (
              <li key={`${i.batchId}-${i.index}`}>
                {i.at.slice(0, 10)}: entry {i.index} of {contributor ? <Link to={`/imports/${i.batchId}`}>batch {i.batchId}</Link> : `batch ${i.batchId}`} ({i.format}), {i.status}
              </li>
            ))}
          </ul>
        </>
      )}
    </article>
  );
}
