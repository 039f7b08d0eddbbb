import { Button, Text } from '@react-email/components';
import { MailLayout, mailStyles } from './layout';

export type InvitationMailProps = { name: string; organisationName: string; roleLabel: string; url: string; expiresAt: string };

export function InvitationMail({ name, organisationName, roleLabel, url, expiresAt }: InvitationMailProps) {
  return (
    <MailLayout preview={`You are invited to Countersample for ${organisationName}`}>
      <Text style={mailStyles.paragraph}>Hello {name},</Text>
      <Text style={mailStyles.paragraph}>
        You have been invited to Countersample as {roleLabel} for {organisationName}. Choose a password to finish setting up
        your account.
      </Text>
      <Button href={url} style={mailStyles.button}>
        Set your password
      </Button>
      <Text style={mailStyles.small}>
        The link works once and until {expiresAt}. If you did not expect this invitation, ignore this message.
      </Text>
      <Text style={mailStyles.small}>{url}</Text>
    </MailLayout>
  );
}
