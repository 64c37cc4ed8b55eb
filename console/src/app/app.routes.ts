import type { Routes } from '@angular/router';

export const routes: Routes = [
  { path: '', pathMatch: 'full', redirectTo: 'status' },
  {
    path: 'status',
    title: 'Status · Treadwise',
    loadComponent: () => import('./status/status-page.js').then((m) => m.StatusPage),
  },
  { path: '**', redirectTo: 'status' },
];
