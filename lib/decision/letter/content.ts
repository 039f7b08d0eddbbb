import type { Assessment } from '@/lib/arbitration';
import { celsius, milliCelsius, percent } from '@/lib/arbitration/format';
import { formatDateTime } from '@/lib/format/dates';
import { formatMoney } from '@/lib/money/minor-units';
import { formatCelsius, formatMilliC, formatStorageCelsius } from '@/lib/temperature';
import { decisionOutcomeLabels } from '../labels';
import type { SealedRecord } from '../record';
import type { Settlement } from '../settlement';
import { SIGNATURE_ALGORITHM, SIGNED_MESSAGE_PREFIX } from '../signature';

// Everything the letter says, worked out from the sealed record alone, so the letter can only ever
// show what was sealed. Pure: the PDF layout only places these strings.

export type Seal = { recordSha256: string; recordSignature: string; signingKeyId: string };
export type LetterLinks = { verifyUrl: string; publicKeyUrl: string };

export type LetterContent = {
  title: string;
  caseNumber: string;
  recordSha256: string;
  boardName: string;
  issuedFor: string;
  parties: [string, string][];
  contested: [string, string][];
  laboratories: { laboratory: string; purpose: string; instrument: string; testedAt: string; readings: string; result: string; calibration: string }[];
  comparison: string[];
  checks: { status: string; detail: string }[];
  outcome: string;
  proposal: string;
  reasons: string;
  departure: string | null;
  correction: string | null;
  settlement: string[];
  signature: [string, string][];
  seal: [string, string][];
  cautions: string[];
};

const verdictWords = { accepted: 'accepted', deducted: 'deducted (paid less by the added-water share)', rejected: 'rejected (not paid)' } as const;
const purposeWords: Record<string, string> = { intake: 'intake test', retest: 'retest of the retained sample', further_test: 'further test' };
const basisWords: Record<string, string> = { mean_of_2: 'mean of 2 readings', mean_of_4: 'mean of 4 readings', median_of_4: 'median of 4 readings' };
const ruleWords: Record<string, string> = { simple: 'simple acceptance', guarded_rejection: 'guarded rejection', guarded_acceptance: 'guarded acceptance' };
const statusWords = { pass: 'Pass', fail: 'Fail', not_applicable: 'n/a', missing: 'Missing' } as const;
const proposalWords: Record<string, string> = { uphold: 'uphold', reverse: 'reverse', adjust: 'adjust', further_test: 'a further test', incomplete: 'no proposal (information missing)' };

const c4 = (tenthMilliC: number) => formatCelsius(tenthMilliC, 4);

