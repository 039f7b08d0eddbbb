import 'server-only';
import path from 'node:path';
import { Font, renderToBuffer } from '@react-pdf/renderer';
import { createHash } from 'node:crypto';
import type { SealedRecord } from '../record';
import { letterContent, type LetterLinks, type Seal } from './content';
import { DecisionLetter, LETTER_FONT_FAMILIES } from './document';

const globalForFonts = globalThis as unknown as { __countersampleLetterFonts?: boolean };

/**
 * The product's own typeface, self-hosted: the fontsource package ships only web subsets, and the
 * PDF library reads .woff, so the Latin and the extended Latin subsets become two families that the
 * letter lists in turn. Paths are built at run time: a bundler must not try to resolve them.
 */
function registerFonts(): void {
  if (globalForFonts.__countersampleLetterFonts) return;
  const file = (subset: 'latin' | 'latin-ext', weight: 400 | 700) =>
    path.join(process.cwd(), 'node_modules', '@fontsource', 'merriweather-sans', 'files', `merriweather-sans-${subset}-${weight}-normal.woff`);
  const [latin, extended] = LETTER_FONT_FAMILIES;
  Font.register({ family: latin, fonts: [{ src: file('latin', 400), fontWeight: 400 }, { src: file('latin', 700), fontWeight: 700 }] });
  Font.register({ family: extended, fonts: [{ src: file('latin-ext', 400), fontWeight: 400 }, { src: file('latin-ext', 700), fontWeight: 700 }] });
  // A hash or a name must never come out of the letter with a hyphen inside it.
  Font.registerHyphenationCallback((word) => [word]);
  globalForFonts.__countersampleLetterFonts = true;
}

export type RenderedLetter = { pdf: Buffer; sha256: string; fileName: string };

/** The decision letter as a PDF. Deterministic: the same record, seal and links give the same bytes. */
export async function renderDecisionLetter(record: SealedRecord, seal: Seal, links: LetterLinks): Promise<RenderedLetter> {
  registerFonts();
  const content = letterContent(record, seal, links);
  const pdf = await renderToBuffer(<DecisionLetter content={content} signedAt={new Date(record.decision.signedAt)} />);
  return { pdf, sha256: createHash('sha256').update(pdf).digest('hex'), fileName: `${record.case.number}-decision-${record.decision.id.slice(0, 8)}.pdf` };
}
