// The values of every closed set the database declares as an enum, as plain arrays with no
// imports, so that pages in the browser can use them without the database code. enums.ts builds
// the PostgreSQL enums from these; the app's validators and labels take them from here too.

/** PostgreSQL enum `user_role`. */
export const USER_ROLES = [
  'owner',
  'regional_manager',
  'shop_lead',
  'technician',
  'auditor',
] as const;
/** PostgreSQL enum `job_state`. */
export const JOB_STATES = [
  'checked_in',
  'on_bench',
  'waiting_parts',
  'ready',
  'collected',
] as const;
/** PostgreSQL enum `service_type`. */
export const SERVICE_TYPES = ['tune_up', 'overhaul', 'repair', 'parts_install'] as const;
/** PostgreSQL enum `reel_kind`. */
export const REEL_KINDS = [
  'spinning',
  'baitcasting',
  'conventional',
  'lever_drag',
  'fly',
  'spincast',
] as const;
/** PostgreSQL enum `use_profile`. */
export const USE_PROFILES = ['light', 'heavy'] as const;
/** PostgreSQL enum `water_type`. */
export const WATER_TYPES = ['salt', 'fresh'] as const;
/** PostgreSQL enum `step_group`. */
export const STEP_GROUPS = [
  'teardown',
  'cleaning',
  'inspection',
  'lubrication',
  'drag',
  'reassembly',
  'test_crank',
] as const;
/** PostgreSQL enum `photo_stage`. */
export const PHOTO_STAGES = ['check_in', 'teardown', 'reassembly'] as const;
/** PostgreSQL enum `comeback_attribution`. */
export const COMEBACK_ATTRIBUTIONS = [
  'workmanship',
  'part_failure',
  'customer_damage',
  'unrelated',
  'undetermined',
] as const;
/** PostgreSQL enum `comeback_status`. */
export const COMEBACK_STATUSES = ['open', 'confirmed', 'dismissed'] as const;
/** PostgreSQL enum `comeback_disposition`. */
export const COMEBACK_DISPOSITIONS = ['redone_free', 'charged', 'refunded'] as const;
/** PostgreSQL enum `comeback_detection`. */
export const COMEBACK_DETECTIONS = ['automatic', 'manual'] as const;
/** PostgreSQL enum `audit_verdict`. */
export const AUDIT_VERDICTS = ['meets_standard', 'needs_work', 'critical_miss'] as const;
/** PostgreSQL enum `audit_answer_result`. */
export const AUDIT_ANSWER_RESULTS = ['pass', 'fail', 'not_applicable'] as const;
/** PostgreSQL enum `inspection_severity`. */
export const INSPECTION_SEVERITIES = ['normal', 'tightened', 'reduced', 'discontinued'] as const;
/** PostgreSQL enum `inspection_level`. */
export const INSPECTION_LEVELS = ['I', 'II', 'III', 'S1', 'S2', 'S3', 'S4'] as const;
/** PostgreSQL enum `audit_round_status`. */
export const AUDIT_ROUND_STATUSES = ['planned', 'in_progress', 'decided', 'cancelled'] as const;
/** PostgreSQL enum `lot_decision`. */
export const LOT_DECISIONS = ['accepted', 'rejected'] as const;
/** PostgreSQL enum `corrective_action_status`. */
export const CORRECTIVE_ACTION_STATUSES = ['open', 'in_progress', 'done', 'verified'] as const;
/** PostgreSQL enum `corrective_action_source`. */
export const CORRECTIVE_ACTION_SOURCES = ['audit', 'comeback', 'other'] as const;
/** PostgreSQL enum `email_kind`. */
export const EMAIL_KINDS = [
  'job_ready',
  'comeback_review',
  'audit_assigned',
  'audit_rejected',
  'corrective_action',
  'service_reminder',
  'invitation',
  'password_reset',
  'nudge',
  'other',
] as const;
/** PostgreSQL enum `email_status`. */
/** `dead`: failed MAX_ATTEMPTS times; kept with its last error until the owner resends it. */
export const EMAIL_STATUSES = ['pending', 'sent', 'failed', 'dead'] as const;
/** PostgreSQL enum `import_kind`. */
export const IMPORT_KINDS = ['jobs'] as const;
/** PostgreSQL enum `import_status`. */
export const IMPORT_STATUSES = ['validating', 'importing', 'imported', 'failed'] as const;
/** PostgreSQL enum `royalty_invoice_status`. */
export const ROYALTY_INVOICE_STATUSES = ['pending', 'open', 'paid', 'failed', 'void'] as const;
/** PostgreSQL enum `reminder_batch_status`. */
export const REMINDER_BATCH_STATUSES = ['running', 'done', 'failed'] as const;
/** PostgreSQL enum `account_link_purpose`: what a one-time e-mailed link lets its holder do. */
export const ACCOUNT_LINK_PURPOSES = ['invitation', 'password_reset'] as const;
