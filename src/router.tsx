import { Navigate, type RouteObject } from 'react-router';
import { AppShell, HomeRedirect, RequireAuth, TeamScope } from './app/AppShell';
import { NotFoundPage } from './app/NotFound';
import { RouteError } from './app/RouteError';
import { PageLoading } from './components/States';
import { AccountPage } from './features/account/AccountPage';
import { SignInPage } from './features/auth/SignInPage';
import { SignUpPage } from './features/auth/SignUpPage';
import { OutboxPage } from './features/outbox/OutboxPage';
import { ProjectListPage } from './features/projects/ProjectListPage';
import { ProjectPage } from './features/projects/ProjectPage';
import { InviteAcceptPage } from './features/teams/InviteAcceptPage';
import { MembersPage } from './features/teams/MembersPage';

/** The client routes (see the API contract). Exported so tests can mount them in a memory router. */
export const routes: RouteObject[] = [
  {
    path: '/',
    errorElement: <RouteError />,
    // Shown while a lazy route (the editor) loads on a fresh page load.
    hydrateFallbackElement: <PageLoading />,
    children: [
      { path: 'sign-in', element: <SignInPage /> },
      { path: 'sign-up', element: <SignUpPage /> },
      { path: 'invites/:token', element: <InviteAcceptPage /> },
      {
        element: <RequireAuth />,
        children: [
          {
            // The print view of a diagram's briefing sheet: outside the shell, so only the sheet prints.
            path: 'diagrams/:diagramId/print',
            errorElement: <RouteError />,
            lazy: async () => {
              const { default: Component } = await import('./features/export/PrintRoute');
              return { Component };
            },
          },
          {
            element: <AppShell />,
            children: [
              {
                // Errors below the shell keep the header and footer on screen.
                errorElement: <RouteError inShell />,
                children: [
                  { index: true, element: <HomeRedirect /> },
                  {
                    path: 'teams/:teamId',
                    element: <TeamScope />,
                    children: [
                      { index: true, element: <Navigate to="projects" replace /> },
                      { path: 'projects', element: <ProjectListPage /> },
                      { path: 'members', element: <MembersPage /> },
                      { path: 'outbox', element: <OutboxPage /> },
                      { path: 'library', lazy: async () => ({ Component: (await import('./features/library/LibraryPage')).default }) },
                    ],
                  },
                  { path: 'projects/:projectId', element: <ProjectPage /> },
                  { path: 'account', element: <AccountPage /> },
                  {
                    path: 'diagrams/:diagramId/history',
                    lazy: async () => ({ Component: (await import('./features/revisions/HistoryPage')).default }),
                  },
                  {
                    path: 'diagrams/:diagramId/revisions/:n',
                    lazy: async () => ({ Component: (await import('./features/revisions/RevisionViewPage')).default }),
                  },
                  {
                    path: 'diagrams/:diagramId/compare',
                    lazy: async () => ({ Component: (await import('./features/compare/ComparePage')).default }),
                  },
                  {
                    path: 'diagrams/:diagramId',
                    lazy: async () => {
                      const { default: Component } = await import('./features/editor/EditorRoute');
                      return { Component };
                    },
                  },
                  { path: '*', element: <NotFoundPage /> },
                ],
              },
            ],
          },
        ],
      },
    ],
  },
];
