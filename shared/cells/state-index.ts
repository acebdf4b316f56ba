/** The index of a named state variable; a clear error when the model has no such state. */
export function stateIndex(
  stateNames: readonly string[],
  state: string | undefined,
  cellKind: string,
): number {
  if (state === undefined) return 0;
  const index = stateNames.indexOf(state);
  if (index < 0) {
    throw new Error(
      `the ${cellKind} names state '${state}', which the model does not have (it has ${stateNames.join(', ')})`,
    );
  }
  return index;
}
