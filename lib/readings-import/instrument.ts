/**
 * The form's instrument that the file's `instrument` cell names: its serial number or its whole
 * label, ignoring case. A name that fits none or several leaves the choice to the user.
 */
export function matchInstrument(named: string | null, options: readonly { id: string; label: string }[]): string | null {
  const wanted = named?.trim().toLowerCase();
  if (!wanted) return null;
  const exact = options.filter((o) => o.label.trim().toLowerCase() === wanted);
  if (exact.length === 1) return exact[0].id;
  const bySerial = options.filter((o) => o.label.toLowerCase().split(/\s+·\s+|\s+/)[0] === wanted);
  return bySerial.length === 1 ? bySerial[0].id : null;
}
