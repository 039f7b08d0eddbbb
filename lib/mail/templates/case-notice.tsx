import { Button, Text } from '@react-email/components';
import { MailLayout, mailStyles } from './layout';

export type CaseNoticeProps = { greeting: string; headline: string; lines: string[]; url: string; actionLabel: string };

/** One template for every case notice: what happened, what it means for the reader, and the way in. */
export function CaseNoticeMail({ greeting, headline, lines, url, actionLabel }: CaseNoticeProps) {
  return (
    <MailLayout preview={headline}>
      <Text style={mailStyles.paragraph}>{greeting}</Text>
      <Text style={{ ...mailStyles.paragraph, fontWeight: 700 }}>{headline}</Text>
      {lines.map((line) => (
        <Text key={line} style={mailStyles.paragraph}>
          {line}
        </Text>
      ))}
      <Button href={url} style={mailStyles.button}>
        {actionLabel}
      </Button>
      <Text style={mailStyles.small}>{url}</Text>
    </MailLayout>
  );
}
