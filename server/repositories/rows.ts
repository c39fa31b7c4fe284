// The rows of each table as the pg driver returns them (bigint and numeric parsed to numbers in db/knex.ts;
// jsonb parsed; timestamps as Date). Repositories read and write these; services see the repositories' shapes.
import type { ReportForm } from '../../shared/extraction/compute.js';
import type { Csl } from '../adapters/citations.js';
import type { Role } from '../../shared/roles.js';
import type { Metric } from '../../shared/stats/metrics.js';
import type { Design } from '../../shared/vocabulary/designs.js';
import type { Modality } from '../../shared/vocabulary/modalities.js';
import type { OutcomeKind } from '../../shared/vocabulary/outcomes.js';
import type { Parameter, Unit } from '../../shared/vocabulary/parameters.js';
import type { Population } from '../../shared/vocabulary/populations.js';
import type { Task } from '../../shared/vocabulary/tasks.js';

export type Timestamp = Date | string;
export type Json = Record<string, unknown>;

export interface UserRow {
  id: number;
  github_id: string;
  login: string;
  name: string | null;
  email: string | null;
  avatar_url: string | null;
  created_at: Timestamp;
  last_seen_at: Timestamp | null;
}

export interface UserRoleRow {
  user_id: number;
  role: Role;
  granted_by: number | null;
  granted_at: Timestamp;
}

export interface AuditRow {
  id: number;
  at: Timestamp;
  actor_id: number | null;
  action: string;
  entity_type: string;
  entity_id: string | null;
  details: Json;
}

export interface ApiTokenRow {
  id: number;
  user_id: number;
  name: string;
  token_hash: string;
  prefix: string;
  created_at: Timestamp;
  last_used_at: Timestamp | null;
  revoked_at: Timestamp | null;
  minted_by_token_id: number | null;
}

export type ScreeningStatus = 'unscreened' | 'awaiting_full_text' | 'included' | 'excluded';

