import { Link, useSearchParams } from 'react-router-dom';
import { SCREENING_STAGES, SCREENING_STAGE_LABELS } from '../../../shared/vocabulary/screening';
import { stageFromParam } from '../../features/screening/api/get-queue';
import { DisagreementList } from '../../features/screening/components/DisagreementList';
import { ScreenerAgreement } from '../../features/screening/components/ScreenerAgreement';
import { ScreeningRuleForm } from '../../features/screening/components/ScreeningRuleForm';
import { RequireRole } from './RequireRole';

/** Curators: the project's screening rule, the screeners' agreement, and the disagreements to settle. */
export function ScreeningDisagreementsPage() {
  const [params] = useSearchParams();
  const stage = stageFromParam(params.get('stage'));
  return (
    <RequireRole role="curator">
      <h1>Screening rule and disagreements</h1>
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
        <section aria-labelledby="rule-h">
          <h2 id="rule-h">Rule</h2>
          <ScreeningRuleForm />
        </section>
        <section aria-labelledby="agreement-h">
          <h2 id="agreement-h">Agreement between screeners</h2>
          <ScreenerAgreement />
        </section>
      </div>
      <section aria-labelledby="conflicts-h">
        <h2 id="conflicts-h">Disagreements</h2>
        <nav aria-label="Disagreement stage" className="mb-2 flex gap-4 text-sm">
          {SCREENING_STAGES.map((s) => (
            <Link key={s} to={`/screening/disagreements${s === 'full_text' ? '?stage=full_text' : ''}`} aria-current={s === stage ? 'page' : undefined} className={s === stage ? 'font-semibold text-ink no-underline' : ''}>
              {SCREENING_STAGE_LABELS[s]}
            </Link>
          ))}
        </nav>
        <DisagreementList key={stage} stage={stage} />
      </section>
    </RequireRole>
  );
}
