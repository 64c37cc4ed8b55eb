import type { Routes } from '@angular/router';

/** Batch jobs: the list with the upload panel, and one job watched live. */
export const BATCH_ROUTES: Routes = [
  {
    path: '',
    title: 'Batches · Treadwise',
    loadComponent: () => import('./batch-list.js').then((m) => m.BatchList),
  },
  {
    path: ':batchId',
    title: 'Batch job · Treadwise',
    loadComponent: () => import('./batch-page.js').then((m) => m.BatchPage),
  },
];