export interface RefRow {
  id: number;
  csl: Csl;
  doi: string | null;
  title: string;
  year: number | null;
  first_author: string | null;
  container: string | null;
  title_key: string;
  source: string;
  screening_status: ScreeningStatus;
  merged_into: number | null;
  version: number;
  created_by: number | null;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface ImportBatchRow {
  id: number;
  format: 'bibtex' | 'ris' | 'doi';
  label: string | null;
  state: 'queued' | 'running' | 'done' | 'failed';
  total: number;
  created_by: number | null;
  created_at: Timestamp;
  finished_at: Timestamp | null;
  /** the submitted text of a batch imported by a job, until it is done */
  source_text: string | null;
  /** entries a job has read so far (null: not a job, see the entries) */
  processed: number | null;
  /** why a job failed, in words */
  failure: string | null;
}

export type EntryStatus = 'pending' | 'imported' | 'duplicate' | 'rejected';

export interface ImportEntryRow {
  batch_id: number;
  idx: number;
  entry_key: string | null;
  status: EntryStatus;
  message: string | null;
  input: string | null;
  reference_id: number | null;
  likely_duplicate_of: number | null;
}

export interface ScreeningDecisionRow {
  id: number;
  ref_id: number;
  decision: 'included' | 'excluded';
  stage: 'title_abstract' | 'full_text';
  /** a title/abstract inclusion the two-stage migration added for a decision made before */
  carried_over: boolean;
  reason: string | null;
  note: string | null;
  decided_by: number | null;
  decided_at: Timestamp;
  undone_at: Timestamp | null;
  undone_by: number | null;
  /** the settled records this exclusion withdrew (its undo restores them) */
  withdrawn_records: number[];
}

export interface AttachmentRow {
  id: number;
  ref_id: number;
  filename: string;
  stored_name: string;
  size_bytes: number;
  mime: string;
  uploaded_by: number | null;
  created_at: Timestamp;
}

export interface DuplicateCandidateRow {
  id: number;
  ref_a: number;
  ref_b: number;
  reason: string;
  status: 'open' | 'merged' | 'dismissed';
  decided_by: number | null;
  decided_at: Timestamp | null;
  kept_ref: number | null;
  created_at: Timestamp;
}

export interface ManipulationRow {
  id: number;
  term: string;
  label: string;
  description: string;
  retired_at: Timestamp | null;
  version: number;
  updated_by: number | null;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export type AssignmentState = 'coding' | 'matched' | 'disputed' | 'settled' | 'withdrawn';

export interface AssignmentRow {
  id: number;
  reference_id: number;
  coder1_id: number;
  coder2_id: number;
  assigned_by: number | null;
  state: AssignmentState;
  version: number;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export type ExtractionState = 'draft' | 'submitted' | 'matched' | 'disputed' | 'settled' | 'withdrawn';

export interface ExtractionRow {
  id: number;
  reference_id: number;
  assignment_id: number | null;
  kind: 'coding' | 'settled';
  coder_id: number | null;
  state: ExtractionState;
  version: number;
  record_version: number | null;
  supersedes_id: number | null;
  superseded_by: number | null;
  reopen_reason: string | null;
  notes: string;
  updated_by: number | null;
  submitted_at: Timestamp | null;
  settled_at: Timestamp | null;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface ExtractionStudyRow {
  id: number;
  extraction_id: number;
  study_id: number | null;
  position: number;
  label: string;
  design: Design | null;
  n1: number | null;
  n2: number | null;
  population: Population | null;
  diagnosis: string | null;
  modality: Modality | null;
  task: Task | null;
  standard_ms: number | null;
}

export interface EffectRow {
  id: number;
  extraction_id: number;
  extraction_study_id: number;
  position: number;
  label: string;
  outcome: OutcomeKind | null;
  parameter: Parameter | null;
  unit: Unit | null;
  manipulation_id: number | null;
  report_form: ReportForm | null;
  reported: Json;
  metric: Metric | null;
  effect: number | null;
  variance: number | null;
  formula: string | null;
  assumed_r: number | null;
  n_total: number | null;
  from_bound: boolean;
  approximate: boolean;
  sign_reversed: boolean;
  page: string | null;
  locator: string | null;
  quote: string | null;
  version: number;
  updated_by: number | null;
  withdrawn_at: Timestamp | null;
  withdrawn_reason: string | null;
  derivation: Json | null;
  trial_set_id: number | null;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface DiscrepancyRow {
  id: number;
  assignment_id: number;
  path: string;
  field: string;
  label: string;
  value_a: unknown;
  value_b: unknown;
  status: 'open' | 'resolved';
  resolution: 'a' | 'b' | 'value' | null;
  resolved_value: unknown;
  rationale: string | null;
  resolved_by: number | null;
  resolved_at: Timestamp | null;
  created_at: Timestamp;
}

export type SettlementKind = 'matched' | 'reconciled' | 'direct' | 'reopened' | 'withdrawn' | 'edited' | 'restored';

export interface SettlementRow {
  id: number;
  reference_id: number;
  assignment_id: number | null;
  record_id: number;
  kind: SettlementKind;
  actor_id: number | null;
  rationale: string;
  at: Timestamp;
}

export type MailStatus = 'queued' | 'sent' | 'retrying' | 'failed';

export interface MailLogRow {
  id: number;
  kind: string;
  to_address: string;
  subject: string;
  body: string;
  status: MailStatus;
  attempts: number;
  last_error: string | null;
  job_id: string | null;
  message_id: string | null;
  created_at: Timestamp;
  sent_at: Timestamp | null;
}

export interface SnapshotRow {
  id: string;
  title: string;
  created_by: number | null;
  created_at: Timestamp;
  registry_version: number;
  request: unknown;
  metric: string;
  k: number;
  estimate: number;
  effects: unknown;
  output: unknown;
  methods: string;
  references: unknown;
  prisma: unknown;
  flow: unknown;
  software: string;
}

export interface TrialSetRow {
  id: number;
  extraction_id: number;
  label: string;
  task: 'order' | 'duration' | 'simultaneity';
  model: 'cumulative_gaussian' | 'logistic';
  modality: Modality;
  format: 'trials' | 'counts';
  file_name: string;
  row_count: number;
  trial_count: number;
  participant_count: number;
  conditions: string[];
  level_min: number;
  level_max: number;
  uploaded_by: number | null;
  fit_state: 'none' | 'queued' | 'running' | 'done' | 'failed';
  fit_done: number;
  fit_total: number;
  fit_resamples: number | null;
  fit_error: string | null;
  fit_job_id: string | null;
  fitted_at: Timestamp | null;
  created_at: Timestamp;
}

export interface TrialDataRow {
  id: number;
  trial_set_id: number;
  line: number;
  participant: string;
  condition: string;
  level: number;
  n: number;
  k: number;
}

export interface TrialFitRow {
  id: number;
  trial_set_id: number;
  position: number;
  participant: string;
  condition: string;
  converged: boolean;
  result: Json;
}

export interface ScreeningRuleRow {
  id: 1;
  screeners: 1 | 2;
  updated_by: number | null;
  updated_at: Timestamp;
}

/** One screener's blind decision at a stage under the two-screener rule. */
export interface ScreeningVoteRow {
  id: number;
  ref_id: number;
  stage: 'title_abstract' | 'full_text';
  decision: 'included' | 'excluded';
  reason: string | null;
  note: string | null;
  decided_by: number;
  decided_at: Timestamp;
  /** the decision (screening_decisions) that settled it: two agreeing votes, or a curator's settlement */
  settled_by_decision: number | null;
  /** taken back by its screener, superseded, or reopened by an undo of the settled decision */
  withdrawn_at: Timestamp | null;
}
