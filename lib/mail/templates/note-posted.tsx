import { Button, Section, Text } from '@react-email/components';
import { MailLayout, mailStyles } from './layout';

export type NotePostedProps = { caseNumber: string; authorName: string; organisationName: string; isReply: boolean; excerpt: string; url: string };

/**
 * A shared note, told to the other parties. The words go in as plain text only (React escapes
 * them), so nothing typed into a note can become markup or a link in anyone's mail.
 */
export function NotePostedMail({ caseNumber, authorName, organisationName, isReply, excerpt, url }: NotePostedProps) {
  const headline = `${authorName} of ${organisationName} ${isReply ? 'replied in a thread' : 'wrote a note'} on ${caseNumber}.`;
  return (
    <MailLayout preview={headline}>
      <Text style={mailStyles.paragraph}>Hello,</Text>
      <Text style={{ ...mailStyles.paragraph, fontWeight: 700 }}>{headline}</Text>
      <Section style={{ borderLeft: '3px solid #4b5a6b', paddingLeft: 12 }}>
        {excerpt.split('\n').map((line, i) => (
          <Text key={i} style={{ ...mailStyles.paragraph, margin: '4px 0', whiteSpace: 'pre-wrap' }}>
            {line || '\u00a0'}
          </Text>
        ))}
      </Section>
      <Text style={mailStyles.paragraph}>Every party to the case can read this note. Answer it on the case file rather than by replying to this message.</Text>
      <Button href={url} style={mailStyles.button}>
        Open the notes of {caseNumber}
      </Button>
      <Text style={mailStyles.small}>{url}</Text>
    </MailLayout>
  );
}
