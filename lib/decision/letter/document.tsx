import { Document, Page, StyleSheet, Text, View } from '@react-pdf/renderer';
import type { LetterContent } from './content';
import { RECORD_MARKER } from './marker';

// The letter's layout: a calm laboratory document in the product's own type and colours. It only
// places the strings of LetterContent; nothing here computes or formats a value.

// Hashes, signatures and addresses are ASCII and read best in a fixed-width face, one of the fonts every PDF reader has;
// each gets a full line, so none is broken or hyphenated.
const CODE_TERMS = ['Record SHA-256', 'Ed25519 signature', 'Signing key', 'Verify at', 'Public key'];

export const LETTER_FONT_FAMILIES = ['Merriweather Sans', 'Merriweather Sans Ext'];

const ink = '#16202e';
const brine = '#4b5a6b';
const line = '#d9d2c3';
const frost = '#0a5255';

const styles = StyleSheet.create({
  page: { fontFamily: LETTER_FONT_FAMILIES, fontSize: 9, color: ink, paddingTop: 40, paddingBottom: 56, paddingHorizontal: 44 },
  // On the page itself a line height stops the page numbers being drawn (the text made at render time gets no box).
  // It is worked out against the body's own size, 9 pt, and inherited in points: larger text sets its own.
  body: { fontSize: 9, lineHeight: 1.4 },
  eyebrow: { fontSize: 8, color: brine, textTransform: 'uppercase', letterSpacing: 1 },
  // Line heights are set per size: an inherited one would be the body text's, in points, and overlap.
  title: { fontSize: 20, fontWeight: 700, marginTop: 2, lineHeight: 1.25 },
  subtitle: { fontSize: 10, color: brine, marginBottom: 12, lineHeight: 1.3 },
  section: { marginTop: 10, paddingTop: 6, borderTopWidth: 1, borderTopColor: line },
  heading: { fontSize: 11, fontWeight: 700, marginBottom: 4, color: frost },
  row: { flexDirection: 'row', marginBottom: 2 },
  term: { width: 130, color: brine, fontWeight: 700 },
  detail: { flex: 1 },
  tableHead: { flexDirection: 'row', borderBottomWidth: 1, borderBottomColor: line, paddingBottom: 2, marginBottom: 2, color: brine, fontWeight: 700, fontSize: 8 },
  tableRow: { flexDirection: 'row', borderBottomWidth: 0.5, borderBottomColor: line, paddingVertical: 2, fontSize: 8 },
  outcome: { fontSize: 14, fontWeight: 700, marginBottom: 4, lineHeight: 1.3 },
  paragraph: { marginBottom: 3 },
  code: { fontFamily: 'Courier', fontSize: 7.5 },
  footerLeft: { position: 'absolute', bottom: 24, left: 44, fontSize: 7, color: brine },
  // A text drawn at render time has no width of its own to place by: give it one.
  footerRight: { position: 'absolute', bottom: 24, right: 44, width: 120, textAlign: 'right', fontSize: 7, color: brine },
  status: { width: 44, fontWeight: 700 },
});

function Pairs({ items }: { items: [string, string][] }) {
  return (
    <View>
      {items.map(([term, detail]) => (
        <View key={term} style={styles.row} wrap={false}>
          <Text style={styles.term}>{term}</Text>
          <Text style={styles.detail}>{detail}</Text>
        </View>
      ))}
    </View>
  );
}

