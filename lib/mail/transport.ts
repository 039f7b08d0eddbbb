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

export function resetMailTransport(): void {
  globalForMail.__countersampleMailTransport?.close();
  globalForMail.__countersampleMailTransport = undefined;
}
