import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppShell } from './AppShell';
import { AdminAuditPage } from './routes/AdminAuditPage';
import { AdminPeoplePage } from './routes/AdminPeoplePage';
import { HomePage } from './routes/HomePage';
import { NotFoundPage } from './routes/NotFoundPage';
import { TokensPage } from './routes/TokensPage';
import { SynthesisPage } from './routes/SynthesisPage';
import { SnapshotPage } from './routes/SnapshotPage';
import { SnapshotsPage } from './routes/SnapshotsPage';
import { AtlasPage } from './routes/AtlasPage';
import { AtlasManipulationPage } from './routes/AtlasManipulationPage';
import { AtlasOutcomePage } from './routes/AtlasOutcomePage';
import { DuplicatesPage } from './routes/DuplicatesPage';
import { ImportBatchPage } from './routes/ImportBatchPage';
import { ImportPage } from './routes/ImportPage';
import { ReferencePage } from './routes/ReferencePage';
import { ReferencesPage } from './routes/ReferencesPage';
import { ScreeningPage } from './routes/ScreeningPage';
import { SearchPage } from './routes/SearchPage';
import { MyExtractionsPage } from './routes/MyExtractionsPage';
import { ExtractionPage } from './routes/ExtractionPage';
import { AssignmentsPage } from './routes/AssignmentsPage';
import { ReconciliationPage } from './routes/ReconciliationPage';
import { ReconcilePairPage } from './routes/ReconcilePairPage';
import { RecordPage } from './routes/RecordPage';
import { AgreementPage } from './routes/AgreementPage';
import { ManipulationsPage } from './routes/ManipulationsPage';
import { AdminMailPage } from './routes/AdminMailPage';

/** Every screen; each feature adds its routes to this list. */
const screens: RouteObject[] = [
  { index: true, element: <HomePage /> },
  { path: 'settings/tokens', element: <TokensPage /> },
  { path: 'synthesis', element: <SynthesisPage /> },
  { path: 'snapshots', element: <SnapshotsPage /> },
  { path: 'snapshots/:id', element: <SnapshotPage /> },
  { path: 'atlas', element: <AtlasPage /> },
  { path: 'atlas/manipulations/:term', element: <AtlasManipulationPage /> },
  { path: 'atlas/outcomes/:kind', element: <AtlasOutcomePage /> },
  { path: 'import', element: <ImportPage /> },
  { path: 'imports/:id', element: <ImportBatchPage /> },
  { path: 'references', element: <ReferencesPage /> },
  { path: 'references/:id', element: <ReferencePage /> },
  { path: 'screening', element: <ScreeningPage /> },
  { path: 'duplicates', element: <DuplicatesPage /> },
  { path: 'search', element: <SearchPage /> },
  { path: 'extractions', element: <MyExtractionsPage /> },
  { path: 'extractions/:id', element: <ExtractionPage /> },
  { path: 'assignments', element: <AssignmentsPage /> },
  { path: 'reconciliation', element: <ReconciliationPage /> },
  { path: 'reconciliation/:id', element: <ReconcilePairPage /> },
  { path: 'records/:id', element: <RecordPage /> },
  { path: 'agreement', element: <AgreementPage /> },
  { path: 'manipulations', element: <ManipulationsPage /> },
  { path: 'admin/mail', element: <AdminMailPage /> },
  { path: 'admin/people', element: <AdminPeoplePage /> },
  { path: 'admin/audit', element: <AdminAuditPage /> },
];

export const router = createBrowserRouter([{ path: '/', element: <AppShell />, children: [...screens, { path: '*', element: <NotFoundPage /> }] }]);
