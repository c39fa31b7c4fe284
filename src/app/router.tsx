import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppShell } from './AppShell';
import { AdminAuditPage } from './routes/AdminAuditPage';
import { AdminPeoplePage } from './routes/AdminPeoplePage';
import { HomePage } from './routes/HomePage';
import { NotFoundPage } from './routes/NotFoundPage';
import { TokensPage } from './routes/TokensPage';

/** Every screen; each feature adds its routes to this list. */
const screens: RouteObject[] = [
  { index: true, element: <HomePage /> },
  { path: 'settings/tokens', element: <TokensPage /> },
  { path: 'admin/people', element: <AdminPeoplePage /> },
  { path: 'admin/audit', element: <AdminAuditPage /> },
];

export const router = createBrowserRouter([{ path: '/', element: <AppShell />, children: [...screens, { path: '*', element: <NotFoundPage /> }] }]);
