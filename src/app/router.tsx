import type { QueryClient } from '@tanstack/react-query';
import type { ComponentType } from 'react';
import { createBrowserRouter, redirect, type RouteObject } from 'react-router-dom';
import { Loading } from '../components/ui/Notice';
import { AppShell } from './AppShell';
import { screenLoaders } from './loaders';
import { AtlasOutcomePage } from './routes/AtlasOutcomePage';
import { AtlasPage } from './routes/AtlasPage';
import { AgreementPage } from './routes/AgreementPage';
import { AssignmentsPage } from './routes/AssignmentsPage';
import { DuplicatesPage } from './routes/DuplicatesPage';
import { HomePage } from './routes/HomePage';
import { ImportBatchPage } from './routes/ImportBatchPage';
import { ImportPage } from './routes/ImportPage';
import { ManipulationsPage } from './routes/ManipulationsPage';
import { MyExtractionsPage } from './routes/MyExtractionsPage';
import { NotFoundPage } from './routes/NotFoundPage';
import { ReferencePage } from './routes/ReferencePage';
import { ReferencesPage } from './routes/ReferencesPage';
import { RouteErrorPage } from './routes/RouteErrorPage';
import { PrismaFlowPage } from './routes/PrismaFlowPage';
import { ScreeningDisagreementsPage } from './routes/ScreeningDisagreementsPage';
import { ScreeningPage } from './routes/ScreeningPage';
import { SearchPage } from './routes/SearchPage';
import { SnapshotsPage } from './routes/SnapshotsPage';
import { TokensPage } from './routes/TokensPage';
import { FollowsPage } from './routes/FollowsPage';
import { FollowChangesPage } from './routes/FollowChangesPage';

// Heavy screens load their code on first visit, each in its own chunk (plotly is fetched only when a plot draws).
const lazyScreen = <M,>(load: () => Promise<M>, pick: (m: M) => ComponentType) => async () => ({ Component: pick(await load()) });
const SynthesisPage = lazyScreen(() => import('./routes/SynthesisPage'), (m) => m.SynthesisPage);
const SnapshotPage = lazyScreen(() => import('./routes/SnapshotPage'), (m) => m.SnapshotPage);
const AtlasManipulationPage = lazyScreen(() => import('./routes/AtlasManipulationPage'), (m) => m.AtlasManipulationPage);
const ExtractionPage = lazyScreen(() => import('./routes/ExtractionPage'), (m) => m.ExtractionPage);
const ReconciliationPage = lazyScreen(() => import('./routes/ReconciliationPage'), (m) => m.ReconciliationPage);
const ReconcilePairPage = lazyScreen(() => import('./routes/ReconcilePairPage'), (m) => m.ReconcilePairPage);
const RecordPage = lazyScreen(() => import('./routes/RecordPage'), (m) => m.RecordPage);
const AdminPeoplePage = lazyScreen(() => import('./routes/AdminPeoplePage'), (m) => m.AdminPeoplePage);
const AuditPage = lazyScreen(() => import('./routes/AuditPage'), (m) => m.AuditPage);
const AdminMailPage = lazyScreen(() => import('./routes/AdminMailPage'), (m) => m.AdminMailPage);

/** Every screen; each feature adds its routes to this list. The main ones load their data before they render. */
export function screens(qc: QueryClient): RouteObject[] {
  const load = screenLoaders(qc);
  return [
    { index: true, element: <HomePage /> },
    { path: 'settings/tokens', element: <TokensPage /> },
    { path: 'follows', element: <FollowsPage /> },
    { path: 'follows/:id/changes', element: <FollowChangesPage /> },
    { path: 'synthesis', lazy: SynthesisPage, loader: load.synthesis },
    { path: 'snapshots', element: <SnapshotsPage /> },
    { path: 'snapshots/:id', lazy: SnapshotPage, loader: load.snapshot },
    { path: 'atlas', element: <AtlasPage />, loader: load.atlas },
    { path: 'atlas/manipulations/:term', lazy: AtlasManipulationPage, loader: load.atlasManipulation },
    { path: 'atlas/outcomes/:kind', element: <AtlasOutcomePage />, loader: load.atlasOutcome },
    { path: 'import', element: <ImportPage /> },
    { path: 'imports/:id', element: <ImportBatchPage /> },
    { path: 'references', element: <ReferencesPage />, loader: load.references },
    { path: 'references/:id', element: <ReferencePage />, loader: load.reference },
    { path: 'screening', element: <ScreeningPage />, loader: load.screening },
    { path: 'screening/counts', element: <PrismaFlowPage />, loader: load.prismaFlow },
    { path: 'screening/disagreements', element: <ScreeningDisagreementsPage /> },
    { path: 'duplicates', element: <DuplicatesPage /> },
    { path: 'search', element: <SearchPage /> },
    { path: 'extractions', element: <MyExtractionsPage /> },
    { path: 'extractions/:id', lazy: ExtractionPage, loader: load.extraction },
    { path: 'assignments', element: <AssignmentsPage /> },
    { path: 'reconciliation', lazy: ReconciliationPage },
    { path: 'reconciliation/:id', lazy: ReconcilePairPage, loader: load.reconcilePair },
    { path: 'records/:id', lazy: RecordPage },
    { path: 'agreement', element: <AgreementPage /> },
    { path: 'manipulations', element: <ManipulationsPage /> },
    { path: 'admin/mail', lazy: AdminMailPage },
    { path: 'admin/people', lazy: AdminPeoplePage },
    { path: 'audit', lazy: AuditPage },
    // the log's earlier address, when only admins could read it
    { path: 'admin/audit', loader: () => redirect('/audit') },
    { path: '*', element: <NotFoundPage /> },
  ];
}

export function createRouter(qc: QueryClient) {
  return createBrowserRouter([
    {
      path: '/',
      element: <AppShell />,
      children: [
        {
          // The header stays when a screen fails, and while the first screen's code and data arrive.
          errorElement: <RouteErrorPage />,
          hydrateFallbackElement: <Loading what="Opening the page" />,
          children: screens(qc),
        },
      ],
    },
  ]);
}