export function letterContent(record: SealedRecord, seal: Seal, links: LetterLinks): LetterContent {
  const orgName = (id: string | null) => (id ? (record.organisations.find((o) => o.id === id)?.name ?? 'unknown organisation') : 'none');
  const boardName = orgName(record.case.boardOrganisationId);
  const intake = record.intakeResult;
  const proposal = record.proposal as { assessment: Assessment } | null;
  const assessment = proposal?.assessment ?? null;
  const settlement = record.decision.settlement as Settlement;
  const currency = intake.currency;

  const laboratories = record.measurementSets.map((set) => {
    const check = set.calibrationCheck;
    return {
      laboratory: orgName(set.organisationId),
      purpose: purposeWords[set.purpose] ?? set.purpose,
      instrument: `${set.instrument.serialNumber} (${set.instrument.description})`,
      testedAt: formatDateTime(set.testedAt),
      readings: set.readings.map((r) => c4(r.valueTenthMilliC).replace(' °C', '')).join(', ') + ' °C',
      result: set.resultTenthMilliC === null ? 'no result' : `${c4(set.resultTenthMilliC)}${set.resultBasis ? ` (${basisWords[set.resultBasis] ?? set.resultBasis})` : ''}`,
      calibration: check
        ? `${check.within} of ${check.readingsTenthMilliC.length} within ±${formatMilliC(check.toleranceTenthMilliC)} of ${formatCelsius(check.nominalTenthMilliC)} (${check.required} needed): ${check.pass ? 'pass' : 'fail'}`
        : 'no calibration check recorded',
    };
  });

  const comparison: string[] = [];
  if (assessment?.comparison) {
    const { difference, criticalDifference, agree } = assessment.comparison;
    comparison.push(`The laboratories differ by ${milliCelsius(Math.abs(difference))} against a critical difference of ${milliCelsius(criticalDifference)}: they ${agree ? 'agree' : 'disagree'}.`);
  }
  if (assessment?.acceptedValue !== null && assessment?.acceptedValue !== undefined) {
    comparison.push(`Accepted value ${celsius(assessment.acceptedValue)} (${assessment.acceptedBasis === 'mean_of_both' ? 'mean of both laboratories' : 'the retest alone'}), under ${ruleWords[assessment.decisionRule] ?? assessment.decisionRule}.`);
  }
  if (assessment?.conformity) {
    const upper = assessment.conformity.upper;
    comparison.push(`Acceptance limit at the upper limit ${celsius(upper.acceptanceLimit)} (guard band ${milliCelsius(upper.guardBand)}): the accepted value is ${upper.beyond ? 'beyond it' : 'within it'}.`);
  }
  if (assessment?.addedWater) {
    comparison.push(assessment.addedWater.indicated ? `Added water indicated by the accepted value: ${percent(assessment.addedWater.percent)}.` : 'The accepted value indicates no added water.');
  }
  // The module's own summary begins with "Proposal:" and ends with "The arbiter decides."
  if (assessment) comparison.push(assessment.summary);

  const followed = record.decision.followedProposal;
  const signedAt = formatDateTime(record.decision.signedAt);
  return {
    title: 'Binding decision',
    caseNumber: record.case.number,
    recordSha256: seal.recordSha256,
    boardName,
    issuedFor: `Decision of ${boardName} on case ${record.case.number}, signed ${signedAt}`,
    parties: [
      ['Supplier', orgName(record.case.supplierOrganisationId)],
      ['Farm', `${record.delivery.farm.name} (herd ${record.delivery.farm.herdCode})`],
      ['Plant', orgName(record.case.plantOrganisationId)],
      ['Referee laboratory', orgName(record.case.labOrganisationId)],
      ['Board', boardName],
    ],
    contested: [
      ['Delivery', `${record.delivery.reference}, tanker ${record.delivery.tanker} compartment ${record.delivery.compartment}`],
      ['Collected / received', `${formatDateTime(record.delivery.collectedAt)} / ${formatDateTime(record.delivery.receivedAt)}, ${formatStorageCelsius(record.delivery.receiptTempTenthMilliC)} on receipt`],
      ['Volume', `${new Intl.NumberFormat('en-GB').format(record.delivery.volumeLitres)} l`],
      ['Intake result', `${c4(intake.valueTenthMilliC)} against the limit ${c4(intake.limitTenthMilliC)} (${ruleWords[intake.decisionRule] ?? intake.decisionRule})`],
      ['Intake verdict', `${verdictWords[intake.verdict]}, ${formatDateTime(intake.decidedAt)}`],
      ['Added water charged', `${(intake.addedWaterBasisPoints / 100).toFixed(2)} %`],
      ['Withheld at intake', formatMoney(intake.amountMinor, currency)],
      ['Scheme rules', `version ${record.rules.version}, in force from ${formatDateTime(record.rules.effectiveFrom)}`],
    ],
    laboratories,
    comparison,
    checks: (assessment?.checks ?? []).map((c) => ({ status: statusWords[c.status], detail: c.detail })),
    outcome: decisionOutcomeLabels[record.decision.outcome as keyof typeof decisionOutcomeLabels] ?? record.decision.outcome,
    proposal: assessment
      ? `The decision module proposed ${proposalWords[assessment.outcome] ?? assessment.outcome}; the board ${followed ? 'followed the proposal' : 'departed from it'}.`
      : 'No proposal was recorded.',
    reasons: record.decision.reasons,
    departure: followed ? null : record.decision.departureReason,
    correction: record.decision.supersedes ? `This decision corrects and supersedes the earlier decision ${record.decision.supersedes.id}, sealed as record ${record.decision.supersedes.recordSha256}. Both are kept.` : null,
    settlement: settlement.lines,
    signature: [
      ['Signed by', record.decision.signer.name],
      ['As', `Arbiter, ${boardName}`],
      ['Signed at', signedAt],
      ['Meaning of the signature', record.decision.signatureMeaning],
      ['Identity re-checked', `${record.decision.reauthenticationMethod}, ${formatDateTime(record.decision.reauthenticatedAt)}`],
    ],
    seal: [
      ['Record SHA-256', seal.recordSha256],
      [`${SIGNATURE_ALGORITHM} signature`, seal.recordSignature],
      ['Signing key', seal.signingKeyId],
      ['Verify at', links.verifyUrl],
      ['Public key', links.publicKeyUrl],
      ['Signed message', `"${SIGNED_MESSAGE_PREFIX}" followed by the record SHA-256`],
    ],
    cautions: [
      'The record SHA-256 is the hash of the canonical JSON (RFC 8785) of the whole case record as sealed. The verification page tells whether it belongs to a sealed decision without showing the record.',
      'The proposal of the decision module supports the board, which decides. Local regulations and the supply contract prevail.',
    ],
  };
}
