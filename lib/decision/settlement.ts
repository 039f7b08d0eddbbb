import { formatMoney, minorDigits } from '@/lib/money/minor-units';
import type { BindingOutcome } from './labels';

// The money a binding decision moves, worked out in whole minor units with exact integer arithmetic:
// a deduction is volume × added-water share × price, and a binary float would round some of them
// the wrong way at half a cent. Pure: the same figures are shown in the form, sealed and printed.

export type Party = 'plant' | 'supplier';
export type FeeRule = 'losing_party' | 'plant' | 'supplier';

export type SettlementInput = {
  outcome: BindingOutcome;
  currency: string;
  volumeLitres: number;
  /** Price of milk in major units per litre, as the scheme's rules set it (at most 6 decimals count). */
  pricePerLitre: number;
  intake: { verdict: 'accepted' | 'deducted' | 'rejected'; amountMinor: number; addedWaterBasisPoints: number };
  /** The added water of the accepted value, %, from the decision module; null when there is no accepted value. */
  acceptedAddedWaterPercent: number | null;
  refereeFee: number;
  feeBorneBy: FeeRule;
};

export type Settlement = {
  outcome: BindingOutcome;
  currency: string;
  /** What the plant kept back at intake: a rejected load's value or the deduction. */
  withheldAtIntake: { amountMinor: number; arithmetic: string };
  /** For adjust: the deduction the accepted added water justifies. */
  correctedDeduction: { addedWaterBasisPoints: number; amountMinor: number; arithmetic: string } | null;
  /** What changes hands because of the decision; payer null when nothing does. */
  balance: { amountMinor: number; payer: Party | null; payee: Party | null; arithmetic: string };
  refereeFee: { amountMinor: number; borneBy: Party; rule: FeeRule; reason: string };
  /** The settlement in plain words, for the form, the letter and the mail. */
  lines: string[];
};

export class SettlementError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'SettlementError';
  }
}

const PRICE_DECIMALS = 6;
const litres = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });

/** A non-negative decimal as an exact integer of 10^-decimals. */
function scaled(value: number, decimals: number): bigint {
  if (!Number.isFinite(value) || value < 0) throw new SettlementError(`expected a non-negative amount, got ${value}`);
  const [whole, fraction = ''] = value.toFixed(decimals).split('.');
  return BigInt(whole + fraction.padEnd(decimals, '0'));
}

/** numerator / denominator rounded half up, for non-negative integers. */
function roundHalfUp(numerator: bigint, denominator: bigint): bigint {
  return (numerator * 2n + denominator) / (denominator * 2n);
}

/**
 * volume × basisPoints/10 000 × price, in minor units of the currency, rounded half up once at the end.
 * Without basis points it is the value of the whole load.
 */
export function amountForLoad(volumeLitres: number, pricePerLitre: number, currency: string, addedWaterBasisPoints?: number): number {
  if (!Number.isInteger(volumeLitres) || volumeLitres < 0) throw new SettlementError(`volume must be whole litres, got ${volumeLitres}`);
  const price = scaled(pricePerLitre, PRICE_DECIMALS);
  const minorPerMajor = 10n ** BigInt(minorDigits(currency));
  let numerator = BigInt(volumeLitres) * price * minorPerMajor;
  let denominator = 10n ** BigInt(PRICE_DECIMALS);
  if (addedWaterBasisPoints !== undefined) {
    if (!Number.isInteger(addedWaterBasisPoints) || addedWaterBasisPoints < 0) throw new SettlementError(`added water must be whole basis points, got ${addedWaterBasisPoints}`);
    numerator *= BigInt(addedWaterBasisPoints);
    denominator *= 10_000n;
  }
  return Number(roundHalfUp(numerator, denominator));
}

/** Added water as the product keeps it: hundredths of a percent, none when not indicated. */
export function toBasisPoints(percent: number): number {
  if (!Number.isFinite(percent)) throw new SettlementError(`added water must be a number, got ${percent}`);
  return percent > 0 ? Math.round(percent * 100) : 0;
}

function percentText(basisPoints: number): string {
  return `${(basisPoints / 100).toFixed(2)} %`;
}

function priceText(price: number, currency: string): string {
  // Enough decimals to show the price as the rules hold it, never fewer than the currency's.
  const digits = Math.max(minorDigits(currency), Math.min(PRICE_DECIMALS, (String(price).split('.')[1] ?? '').length));
  return `${price.toFixed(digits)} ${currency}/l`;
}

