// The console's wire types, generated from openapi/openapi.json (`npm run openapi`), so every call
// the console makes is typed by the public API's own document. Type-only: nothing ships.
import type { components } from '../../../../openapi/api-types.js';

type Schemas = components['schemas'];

export type Session = Schemas['Session'];
export type SwitchedOrganization = Schemas['SwitchedOrganization'];
export type OrganizationRef = Schemas['OrganizationRef'];
export type OrganizationPage = Schemas['OrganizationPage'];
export type Membership = Schemas['Membership'];
export type Role = Schemas['Role'];
export type UserView = Schemas['User'];
export type SignInRequest = Schemas['SignInRequest'];
export type PasswordResetRequest = Schemas['PasswordResetRequest'];
export type PasswordResetConfirm = Schemas['PasswordResetConfirm'];
export type AcceptInvitationRequest = Schemas['AcceptInvitationRequest'];

export type ApiKey = Schemas['ApiKey'];
export type ApiKeyPage = Schemas['ApiKeyPage'];
export type ApiKeyWithToken = Schemas['ApiKeyWithToken'];
export type CreateApiKeyRequest = Schemas['CreateApiKeyRequest'];
export type RotateApiKeyRequest = Schemas['RotateApiKeyRequest'];
export type KeyKind = Schemas['KeyKind'];
export type Scope = Schemas['Scope'];

export type UsageReport = Schemas['UsageReport'];
export type DayUsage = Schemas['DayUsage'];
export type KeyUsage = Schemas['KeyUsage'];
export type QuotaStanding = Schemas['QuotaStanding'];
export type Member = Schemas['Member'];
export type MemberPage = Schemas['MemberPage'];
export type CreateInvitationRequest = Schemas['CreateInvitationRequest'];
export type Invitation = Schemas['Invitation'];
export type InvitationResponse = Schemas['InvitationResponse'];
export type AuditEvent = Schemas['AuditEvent'];
export type AuditEventPage = Schemas['AuditEventPage'];
export type Organization = Schemas['Organization'];
export type UpdateOrganizationRequest = Schemas['UpdateOrganizationRequest'];
export type OutboxMessage = Schemas['OutboxMessage'];
export type OutboxPage = Schemas['OutboxPage'];
export type CalculationWarning = Schemas['Warning'];
export type TraceEntry = Schemas['TraceEntry'];
export type VoltageDropResponse = Schemas['VoltageDropResponse'];
export type CableResponse = Schemas['CableResponse'];
export type DriverResponse = Schemas['DriverResponse'];
export type PixelsResponse = Schemas['PixelsResponse'];
export type ReelsResponse = Schemas['ReelsResponse'];

export type StoredCatalog = Schemas['StoredCatalog'];
export type StoredCatalogItem = Schemas['StoredCatalogItem'];
export type StoredCatalogItemPage = Schemas['StoredCatalogItemPage'];
export type PatchCatalogItem = Schemas['PatchCatalogItem'];
export type CatalogImportReport = Schemas['CatalogImportReport'];

export type Project = Schemas['Project'];
export type ProjectPage = Schemas['ProjectPage'];
export type CreateProjectRequest = Schemas['CreateProjectRequest'];
export type Stair = Schemas['Stair'];
export type StairPage = Schemas['StairPage'];
export type CreateStairRequest = Schemas['CreateStairRequest'];
export type PatchStairRequest = Schemas['PatchStairRequest'];
export type EstimateRequest = Schemas['EstimateRequest'];
export type Staircase = Schemas['Staircase'];
export type TreadStrip = Schemas['TreadStrip'];
export type EstimateResponse = Schemas['EstimateResponse'];
export type EstimateTread = Schemas['EstimateTread'];
export type EstimateCheck = Schemas['EstimateCheck'];
export type StoredEstimate = Schemas['StoredEstimate'];
export type StoredEstimatePage = Schemas['StoredEstimatePage'];
export type StoredEstimateSummary = Schemas['StoredEstimateSummary'];
export type RerunEstimate = Schemas['RerunEstimate'];
export type EstimateChanges = Schemas['EstimateChanges'];
export type KitOptionsRequest = Schemas['KitOptionsRequest'];
export type KitOptionsResponse = Schemas['KitOptionsResponse'];
export type KitDesign = Schemas['KitDesign'];

export type Batch = Schemas['Batch'];
export type BatchPage = Schemas['BatchPage'];
export type BatchStatus = Batch['status'];
export type EmbedManifest = Schemas['EmbedManifest'];

export type BillingOverview = Schemas['BillingOverview'];
export type BillingState = BillingOverview['state'];
export type PlanOffer = Schemas['PlanOffer'];
export type CheckoutResult = Schemas['CheckoutResult'];
export type PaymentDetailsLink = Schemas['PaymentDetailsLink'];
export type Invoice = Schemas['Invoice'];
export type InvoiceList = Schemas['InvoiceList'];
