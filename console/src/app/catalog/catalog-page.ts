import { CurrencyPipe, DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, viewChild } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator } from '@angular/material/paginator';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import { MatTooltip } from '@angular/material/tooltip';
import { firstValueFrom, forkJoin } from 'rxjs';

import type { StoredCatalog, StoredCatalogItem } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { saveDownload } from '../core/file-download.js';
import { problemMessage } from '../core/problem-details.js';
import { LoadFailure } from '../core/load-failure.js';
import { CatalogApi } from './catalog-api.js';
import { CatalogImport } from './catalog-import.js';
import { CatalogItemDialog, type CatalogItemDialogData } from './catalog-item-dialog.js';
import { catalogItemDetails, catalogItemFilterText } from './catalog-item-details.js';

type Listing = { state: 'loading' } | { state: 'ready'; catalog: StoredCatalog } | { state: 'failed'; reason: string };

const READ_COLUMNS = ['sku', 'kind', 'description', 'details', 'unitPrice', 'active'] as const;

/** The stored catalog: import a CSV (checked first), browse, edit prices and names, retire SKUs, export. */
@Component({
  selector: 'tw-catalog-page',
  imports: [
    CurrencyPipe,
    DatePipe,
    MatTableModule,
    MatSortModule,
    MatPaginator,
    MatButton,
    MatIconButton,
    MatIcon,
    MatProgressBar,
    MatTooltip,
    MatFormFieldModule,
    MatInput,
    CatalogImport,
    LoadFailure,
  ],
  templateUrl: './catalog-page.html',
  styleUrl: './catalog-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CatalogPage {
  private readonly api = inject(CatalogApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly auth = inject(Auth);

  protected readonly listing = signal<Listing>({ state: 'loading' });
  protected readonly mayManage = computed(() => roleMay(this.auth.role(), 'catalog:manage'));
  protected readonly columns = computed(() => (this.mayManage() ? [...READ_COLUMNS, 'actions'] : [...READ_COLUMNS]));
  protected readonly items = new MatTableDataSource<StoredCatalogItem>([]);
  protected readonly itemCount = signal(0);
  protected readonly details = catalogItemDetails;
  protected readonly downloading = signal(false);

  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);

  constructor() {
    this.items.filterPredicate = (item, filter) => catalogItemFilterText(item).includes(filter);
    this.items.sortingDataAccessor = (item, column) => {
      switch (column) {
        case 'unitPrice':
          return item.unitPrice ?? -1;
        case 'active':
          return item.active === false ? 0 : 1;
        case 'description':
          return (item.description ?? '').toLowerCase();
        default:
          return String((item as Record<string, unknown>)[column] ?? '').toLowerCase();
      }
    };
    // The table's sort and paginator exist only once the ready state has rendered.
    effect(() => {
      const sort = this.sort();
      const paginator = this.paginator();
      if (sort) this.items.sort = sort;
      if (paginator) this.items.paginator = paginator;
    });
    this.load();
  }

  protected load(): void {
    this.listing.set({ state: 'loading' });
    forkJoin([this.api.catalog(), this.api.allItems()]).subscribe({
      next: ([catalog, items]) => {
        this.setItems(items);
        this.listing.set({ state: 'ready', catalog });
      },
      error: (error: unknown) => this.listing.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  protected filter(value: string): void {
    this.items.filter = value.trim().toLowerCase();
    this.items.paginator?.firstPage();
  }

  protected async edit(item: StoredCatalogItem, currency: string): Promise<void> {
    const data: CatalogItemDialogData = { item, currency };
    const ref = this.dialog.open<CatalogItemDialog, CatalogItemDialogData, StoredCatalogItem>(CatalogItemDialog, { data, width: '480px', maxWidth: '95vw' });
    const saved = await firstValueFrom(ref.afterClosed());
    if (saved) {
      this.replace(saved);
      this.tell(`Saved ${saved.sku}.`);
    }
  }

  protected async retire(item: StoredCatalogItem): Promise<void> {
    try {
      this.replace(await firstValueFrom(this.api.retire(item.sku)));
      this.tell(`Retired ${item.sku}: old estimates keep it, new ones never pick it.`);
    } catch (error) {
      this.tell(problemMessage(error));
    }
  }

  protected async restore(item: StoredCatalogItem): Promise<void> {
    try {
      this.replace(await firstValueFrom(this.api.patchItem(item.sku, { active: true })));
      this.tell(`${item.sku} is active again.`);
    } catch (error) {
      this.tell(problemMessage(error));
    }
  }

  protected async download(): Promise<void> {
    this.downloading.set(true);
    try {
      saveDownload(await firstValueFrom(this.api.export()), 'catalog.csv');
    } catch (error) {
      this.tell(problemMessage(error));
    } finally {
      this.downloading.set(false);
    }
  }

  protected imported(): void {
    this.load();
  }

  private setItems(items: StoredCatalogItem[]): void {
    this.items.data = items;
    this.itemCount.set(items.length);
  }

  private replace(item: StoredCatalogItem): void {
    this.setItems(this.items.data.map((i) => (i.sku === item.sku ? item : i)));
  }

  private tell(message: string): void {
    this.snackBar.open(message, 'Dismiss', { duration: 6000 });
  }
}
