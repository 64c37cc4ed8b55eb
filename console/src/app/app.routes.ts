import type { Routes } from '@angular/router';

import { requireSession } from './core/session-guard.js';
import { requireOperator } from './core/operator-guard.js';
import { requireRole } from './core/role-guard.js';

export const routes: Routes = [
  // Signed-out pages. The reset and invitation paths are the ones the API's e-mails link to.
  {
    path: 'sign-in',
    title: 'Sign in · Treadwise',
    loadComponent: () => import('./account/sign-in-page.js').then((m) => m.SignInPage),
  },
  {
    path: 'forgot-password',
    title: 'Reset your password · Treadwise',
    loadComponent: () => import('./account/password-reset-request.js').then((m) => m.PasswordResetRequestPage),
  },
  {
    path: 'reset-password',
    title: 'Choose a new password · Treadwise',
    loadComponent: () => import('./account/password-reset-confirm.js').then((m) => m.PasswordResetConfirmPage),
  },
  {
    path: 'accept-invitation',
    title: 'Join your team · Treadwise',
    loadComponent: () => import('./account/accept-invitation.js').then((m) => m.AcceptInvitationPage),
  },
  // Everything else lives in the signed-in shell.
  {
    path: '',
    canActivate: [requireSession],
    loadComponent: () => import('./shell/console-shell.js').then((m) => m.ConsoleShell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'status' },
      {
        path: 'keys',
        title: 'Keys · Treadwise',
        canActivate: [requireRole('keys:manage')],
        loadComponent: () => import('./keys/key-list.js').then((m) => m.KeyList),
      },
      {
        path: 'traffic',
        title: 'Traffic · Treadwise',
        canActivate: [requireRole('usage:read')],
        loadComponent: () => import('./traffic/traffic-page.js').then((m) => m.TrafficPage),
      },
      {
        path: 'bench',
        title: 'Bench · Treadwise',
        canActivate: [requireRole('sizing:run')],
        loadComponent: () => import('./bench/bench-page.js').then((m) => m.BenchPage),
      },
      {
        path: 'team',
        title: 'Team · Treadwise',
        canActivate: [requireRole('members:manage')],
        loadComponent: () => import('./team/team-page.js').then((m) => m.TeamPage),
      },
      {
        path: 'activity',
        title: 'Activity · Treadwise',
        canActivate: [requireRole('audit:read')],
        loadComponent: () => import('./activity/activity-page.js').then((m) => m.ActivityPage),
      },
      {
        path: 'billing',
        title: 'Billing · Treadwise',
        canActivate: [requireRole('billing:read')],
        loadComponent: () => import('./billing/billing-page.js').then((m) => m.BillingPage),
      },
      {
        path: 'operator/organizations',
        title: 'Organisations & plans · Treadwise',
        canActivate: [requireOperator],
        loadComponent: () => import('./operator/organization-plans.js').then((m) => m.OrganizationPlans),
      },
      {
        path: 'operator/outbox',
        title: 'Mail outbox · Treadwise',
        canActivate: [requireOperator],
        loadComponent: () => import('./operator/mail-outbox.js').then((m) => m.MailOutbox),
      },
      {
        path: 'catalog',
        title: 'Catalog · Treadwise',
        canActivate: [requireRole('catalog:read')],
        loadComponent: () => import('./catalog/catalog-page.js').then((m) => m.CatalogPage),
      },
      {
        path: 'projects',
        canActivate: [requireRole('projects:read')],
        loadChildren: () => import('./projects/projects.routes.js').then((m) => m.PROJECT_ROUTES),
      },
      {
        path: 'batches',
        canActivate: [requireRole('batches:read')],
        loadChildren: () => import('./batches/batches.routes.js').then((m) => m.BATCH_ROUTES),
      },
      {
        path: 'status',
        title: 'Status · Treadwise',
        loadComponent: () => import('./status/status-page.js').then((m) => m.StatusPage),
      },
      {
        path: 'not-allowed',
        title: 'Not for your role · Treadwise',
        loadComponent: () => import('./shell/not-allowed.js').then((m) => m.NotAllowed),
      },
    ],
  },
  { path: '**', redirectTo: '' },
];
