import { DOCUMENT, Injectable, effect, inject, signal } from '@angular/core';

export type ColorSchemeChoice = 'system' | 'light' | 'dark';

const STORAGE_KEY = 'treadwise.color-scheme';
const CHOICES: readonly ColorSchemeChoice[] = ['system', 'light', 'dark'];

/**
 * Light, dark, or whatever the system prefers. The theme's colours are CSS light-dark() values,
 * so setting `color-scheme` on the root element is all a switch takes.
 */
@Injectable({ providedIn: 'root' })
export class ColorScheme {
  private readonly root = inject(DOCUMENT).documentElement;
  private readonly storage = globalThis.localStorage as Storage | undefined;
  readonly choice = signal<ColorSchemeChoice>(readChoice(this.storage?.getItem(STORAGE_KEY)));

  constructor() {
    effect(() => {
      const choice = this.choice();
      this.root.style.colorScheme = choice === 'system' ? '' : choice;
      if (choice === 'system') this.storage?.removeItem(STORAGE_KEY);
      else this.storage?.setItem(STORAGE_KEY, choice);
    });
  }

  /** system → light → dark → system. */
  next(): void {
    this.choice.update((c) => CHOICES[(CHOICES.indexOf(c) + 1) % CHOICES.length]!);
  }
}

function readChoice(stored: string | null | undefined): ColorSchemeChoice {
  return CHOICES.includes(stored as ColorSchemeChoice) ? (stored as ColorSchemeChoice) : 'system';
}
