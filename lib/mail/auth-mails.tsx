import 'server-only';
import { sendMail } from './send';
import { InvitationMail, type InvitationMailProps } from './templates/invitation';
import { PasswordResetMail } from './templates/password-reset';

export async function sendPasswordResetMail(input: { to: string; name: string; url: string }) {
  await sendMail({
    to: [input.to],
    subject: 'Reset your Countersample password',
    template: 'password-reset',
    body: <PasswordResetMail name={input.name} url={input.url} />,
  });
}

export async function sendInvitationMail(input: { to: string } & InvitationMailProps) {
  return sendMail({
    to: [input.to],
    subject: `Your invitation to Countersample (${input.organisationName})`,
    template: 'invitation',
    body: <InvitationMail {...input} />,
  });
}
