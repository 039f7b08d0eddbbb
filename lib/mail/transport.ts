import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '@/lib/env';

const globalForMail = globalThis as unknown as { __countersampleMailTransport?: Transporter };

/** The same SMTP transport serves the local catcher and a real relay; only SMTP_URL differs. */
export function mailTransport(): Transporter {
  globalForMail.__countersampleMailTransport ??= nodemailer.createTransport(env().SMTP_URL, {
    from: env().MAIL_FROM,
  });
  return globalForMail.__countersampleMailTransport;
}

/**
 * A transport for one delivery run: one SMTP connection carries the whole batch, instead of one
 * connection per message (relays often hold back their greeting, here and in production). The
 * caller closes it when the run ends, so no idle connection outlives the run.
 */
export function pooledMailTransport(): Transporter {
  const url = new URL(env().SMTP_URL);
  url.searchParams.set('pool', 'true');
  url.searchParams.set('maxConnections', '1');
  return nodemailer.createTransport(url.toString(), { from: env().MAIL_FROM });
}

export function resetMailTransport(): void {
  globalForMail.__countersampleMailTransport?.close();
  globalForMail.__countersampleMailTransport = undefined;
}
