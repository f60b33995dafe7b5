// The instant the end-to-end seed calls "today", and the server's clock when it starts
// (tests/e2e/serve.sh sets REELWRIGHT_NOW for both). Every date a spec computes derives from it.
export const SEED_NOW = new Date(process.env.REELWRIGHT_NOW || '2026-12-01T12:00:00Z');

export const DAY = 86_400_000;
