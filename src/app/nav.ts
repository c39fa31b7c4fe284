import type { Role } from '../../shared/roles';

/** Header links; each feature adds its screen here. `role` hides a link from people who hold none of its roles. */
export interface NavItem {
  to: string;
  label: string;
  role?: Role | Role[];
  signedIn?: boolean;
}

export const NAV_ITEMS: NavItem[] = [
  // feature screens go here
  { to: '/atlas', label: 'Atlas' },
  { to: '/synthesis', label: 'Synthesis' },
  { to: '/snapshots', label: 'Snapshots' },
  { to: '/references', label: 'References' },
  { to: '/search', label: 'Search' },
  { to: '/import', label: 'Import', role: 'contributor' },
  { to: '/screening', label: 'Screening', role: 'contributor' },
  { to: '/screening/disagreements', label: 'Screen rule', role: 'curator' },
  { to: '/duplicates', label: 'Duplicates', role: 'curator' },
  { to: '/extractions', label: 'My coding', role: 'contributor' },
  { to: '/assignments', label: 'Assign', role: 'curator' },
  { to: '/reconciliation', label: 'Reconcile', role: 'curator' },
  { to: '/agreement', label: 'Agreement', role: ['curator', 'reviewer'] },
  { to: '/audit', label: 'Audit log', role: 'curator' },
  { to: '/manipulations', label: 'Vocabulary' },
  { to: '/follows', label: 'My follows', signedIn: true },
  { to: '/settings/tokens', label: 'API tokens', signedIn: true },
  { to: '/admin/people', label: 'People', role: 'admin' },
  { to: '/admin/mail', label: 'Mail', role: 'admin' },
];