function withheldAtIntake(input: SettlementInput): Settlement['withheldAtIntake'] {
  const { intake, volumeLitres, pricePerLitre, currency } = input;
  const money = (minor: number) => formatMoney(minor, currency);
  if (intake.verdict === 'accepted') return { amountMinor: intake.amountMinor, arithmetic: `nothing was withheld at intake (${money(intake.amountMinor)})` };
  const recomputed =
    intake.verdict === 'rejected'
      ? amountForLoad(volumeLitres, pricePerLitre, currency)
      : amountForLoad(volumeLitres, pricePerLitre, currency, intake.addedWaterBasisPoints);
  const formula =
    intake.verdict === 'rejected'
      ? `${litres.format(volumeLitres)} l × ${priceText(pricePerLitre, currency)}`
      : `${litres.format(volumeLitres)} l × ${percentText(intake.addedWaterBasisPoints)} × ${priceText(pricePerLitre, currency)}`;
  // What was actually withheld is the intake's recorded amount; a rounding of its own at the time is said, not hidden.
  const arithmetic =
    recomputed === intake.amountMinor ? `${formula} = ${money(intake.amountMinor)}` : `${formula} = ${money(recomputed)}; recorded at intake: ${money(intake.amountMinor)}`;
  return { amountMinor: intake.amountMinor, arithmetic };
}

const partyWords: Record<Party, string> = { plant: 'the plant', supplier: 'the supplier' };

/**
 * The settlement of a binding decision. Uphold: the intake result stands and nothing changes hands.
 * Reverse: the plant pays the supplier what it withheld at intake. Adjust: the deduction is worked
 * out again from the accepted added water, and the difference to what was withheld is owed. The
 * referee laboratory's fee follows the scheme rule; "the losing party" is the supplier when the
 * result is upheld, the plant when it is reversed, and under adjust the party that owes the balance.
 */
export function settlementFor(input: SettlementInput): Settlement {
  const { outcome, currency } = input;
  const money = (minor: number) => formatMoney(minor, currency);
  const withheld = withheldAtIntake(input);

  let correctedDeduction: Settlement['correctedDeduction'] = null;
  let balance: Settlement['balance'];
  if (outcome === 'uphold') {
    balance = { amountMinor: 0, payer: null, payee: null, arithmetic: `The intake result stands: the ${money(withheld.amountMinor)} withheld at intake stays withheld.` };
  } else if (outcome === 'reverse') {
    balance = withheld.amountMinor > 0
      ? { amountMinor: withheld.amountMinor, payer: 'plant', payee: 'supplier', arithmetic: `The intake result is reversed: the plant pays the supplier the ${money(withheld.amountMinor)} withheld at intake.` }
      : { amountMinor: 0, payer: null, payee: null, arithmetic: 'The intake result is reversed; nothing was withheld, so nothing is owed.' };
  } else {
    if (input.acceptedAddedWaterPercent === null) {
      throw new SettlementError('An adjustment needs the accepted value and its added water, and this case has none; order a further test or decide otherwise.');
    }
    const basisPoints = toBasisPoints(input.acceptedAddedWaterPercent);
    const amountMinor = amountForLoad(input.volumeLitres, input.pricePerLitre, currency, basisPoints);
    correctedDeduction = {
      addedWaterBasisPoints: basisPoints,
      amountMinor,
      arithmetic: `${litres.format(input.volumeLitres)} l × ${percentText(basisPoints)} × ${priceText(input.pricePerLitre, currency)} = ${money(amountMinor)}`,
    };
    const difference = withheld.amountMinor - amountMinor;
    const formula = `${money(withheld.amountMinor)} withheld − ${money(amountMinor)} corrected deduction`;
    if (difference > 0) balance = { amountMinor: difference, payer: 'plant', payee: 'supplier', arithmetic: `${formula} = ${money(difference)} owed by the plant to the supplier` };
    else if (difference < 0) balance = { amountMinor: -difference, payer: 'supplier', payee: 'plant', arithmetic: `${money(amountMinor)} corrected deduction − ${money(withheld.amountMinor)} withheld = ${money(-difference)} owed by the supplier to the plant` };
    else balance = { amountMinor: 0, payer: null, payee: null, arithmetic: `${formula} = ${money(0)}: nothing is owed` };
  }

  const losing: Party = outcome === 'uphold' ? 'supplier' : outcome === 'reverse' ? 'plant' : balance.payer ?? 'supplier';
  const borneBy: Party = input.feeBorneBy === 'losing_party' ? losing : input.feeBorneBy;
  const feeMinor = amountForLoad(1, input.refereeFee, currency);
  const reason =
    input.feeBorneBy === 'losing_party'
      ? `scheme rule: the losing party bears the fee; ${outcome === 'adjust' ? `under an adjustment that is the party that owes the balance, ${partyWords[losing]}` : `here ${partyWords[losing]}`}`
      : `scheme rule: ${partyWords[borneBy]} always bears the fee`;

  const lines = [
    `Withheld at intake: ${withheld.arithmetic}.`,
    ...(correctedDeduction ? [`Corrected deduction from the accepted added water: ${correctedDeduction.arithmetic}.`] : []),
    balance.arithmetic.endsWith('.') ? balance.arithmetic : `${balance.arithmetic}.`,
    `Referee laboratory's fee: ${money(feeMinor)}, borne by ${partyWords[borneBy]} (${reason}).`,
  ];
  return { outcome, currency, withheldAtIntake: withheld, correctedDeduction, balance, refereeFee: { amountMinor: feeMinor, borneBy, rule: input.feeBorneBy, reason }, lines };
}
