import { BACKUP_ROUTE } from './endpoint';

/** Asks the server that holds the data folder for a snapshot taken inside its own process. */
export async function fetchServerSnapshot(baseUrl: string, token: string, timeoutMs = 120_000): Promise<Buffer> {
  let response: Response;
  try {
    response = await fetch(new URL(BACKUP_ROUTE, baseUrl), { method: 'POST', headers: { authorization: `Bearer ${token}` }, signal: AbortSignal.timeout(timeoutMs) });
  } catch (error) {
    throw new Error(`The server at ${baseUrl} did not answer (${(error as Error).message}). Give its address with --url.`);
  }
  if (!response.ok) {
    const detail = await response.text().then((text) => {
      try {
        return (JSON.parse(text) as { detail?: string }).detail ?? text;
      } catch {
        return text;
      }
    });
    throw new Error(`The server at ${baseUrl} refused the snapshot (${response.status}): ${detail.slice(0, 300)}`);
  }
  if (response.headers.get('content-type') !== 'application/x-tar') throw new Error(`The server at ${baseUrl} did not answer with a database snapshot.`);
  const bytes = Buffer.from(await response.arrayBuffer());
  const declared = Number(response.headers.get('content-length'));
  if (Number.isFinite(declared) && declared > 0 && declared !== bytes.length) throw new Error('The snapshot arrived incomplete.');
  return bytes;
}
