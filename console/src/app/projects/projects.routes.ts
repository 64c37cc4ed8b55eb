import type { Routes } from '@angular/router';

import { requireRole } from '../core/role-guard.js';

/** Projects, their stairs, and the estimates a stair's runs stored. */
export const PROJECT_ROUTES: Routes = [
  {
    path: '',
    title: 'Projects · Treadwise',
    loadComponent: () => import('./project-list.js').then((m) => m.ProjectList),
  },
  {
    path: 'estimates/:estimateId',
    title: 'Estimate · Treadwise',
    loadComponent: () => import('./estimate/estimate-page.js').then((m) => m.EstimatePage),
  },
  {
    path: ':projectId',
    title: 'Project · Treadwise',
    loadComponent: () => import('./project-page.js').then((m) => m.ProjectPage),
  },
  {
    path: ':projectId/stairs/new',
    title: 'New stair · Treadwise',
    canActivate: [requireRole('projects:write')],
    loadComponent: () => import('./stair-page.js').then((m) => m.StairPage),
  },
  {
    path: ':projectId/stairs/:stairId',
    title: 'Stair · Treadwise',
    loadComponent: () => import('./stair-page.js').then((m) => m.StairPage),
  },
];
