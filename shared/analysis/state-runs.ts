export interface StateRun {
  state: number;
  /** First frame. */
  start: number;
  /** One past the last frame. */
  end: number;
}

export function stateRuns(states: ArrayLike<number>): StateRun[] {
  const runs: StateRun[] = [];
  let start = 0;
  for (let t = 1; t <= states.length; t++) {
    if (t === states.length || states[t] !== states[start]) {
      runs.push({ state: states[start], start, end: t });
      start = t;
    }
  }
  return runs;
}
