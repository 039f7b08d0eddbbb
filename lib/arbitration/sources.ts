import type { DecisionRule, OnDisagreement } from './schema';

// Every check names where its rule comes from. A rule with no published source says so plainly,
// so the arbiter can weigh it as the trade's practice rather than a standard's requirement.
export const PRACTICE = 'common practice, no published source';

export const SOURCES = {
  repeatability: 'ISO 5725-6:1994, 5.2.2 and Table 1',
  // The clause number of the two-laboratory comparison is recalled, not checked against the text.
  criticalDifference: 'ISO 5725-6:1994, 5.3.2 (clause number from memory)',
  thirdLaboratory: 'ISO 4259, clause 10',
  refereeDecides: PRACTICE + ' (the referee result is binding under the scheme)',
  calibration: PRACTICE + ' (k of n readings on a standard of ISO 5764:2009, Table 1)',
  seal: PRACTICE,
  frozen: PRACTICE,
  custody: PRACTICE,
  storage: 'ISO 5764:2009, clause 7',
  sampleAge: 'ISO 5764:2009, clause 7',
  addedWater: PRACTICE + ' (textbook formula; ISO 5764:2009, Annex D: an estimate needs an authentic baseline)',
  adjust: PRACTICE + " (the scheme's adjust threshold)",
} as const;

export function conformitySource(rule: DecisionRule): string {
  if (rule === 'simple') return 'ILAC G8:09/2019, simple acceptance';
  if (rule === 'guarded_rejection') {
    return 'JCGM 106:2012 and ILAC G8:09/2019, guarded rejection; guard band 1.645·u, close to ISO 4259, clause 9 (0.59 R)';
  }
  return 'JCGM 106:2012 and ILAC G8:09/2019, guarded acceptance; guard band 1.645·u';
}

export function comparisonSource(agree: boolean, onDisagreement: OnDisagreement): string {
  if (agree) return SOURCES.criticalDifference;
  return (
    SOURCES.criticalDifference +
    '; on disagreement: ' +
    (onDisagreement === 'third_laboratory' ? SOURCES.thirdLaboratory : SOURCES.refereeDecides)
  );
}

export const RULE_NAMES: Record<DecisionRule, string> = {
  simple: 'simple acceptance',
  guarded_rejection: 'guarded rejection',
  guarded_acceptance: 'guarded acceptance',
};
