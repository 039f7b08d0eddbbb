import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { deliverBatch, type BatchMessage } from '@/lib/mail/deliver-batch';
import { startMailCatcher, type MailCatcher } from '@/lib/mail/catcher';

let catcher: MailCatcher;
const from = 'Countersample <no-reply@countersample.test>';

beforeAll(async () => {
  catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
});
afterAll(() => catcher.close());

const notice = (id: string, headline: string): BatchMessage => ({
  id,
  to: ['desk@plant.test'],
  subject: `CS-2026-0007: ${headline}`,
  template: 'case-dispatched',
  html: null,
  text: null,
  content: { layout: 'case-notice', props: { greeting: 'Hello,', headline, lines: ['Seal number S-1001.'], url: 'http://localhost/cases/x', actionLabel: 'Open CS-2026-0007' } },
});

/** A port nothing listens on: taken, then released. */
async function closedPort(): Promise<number> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as net.AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

describe('deliverBatch', () => {
  it('renders what is not rendered yet, sends what is, and keeps the order of the batch', async () => {
    catcher.messages.length = 0;
    const prerendered: BatchMessage = { id: 'b', to: ['board@board.test'], subject: 'CS-2026-0007: kept as written', template: 'note-posted', html: '<p>Kept as written</p>', text: 'Kept as written', content: null };
    const outcomes = await deliverBatch([notice('a', 'The sample is on its way'), prerendered], { smtpUrl: `smtp://127.0.0.1:${catcher.smtpPort}`, from });

    expect(outcomes.map((o) => [o.id, o.status])).toEqual([['a', 'sent'], ['b', 'sent']]);
    expect(catcher.messages[0].html).toContain('The sample is on its way');
    expect(catcher.messages[0].text).toContain('The sample is on its way');
    expect(catcher.messages[1].html).toContain('<p>Kept as written</p>');
    expect(catcher.messages.map((m) => [m.subject, m.template, m.to])).toEqual([
      ['CS-2026-0007: The sample is on its way', 'case-dispatched', ['desk@plant.test']],
      ['CS-2026-0007: kept as written', 'note-posted', ['board@board.test']],
    ]);
    expect(catcher.messages[1].text.trim()).toBe('Kept as written');
  });

  it('fails a message that has nothing to send without holding back the rest', async () => {
    catcher.messages.length = 0;
    const empty: BatchMessage = { ...notice('empty', 'unused'), content: null };
    const outcomes = await deliverBatch([empty, notice('next', 'The retest is in')], { smtpUrl: `smtp://127.0.0.1:${catcher.smtpPort}`, from });

    expect(outcomes[0]).toMatchObject({ id: 'empty', status: 'failed', error: expect.stringContaining('neither rendered parts nor content') });
    // Nothing rendered, nothing kept: the retry of failed mail skips a message without html.
    expect(outcomes[0]).toMatchObject({ html: null, text: null });
    expect(outcomes[1]).toMatchObject({ id: 'next', status: 'sent' });
    expect(catcher.messages.map((m) => m.subject)).toEqual(['CS-2026-0007: The retest is in']);
  });

  it('reports every message as failed when the relay cannot be reached, with its rendered parts kept for the retry', async () => {
    const outcomes = await deliverBatch([notice('a', 'The sample was received'), notice('b', 'The case was withdrawn')], { smtpUrl: `smtp://127.0.0.1:${await closedPort()}`, from });

    const failed = outcomes.map((o) => (o.status === 'failed' ? o : null));
    expect(failed.every((o) => o !== null && /ECONNREFUSED/.test(o.error))).toBe(true);
    expect(failed[0]!.html).toContain('The sample was received');
    expect(failed[1]!.text).toContain('The case was withdrawn');
  });
});
