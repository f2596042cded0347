// Test fixture for the pool: seed -1 answers at once, seed -2 allocates until the heap limit
// kills the thread, anything else spins forever ignoring every signal (a solver that never stops).
// It says "started" on the envelope's port like the real thread, so the hard limit runs.
module.exports = function spin(envelope) {
  envelope.started?.postMessage('started');
  const task = envelope.job.task ?? {};
  if (envelope.job.kind === 'ping' || task.seed === -1) return { ok: true, value: 'quick' };
  if (task.seed === -2) {
    const hold = [];
    for (;;) hold.push(new Array(1e5).fill(Math.random()));
  }
  for (;;) { /* spin */ }
};
