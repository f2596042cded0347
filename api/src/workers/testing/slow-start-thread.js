// Test fixture for the pool: loading this module blocks for 1.5 s (a cold thread on a loaded
// machine), then every job answers at once; it says "started" on the envelope's port like the
// real thread, so the pool's hard limit should count from there and not from the hand-over.
const until = Date.now() + 1500;
while (Date.now() < until) { /* a slow module load */ }
module.exports = function quick(envelope) {
  envelope.started?.postMessage('started');
  return { ok: true, value: 'quick' };
};
