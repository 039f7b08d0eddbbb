// The words a text column may hold, in one framework-free module: the tables in db/schema type and
// re-export them, and the zod schemas that also run in the browser take them from here, because a
// value import from db/schema would bring drizzle's column builders into the page's scripts.
// The database's check constraints spell the same lists in SQL; change both together.

export const organisationKinds = ['plant', 'supplier', 'lab', 'board'] as const;
export type OrganisationKind = (typeof organisationKinds)[number];

export const caseStatuses = ['open', 'awaiting_sample', 'retest', 'review', 'decided', 'withdrawn'] as const;
export type CaseStatus = (typeof caseStatuses)[number];
export const disputeGrounds = ['sampling', 'instrument', 'natural_variation', 'sample_handling', 'other'] as const;
export type DisputeGround = (typeof disputeGrounds)[number];

export const decisionOutcomes = ['uphold', 'reverse', 'adjust', 'further_test'] as const;
export type DecisionOutcome = (typeof decisionOutcomes)[number];

export const attachmentKinds = ['lab_sheet', 'photo', 'calibration_certificate', 'correspondence', 'other'] as const;
export type AttachmentKind = (typeof attachmentKinds)[number];
export const noteVisibilities = ['parties', 'internal'] as const;
export type NoteVisibility = (typeof noteVisibilities)[number];

export const intakeVerdicts = ['accepted', 'deducted', 'rejected'] as const;
export type IntakeVerdict = (typeof intakeVerdicts)[number];

export const measurementPurposes = ['intake', 'retest', 'further_test'] as const;
export type MeasurementPurpose = (typeof measurementPurposes)[number];
export const preparations = ['none', 'prewarmed'] as const;
export type Preparation = (typeof preparations)[number];
export const resultBases = ['mean_of_2', 'mean_of_4', 'median_of_4'] as const;
export type ResultBasis = (typeof resultBases)[number];
export const readingFlags = ['none', 'early_crystallisation', 'no_crystallisation'] as const;
export type ReadingFlag = (typeof readingFlags)[number];

export const sampleKinds = ['routine', 'retained', 'counter', 'referee', 'authentic'] as const;
export type SampleKind = (typeof sampleKinds)[number];
export const custodyEventKinds = ['sealed', 'stored', 'dispatched', 'received', 'seal_checked', 'opened', 'disposed'] as const;
export type CustodyEventKind = (typeof custodyEventKinds)[number];
