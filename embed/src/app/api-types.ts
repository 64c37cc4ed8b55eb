import type { components } from '../../../openapi/api-types.js';

// The generated OpenAPI types: the element speaks the same contract as the CLI and console.
type Schemas = components['schemas'];
export type KitOptionsRequest = Schemas['KitOptionsRequest'];
export type KitOptionsResponse = Schemas['KitOptionsResponse'];
export type KitDesign = Schemas['KitDesign'];
export type CartLine = Schemas['CartLine'];
export type Caution = Schemas['Caution'];
export type StoredCatalogItem = Schemas['StoredCatalogItem'];
export type StoredCatalogStrip = Schemas['StoredCatalogStrip'];
export type StoredCatalogItemPage = Schemas['StoredCatalogItemPage'];
export type Problem = Schemas['Problem'];
