import type { SchemeRules } from '@/lib/rules/schema';
import type { RulesPath } from './rules-fields';

export type FieldExplanation = { label: string; unit?: string; help: string; options?: Record<string, string> };

/**
 * What each field of the scheme's rules means, for the people who set them. Typed by the rules'
 * own paths, so a field added to the rules does not compile until it is explained here.
 */
export const rulesExplained: Record<RulesPath, FieldExplanation> = {
  name: { label: 'Scheme name', help: 'Shown on every result, notice and decision.' },
  currency: { label: 'Currency', help: 'Three-letter code (EUR, GBP, CHF…) of prices, deductions and fees.' },
  'display.scale': {
    label: 'Scale shown',
    help: 'Temperatures are stored in °C; a scheme that works in degrees Hortvet can show them in °H as well.',
    options: { celsius: 'Degrees Celsius (°C)', hortvet: 'Degrees Hortvet (°H)' },
  },
  'display.hortvetConversion': {
    label: 'Hortvet conversion',
    help: 'Two conversions are in use and differ by about 2 m°C near −0.525 °H; the scheme says which it means.',
    options: { factor: '°C = 0.9658 × °H (trade factor)', sucrose_line: 'Line through the sucrose standards (AOAC 961.07)' },
  },
  'limits.upper': {
    label: 'Upper limit',
    unit: '°C',
    help: 'A freezing point warmer (closer to 0) than this points to added water. Examples in use: −0.520, −0.515, −0.512 °C; the supply contract and local regulations set it.',
  },
  'limits.lower': {
    label: 'Lower limit (optional)',
    unit: '°C',
    help: 'A freezing point colder than this points to added solutes (salt, sugar, neutralisers); such a load is rejected. Leave empty for none.',
  },
  'precision.r': { label: 'Repeatability limit r', unit: '°C', help: 'Two readings of one sample in one laboratory agree when they differ by no more than r; otherwise two more are taken. ISO 5764: 0.004 °C.' },
  'precision.R': { label: 'Reproducibility limit R', unit: '°C', help: 'The spread expected between laboratories; it sets the guard band and the critical difference. ISO 5764: 0.006 °C. Not below r.' },
  decisionRule: {
    label: 'Decision rule',
    help: 'How a result near the limit is judged. A penalty is a decision against the supplier; official control usually gives the benefit of the doubt (guarded rejection).',
    options: {
      simple: 'Simple acceptance: the limit itself (shared risk)',
      guarded_rejection: 'Guarded rejection: beyond the limit by a guard band (protects the supplier)',
      guarded_acceptance: 'Guarded acceptance: inside the limit by a guard band (protects the buyer)',
    },
  },
  onDisagreement: {
    label: 'When the laboratories disagree',
    help: 'What happens when the intake and referee results differ by more than the critical difference.',
    options: { third_laboratory: 'A third laboratory tests a further sample (ISO 4259)', referee_decides: 'The referee laboratory’s result stands' },
  },
  referenceFreezingPoint: { label: 'Reference freezing point', unit: '°C', help: 'The authentic milk the added-water estimate is measured against: W = (T − T′)/T × 100 on the depressions.' },
  adjustThresholdPercent: { label: 'Adjust threshold', unit: '%', help: 'The smallest difference in added water for which the board’s proposal is to adjust a deduction rather than uphold or reverse it.' },
  rejectionAddedWaterPercent: { label: 'Rejection from added water', unit: '%', help: 'Beyond the upper limit, a load with at least this much added water is rejected; with less, it is paid with a deduction.' },
  'calibration.nominal': { label: 'Check standard', unit: '°C', help: 'Freezing point of the sodium chloride standard the routine check uses (−0.512 °C is common), within ISO 5764 Table 1.' },
  'calibration.readings': { label: 'Readings per check', help: 'How many readings are taken on the standard at each check.' },
  'calibration.tolerance': { label: 'Check tolerance', unit: '°C', help: 'A reading counts when it lies within this distance of the standard (±0.004 °C is common).' },
  'calibration.required': { label: 'Readings within tolerance', help: 'The instrument is fit for work when at least this many readings lie within the tolerance (3 of 5 is common). Not more than the readings taken.' },
  'calibration.validHours': { label: 'Check valid for', unit: 'hours', help: 'How long a passing check keeps the instrument fit for intake tests.' },
  'calibration.allowUnfitWithWarning': {
    label: 'Allow results on an unfit instrument, with a warning',
    help: 'When ticked, an intake test on an instrument without a passing check in force is recorded with a warning the supplier and the board see. When clear, it is refused.',
  },
  'sample.validHours': { label: 'Sample valid for', unit: 'hours', help: 'How long after sampling the retained sample may be retested (ISO 5764: 48 h at 0–6 °C; longer only if the scheme has validated it for preserved samples).' },
  'sample.storageRange.min': { label: 'Storage from', unit: '°C', help: 'Coldest temperature the retained sample may be kept at. A frozen sample is no longer valid.' },
  'sample.storageRange.max': { label: 'Storage up to', unit: '°C', help: 'Warmest temperature the retained sample may be kept at (ISO 5764: 6 °C).' },
  'deadlines.contestHours': { label: 'Contest window', unit: 'hours', help: 'How long after being told of a rejection or deduction the supplier may open a dispute (24 h is common).' },
  'deadlines.dispatchHours': { label: 'Dispatch of the retained sample', unit: 'hours', help: 'How soon after a dispute is opened the plant sends the sealed sample to the referee laboratory.' },
  'deadlines.decisionWorkingDays': { label: 'Decision due', unit: 'working days', help: 'How soon after the retest the board decides.' },
  'money.milkPricePerLitre': { label: 'Milk price', unit: 'per litre', help: 'A rejected load is valued at volume × this price.' },
  'money.deduction': { label: 'Deduction', help: 'How a load beyond the upper limit but below the rejection share is paid less.', options: { added_water_share: 'The added-water share of the volume, at the milk price' } },
  'money.refereeFee': { label: 'Referee fee', help: 'The referee laboratory’s fee for a retest, in the scheme’s currency.' },
  'money.feeBorneBy': {
    label: 'Who bears the referee fee',
    help: 'Settled in the board’s decision.',
    options: { losing_party: 'The party that loses the dispute', plant: 'Always the plant', supplier: 'Always the supplier' },
  },
};

export type RulesGroup = 'scheme' | 'limits' | 'precision' | 'calibration' | 'sample' | 'deadlines' | 'money';

export const groupTitles: Record<RulesGroup, string> = {
  scheme: 'The scheme',
  limits: 'Limits and decision rule',
  precision: 'Method precision and disagreement',
  calibration: 'Calibration of instruments',
  sample: 'Retained samples',
  deadlines: 'Deadlines',
  money: 'Money',
};

/** Which group of the form each part of the rules belongs to. */
export const groupOf: Record<keyof SchemeRules, RulesGroup> = {
  name: 'scheme',
  currency: 'scheme',
  display: 'scheme',
  limits: 'limits',
  decisionRule: 'limits',
  referenceFreezingPoint: 'limits',
  rejectionAddedWaterPercent: 'limits',
  adjustThresholdPercent: 'limits',
  precision: 'precision',
  onDisagreement: 'precision',
  calibration: 'calibration',
  sample: 'sample',
  deadlines: 'deadlines',
  money: 'money',
};
