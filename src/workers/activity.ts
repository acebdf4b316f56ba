/**
 * Whether the worker pool is running something. Main-thread work that can wait (loading and
 * warming up the chart library) waits until it is not, so it does not land in the middle of a run.
 */
let active = 0;

/** Call when a run starts; call the returned function (once is enough) when it ends. */
export function runStarted(): () => void {
  active += 1;
  let ended = false;
  return () => {
    if (ended) return;
    ended = true;
    active -= 1;
  };
}

export function runsActive(): boolean {
  return active > 0;
}
