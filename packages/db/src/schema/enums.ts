import { pgEnum } from 'drizzle-orm/pg-core';

// Closed sets shared by several domains. Values are the API's words; labels belong to the UI.

export const userRole = pgEnum('user_role', [
  'owner',
  'regional_manager',
  'shop_lead',
  'technician',
  'auditor',
]);
export type UserRole = (typeof userRole.enumValues)[number];

export const jobState = pgEnum('job_state', [
  'checked_in',
  'on_bench',
  'waiting_parts',
  'ready',
  'collected',
]);
export type JobState = (typeof jobState.enumValues)[number];

export const serviceType = pgEnum('service_type', [
  'tune_up',
  'overhaul',
  'repair',
  'parts_install',
]);
export type ServiceType = (typeof serviceType.enumValues)[number];

export const reelKind = pgEnum('reel_kind', [
  'spinning',
  'baitcasting',
  'conventional',
  'lever_drag',
  'fly',
  'spincast',
]);
export type ReelKind = (typeof reelKind.enumValues)[number];

export const useProfile = pgEnum('use_profile', ['light', 'heavy']);
export type UseProfile = (typeof useProfile.enumValues)[number];

export const waterType = pgEnum('water_type', ['salt', 'fresh']);
export type WaterType = (typeof waterType.enumValues)[number];

export const stepGroup = pgEnum('step_group', [
  'teardown',
  'cleaning',
  'inspection',
  'lubrication',
  'drag',
  'reassembly',
  'test_crank',
]);
export type StepGroup = (typeof stepGroup.enumValues)[number];

export const photoStage = pgEnum('photo_stage', ['check_in', 'teardown', 'reassembly']);
export type PhotoStage = (typeof photoStage.enumValues)[number];

export const comebackAttribution = pgEnum('comeback_attribution', [
  'workmanship',
  'part_failure',
  'customer_damage',
  'unrelated',
  'undetermined',
]);
export type ComebackAttribution = (typeof comebackAttribution.enumValues)[number];

export const comebackStatus = pgEnum('comeback_status', ['open', 'confirmed', 'dismissed']);
export type ComebackStatus = (typeof comebackStatus.enumValues)[number];

export const comebackDisposition = pgEnum('comeback_disposition', [
  'redone_free',
  'charged',
  'refunded',
]);
export type ComebackDisposition = (typeof comebackDisposition.enumValues)[number];

/** How a comeback was found: flagged at check-in, or linked by hand. */
export const comebackDetection = pgEnum('comeback_detection', ['automatic', 'manual']);
export type ComebackDetection = (typeof comebackDetection.enumValues)[number];

export const auditVerdict = pgEnum('audit_verdict', [
  'meets_standard',
  'needs_work',
  'critical_miss',
]);
export type AuditVerdict = (typeof auditVerdict.enumValues)[number];

export const auditAnswerResult = pgEnum('audit_answer_result', ['pass', 'fail', 'not_applicable']);
export type AuditAnswerResult = (typeof auditAnswerResult.enumValues)[number];

export const inspectionSeverity = pgEnum('inspection_severity', [
  'normal',
  'tightened',
  'reduced',
  'discontinued',
]);
export type InspectionSeverity = (typeof inspectionSeverity.enumValues)[number];

/** ISO 2859-1 inspection levels: general I–III and special S-1…S-4. */
export const inspectionLevel = pgEnum('inspection_level', [
  'I',
  'II',
  'III',
  'S1',
  'S2',
  'S3',
  'S4',
]);
export type InspectionLevel = (typeof inspectionLevel.enumValues)[number];

export const auditRoundStatus = pgEnum('audit_round_status', [
  'planned',
  'in_progress',
  'decided',
  'cancelled',
]);
export type AuditRoundStatus = (typeof auditRoundStatus.enumValues)[number];

export const lotDecision = pgEnum('lot_decision', ['accepted', 'rejected']);
export type LotDecision = (typeof lotDecision.enumValues)[number];

export const correctiveActionStatus = pgEnum('corrective_action_status', [
  'open',
  'in_progress',
  'done',
  'verified',
]);
export type CorrectiveActionStatus = (typeof correctiveActionStatus.enumValues)[number];

export const correctiveActionSource = pgEnum('corrective_action_source', [
  'audit',
  'comeback',
  'other',
]);
export type CorrectiveActionSource = (typeof correctiveActionSource.enumValues)[number];

export const emailKind = pgEnum('email_kind', [
  'job_ready',
  'comeback_review',
  'audit_assigned',
  'audit_rejected',
  'corrective_action',
  'service_reminder',
  'other',
]);
export type EmailKind = (typeof emailKind.enumValues)[number];

export const emailStatus = pgEnum('email_status', ['pending', 'sent', 'failed']);
export type EmailStatus = (typeof emailStatus.enumValues)[number];

export const importKind = pgEnum('import_kind', ['jobs']);
export type ImportKind = (typeof importKind.enumValues)[number];

export const importStatus = pgEnum('import_status', [
  'validating',
  'importing',
  'imported',
  'failed',
]);
export type ImportStatus = (typeof importStatus.enumValues)[number];

export const royaltyInvoiceStatus = pgEnum('royalty_invoice_status', [
  'pending',
  'open',
  'paid',
  'failed',
  'void',
]);
export type RoyaltyInvoiceStatus = (typeof royaltyInvoiceStatus.enumValues)[number];

export const reminderBatchStatus = pgEnum('reminder_batch_status', ['running', 'done', 'failed']);
export type ReminderBatchStatus = (typeof reminderBatchStatus.enumValues)[number];
