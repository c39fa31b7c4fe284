import { Link } from 'react-router-dom';
import { hasRole, type Role } from '../../../shared/roles';
import { useMe } from '../../features/auth/api/get-me';
import { signInHref } from '../../lib/sign-in';

interface NextStep {
  to: string;
  label: string;
  why: string;
  role?: Role;
}

const STEPS: NextStep[] = [
  { to: '/atlas', label: 'Atlas', why: 'what the registry knows, manipulation by manipulation, with the current pooled estimates' },
  { to: '/synthesis', label: 'Synthesis', why: 'pool settled effects with the estimator of your choice, with forest and funnel plots' },
  { to: '/search', label: 'Search', why: 'find references by title word, author or year' },
  { to: '/import', label: 'Import', why: 'bring in BibTeX, RIS or a list of DOIs', role: 'contributor' },
  { to: '/screening', label: 'Screening', why: 'read the waiting references as a list and include or exclude them, one or several at once, from the keyboard', role: 'contributor' },
  { to: '/screening/counts', label: 'PRISMA 2020 flow', why: 'records identified, screened and excluded with reasons, as the registry stands' },
  { to: '/extractions', label: 'My coding', why: 'the references assigned to you, with their extraction sheets', role: 'contributor' },
  { to: '/reconciliation', label: 'Reconciliation queue', why: 'settle disputed pairs field by field', role: 'curator' },
  { to: '/snapshots', label: 'Snapshots', why: 'frozen syntheses with stable addresses and exports', role: 'reviewer' },
  { to: '/admin/people', label: 'People', why: 'grant and remove roles', role: 'admin' },
];

export function HomePage() {
  const { data: me } = useMe();
  const steps = STEPS.filter((s) => !s.role || (me && hasRole(me.roles, s.role)));
  return (
    <div className="reading max-w-3xl">
      <h1>Chronometa</h1>
      <p className="mb-3">
        A shared registry of what time-perception experiments have found: every reported duration distortion, simultaneity window and
        temporal-order shift, coded twice, reconciled once, converted with a visible formula and pooled on demand.
      </p>
      <h2>{me ? `Where to go next, ${me.name ?? me.login}` : 'Where to start'}</h2>
      <ul className="list-none space-y-1 pl-0">
        {steps.map((s) => (
          <li key={s.to}>
            <Link to={s.to} className="font-semibold">
              {s.label}
            </Link>{' '}
            — {s.why}
          </li>
        ))}
      </ul>
      {!me && (
        <p className="mt-4">
          <a href={signInHref('/')}>Sign in</a> to import references, code papers, reconcile extractions or save syntheses.
        </p>
      )}
    </div>
  );
}
