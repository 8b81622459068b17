/**
 * Ports of the two e2e stacks (E2E_PORT moves both, so two runs can share a machine); each fake
 * inbox sits two above its app, SMTP one above.
 */
const base = Number(process.env.E2E_PORT ?? 3100);
export const plainPort = base;
export const demoPort = base + 10;
