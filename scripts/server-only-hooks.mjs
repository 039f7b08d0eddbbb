// Command-line scripts run the same server modules as Next.js, outside React Server Components,
// where the 'server-only' marker would throw. Resolve it to an empty module there.
export async function resolve(specifier, context, nextResolve) {
  if (specifier === 'server-only') return { url: 'data:text/javascript,export{}', shortCircuit: true };
  return nextResolve(specifier, context);
}
