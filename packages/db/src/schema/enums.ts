import { pgEnum } from 'drizzle-orm/pg-core';
import {
  USER_ROLES,
  JOB_STATES,
  SERVICE_TYPES,
  REEL_KINDS,
  USE_PROFILES,
  WATER_TYPES,
  STEP_GROUPS,
  PHOTO_STAGES,
  COMEBACK_ATTRIBUTIONS,
  COMEBACK_STATUSES,
  COMEBACK_DISPOSITIONS,
  COMEBACK_DETECTIONS,
  AUDIT_VERDICTS,
  AUDIT_ANSWER_RESULTS,
  INSPECTION_SEVERITIES,
  INSPECTION_LEVELS,
  AUDIT_ROUND_STATUSES,
  LOT_DECISIONS,
  CORRECTIVE_ACTION_STATUSES,
  CORRECTIVE_ACTION_SOURCES,
  EMAIL_KINDS,
  EMAIL_STATUSES,
  IMPORT_KINDS,
  IMPORT_STATUSES,
  ROYALTY_INVOICE_STATUSES,
  REMINDER_BATCH_STATUSES,
  ACCOUNT_LINK_PURPOSES,
} from './values';

// Closed sets shared by several domains. Values are the API's words; labels belong to the UI.

export const userRole = pgEnum('user_role', USER_ROLES);
export type UserRole = (typeof userRole.enumValues)[number];

export const jobState = pgEnum('job_state', JOB_STATES);
export type JobState = (typeof jobState.enumValues)[number];

export const serviceType = pgEnum('service_type', SERVICE_TYPES);
export type ServiceType = (typeof serviceType.enumValues)[number];

export const reelKind = pgEnum('reel_kind', REEL_KINDS);
export type ReelKind = (typeof reelKind.enumValues)[number];

export const useProfile = pgEnum('use_profile', USE_PROFILES);
export type UseProfile = (typeof useProfile.enumValues)[number];

export const waterType = pgEnum('water_type', WATER_TYPES);
export type WaterType = (typeof waterType.enumValues)[number];

export const stepGroup = pgEnum('step_group', STEP_GROUPS);
export type StepGroup = (typeof stepGroup.enumValues)[number];

export const photoStage = pgEnum('photo_stage', PHOTO_STAGES);
export type PhotoStage = (typeof photoStage.enumValues)[number];

export const comebackAttribution = pgEnum('comeback_attribution', COMEBACK_ATTRIBUTIONS);
export type ComebackAttribution = (typeof comebackAttribution.enumValues)[number];

export const comebackStatus = pgEnum('comeback_status', COMEBACK_STATUSES);
export type ComebackStatus = (typeof comebackStatus.enumValues)[number];

export const comebackDisposition = pgEnum('comeback_disposition', COMEBACK_DISPOSITIONS);
export type ComebackDisposition = (typeof comebackDisposition.enumValues)[number];

/** How a comeback was found: flagged at check-in, or linked by hand. */
export const comebackDetection = pgEnum('comeback_detection', COMEBACK_DETECTIONS);
export type ComebackDetection = (typeof comebackDetection.enumValues)[number];

export const auditVerdict = pgEnum('audit_verdict', AUDIT_VERDICTS);
export type AuditVerdict = (typeof auditVerdict.enumValues)[number];

export const auditAnswerResult = pgEnum('audit_answer_result', AUDIT_ANSWER_RESULTS);
export type AuditAnswerResult = (typeof auditAnswerResult.enumValues)[number];

export const inspectionSeverity = pgEnum('inspection_severity', INSPECTION_SEVERITIES);
export type InspectionSeverity = (typeof inspectionSeverity.enumValues)[number];

/** ISO 2859-1 inspection levels: general I–III and special S-1…S-4. */
export const inspectionLevel = pgEnum('inspection_level', INSPECTION_LEVELS);
export type InspectionLevel = (typeof inspectionLevel.enumValues)[number];

export const auditRoundStatus = pgEnum('audit_round_status', AUDIT_ROUND_STATUSES);
export type AuditRoundStatus = (typeof auditRoundStatus.enumValues)[number];

export const lotDecision = pgEnum('lot_decision', LOT_DECISIONS);
export type LotDecision = (typeof lotDecision.enumValues)[number];

export const correctiveActionStatus = pgEnum(
  'corrective_action_status',
  CORRECTIVE_ACTION_STATUSES,
);
export type CorrectiveActionStatus = (typeof correctiveActionStatus.enumValues)[number];

export const correctiveActionSource = pgEnum('corrective_action_source', CORRECTIVE_ACTION_SOURCES);
export type CorrectiveActionSource = (typeof correctiveActionSource.enumValues)[number];

export const emailKind = pgEnum('email_kind', EMAIL_KINDS);
export type EmailKind = (typeof emailKind.enumValues)[number];

export const emailStatus = pgEnum('email_status', EMAIL_STATUSES);
export type EmailStatus = (typeof emailStatus.enumValues)[number];

export const importKind = pgEnum('import_kind', IMPORT_KINDS);
export type ImportKind = (typeof importKind.enumValues)[number];

export const importStatus = pgEnum('import_status', IMPORT_STATUSES);
export type ImportStatus = (typeof importStatus.enumValues)[number];

export const royaltyInvoiceStatus = pgEnum('royalty_invoice_status', ROYALTY_INVOICE_STATUSES);
export type RoyaltyInvoiceStatus = (typeof royaltyInvoiceStatus.enumValues)[number];

export const reminderBatchStatus = pgEnum('reminder_batch_status', REMINDER_BATCH_STATUSES);
export type ReminderBatchStatus = (typeof reminderBatchStatus.enumValues)[number];

export const accountLinkPurpose = pgEnum('account_link_purpose', ACCOUNT_LINK_PURPOSES);
export type AccountLinkPurpose = (typeof accountLinkPurpose.enumValues)[number];
