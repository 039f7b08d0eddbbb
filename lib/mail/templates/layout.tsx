import type { ReactNode } from 'react';
import { Body, Container, Head, Hr, Html, Preview, Section, Text } from '@react-email/components';

const colours = { paper: '#faf7f0', ink: '#16202e', brine: '#4b5a6b', frost: '#0f6f73' };

export function MailLayout({ preview, children }: { preview: string; children: ReactNode }) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={{ backgroundColor: colours.paper, color: colours.ink, fontFamily: 'Merriweather Sans, Arial, sans-serif' }}>
        <Container style={{ maxWidth: 560, padding: '24px 16px' }}>
          <Text style={{ fontSize: 18, fontWeight: 700, margin: 0 }}>Countersample</Text>
          <Hr style={{ borderColor: colours.brine }} />
          <Section>{children}</Section>
          <Hr style={{ borderColor: colours.brine }} />
          <Text style={{ fontSize: 12, color: colours.brine }}>
            You receive this message because you take part in a milk-quality scheme managed with Countersample.
          </Text>
        </Container>
      </Body>
    </Html>
  );
}

export const mailStyles = {
  paragraph: { fontSize: 15, lineHeight: '22px' },
  button: {
    backgroundColor: colours.frost,
    color: '#ffffff',
    padding: '10px 16px',
    borderRadius: 6,
    fontWeight: 700,
    textDecoration: 'none',
  },
  small: { fontSize: 12, color: colours.brine },
};