export function DecisionLetter({ content, signedAt }: { content: LetterContent; signedAt: Date }) {
  return (
    <Document
      title={`${content.caseNumber}: binding decision`}
      author={content.boardName}
      subject={content.issuedFor}
      creator="Countersample"
      producer="Countersample"
      language="en-GB"
      // Fixed to the signing time, so the same sealed record always gives the same file, byte for byte.
      creationDate={signedAt}
      modificationDate={signedAt}
      keywords={`${RECORD_MARKER}${content.recordSha256}`}
    >
      <Page size="A4" style={styles.page}>
        <View style={styles.body}>
          <Text style={styles.eyebrow}>{content.boardName} · decision letter</Text>
          <Text style={styles.title}>
            {content.title} · {content.caseNumber}
          </Text>
          <Text style={styles.subtitle}>{content.issuedFor}</Text>

          <View style={styles.section}>
            <Text style={styles.heading}>Parties</Text>
            <Pairs items={content.parties} />
          </View>

          <View style={styles.section}>
            <Text style={styles.heading}>The contested result</Text>
            <Pairs items={content.contested} />
          </View>

          <View style={styles.section}>
            <Text style={styles.heading}>Both laboratories</Text>
            <View style={styles.tableHead}>
              <Text style={{ width: 100 }}>Laboratory</Text>
              <Text style={{ width: 92 }}>Test</Text>
              <Text style={{ width: 108 }}>Readings</Text>
              <Text style={{ width: 95 }}>Final result</Text>
              <Text style={{ flex: 1 }}>Calibration check</Text>
            </View>
            {content.laboratories.map((lab) => (
              <View key={`${lab.laboratory}-${lab.testedAt}`} style={styles.tableRow} wrap={false}>
                <Text style={{ width: 100, paddingRight: 4 }}>
                  {lab.laboratory}
                  {'\n'}
                  {lab.instrument}
                </Text>
                <Text style={{ width: 92, paddingRight: 4 }}>
                  {lab.purpose}
                  {'\n'}
                  {lab.testedAt}
                </Text>
                <Text style={{ width: 108, paddingRight: 4 }}>{lab.readings}</Text>
                <Text style={{ width: 95, paddingRight: 4 }}>{lab.result}</Text>
                <Text style={{ flex: 1 }}>{lab.calibration}</Text>
              </View>
            ))}
            {content.comparison.map((text) => (
              <Text key={text} style={[styles.paragraph, { marginTop: 3 }]}>
                {text}
              </Text>
            ))}
          </View>

          <View style={styles.section}>
            <Text style={styles.heading}>The checks</Text>
            {content.checks.map((check, index) => (
              <View key={`${index}-${check.detail}`} style={styles.row} wrap={false}>
                <Text style={styles.status}>{check.status}</Text>
                <Text style={styles.detail}>{check.detail}</Text>
              </View>
            ))}
          </View>

          <View style={styles.section} wrap={false}>
            <Text style={styles.heading}>The decision</Text>
            <Text style={styles.outcome}>{content.outcome}</Text>
            <Text style={styles.paragraph}>{content.proposal}</Text>
            {content.departure ? <Text style={styles.paragraph}>Why the board departed from the proposal: {content.departure}</Text> : null}
            <Text style={styles.paragraph}>Reasons: {content.reasons}</Text>
            {content.correction ? <Text style={styles.paragraph}>{content.correction}</Text> : null}
          </View>

          <View style={styles.section} wrap={false}>
            <Text style={styles.heading}>Settlement</Text>
            {content.settlement.map((text) => (
              <Text key={text} style={styles.paragraph}>
                {text}
              </Text>
            ))}
          </View>

          <View style={styles.section} wrap={false}>
            <Text style={styles.heading}>Signature</Text>
            <Pairs items={content.signature} />
          </View>

          <View style={styles.section} wrap={false}>
            <Text style={styles.heading}>Seal and verification</Text>
            {content.seal.map(([term, detail]) => (
              <View key={term} style={{ marginBottom: 3 }} wrap={false}>
                <Text style={{ color: brine, fontWeight: 700, fontSize: 8 }}>{term}</Text>
                <Text style={CODE_TERMS.includes(term) ? styles.code : undefined}>{detail}</Text>
              </View>
            ))}
            {content.cautions.map((text) => (
              <Text key={text} style={[styles.paragraph, { color: brine, marginTop: 3 }]}>
                {text}
              </Text>
            ))}
          </View>

        </View>

        <Text style={styles.footerLeft} fixed>
          {content.caseNumber} · record {content.recordSha256.slice(0, 16)}…
        </Text>
        <Text style={styles.footerRight} fixed render={({ pageNumber, totalPages }) => `page ${pageNumber} of ${totalPages}`} />
      </Page>
    </Document>
  );
}
