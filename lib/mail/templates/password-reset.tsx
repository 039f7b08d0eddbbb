import { Button, Text } from '@react-email/components';
import { MailLayout, mailStyles } from './layout';

export function PasswordResetMail({ name, url }: { name: string; url: string }) {
  return (
    <MailLayout preview="Reset your Countersample password">
      <Text style={mailStyles.paragraph}>Hello {name},</Text>
      <Text style={mailStyles.paragraph}>Someone asked to reset the password of your Countersample account.</Text>
      <Button href={url} style={mailStyles.button}>
        Choose a new password
      </Button>
      <Text style={mailStyles.small}>
        The link works for one hour. Resetting signs you out everywhere. If you did not ask for this, ignore this message: your
        password stays as it is.
      </Text>
      <Text style={mailStyles.small}>{url}</Text>
    </MailLayout>
  );
}
