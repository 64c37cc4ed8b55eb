import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';

import type { PatchCatalogItem, StoredCatalogItem } from '../core/api-types.js';
import { problemMessage } from '../core/problem-details.js';
import { CatalogApi } from './catalog-api.js';

export interface CatalogItemDialogData {
  item: StoredCatalogItem;
  currency: string;
}

// Bounds of PATCH /v1/catalog/items/{sku} (shared/schemas/catalog-store.ts patchCatalogItemSchema).
export const ITEM_DESCRIPTION_MAX = 200;
export const ITEM_PRICE_MAX = 10_000_000;

/** Changes an item's name on the bill of materials and its price; the kind's figures come from an import. */
@Component({
  selector: 'tw-catalog-item-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatButton, MatFormFieldModule, MatInput],
  template: `
    <h2 mat-dialog-title>Edit {{ data.item.sku }}</h2>
    <form [formGroup]="form" (ngSubmit)="save()">
      <mat-dialog-content>
        <mat-form-field appearance="outline">
          <mat-label>Name on the bill of materials</mat-label>
          <input matInput formControlName="description" data-testid="item-description" [maxlength]="descriptionMax" />
          @if (form.controls.description.hasError('maxlength')) {
            <mat-error>At most {{ descriptionMax }} characters.</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Unit price ({{ data.currency }}, net)</mat-label>
          <input matInput type="number" inputmode="decimal" min="0" step="0.01" formControlName="unitPrice" data-testid="item-price" />
          <mat-hint>Empty: the item is matched but its line is not priced.</mat-hint>
          @if (form.controls.unitPrice.hasError('min') || form.controls.unitPrice.hasError('max')) {
            <mat-error>From 0 to {{ priceMax }}.</mat-error>
          }
        </mat-form-field>
        @if (failure()) {
          <p class="tw-form-failure" role="alert" data-testid="item-failure">{{ failure() }}</p>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" data-testid="item-save" [disabled]="saving()">Save</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    mat-form-field {
      display: block;
      width: 100%;
      margin-bottom: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CatalogItemDialog {
  protected readonly data = inject<CatalogItemDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<CatalogItemDialog, StoredCatalogItem>>(MatDialogRef);
  private readonly api = inject(CatalogApi);

  protected readonly descriptionMax = ITEM_DESCRIPTION_MAX;
  protected readonly priceMax = ITEM_PRICE_MAX;
  protected readonly saving = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly form = new FormGroup({
    description: new FormControl(this.data.item.description ?? '', { nonNullable: true, validators: [Validators.maxLength(ITEM_DESCRIPTION_MAX)] }),
    unitPrice: new FormControl<number | null>(this.data.item.unitPrice ?? null, [Validators.min(0), Validators.max(ITEM_PRICE_MAX)]),
  });

  /** Only what changed; an emptied field is sent as null, which removes it. */
  patch(): PatchCatalogItem {
    const { description, unitPrice } = this.form.getRawValue();
    const patch: PatchCatalogItem = {};
    const name = description.trim();
    if (name !== (this.data.item.description ?? '')) patch.description = name === '' ? null : name;
    const price = unitPrice === null || (unitPrice as unknown) === '' ? null : Number(unitPrice);
    if (price !== (this.data.item.unitPrice ?? null)) patch.unitPrice = price;
    return patch;
  }

  protected async save(): Promise<void> {
    if (this.form.invalid) return this.form.markAllAsTouched();
    const patch = this.patch();
    if (Object.keys(patch).length === 0) return this.ref.close();
    this.saving.set(true);
    this.failure.set(null);
    try {
      this.ref.close(await firstValueFrom(this.api.patchItem(this.data.item.sku, patch)));
    } catch (error) {
      this.failure.set(problemMessage(error));
    } finally {
      this.saving.set(false);
    }
  }
}
