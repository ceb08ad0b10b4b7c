/** How many of the values are finite numbers. */
export function countFinite(values: ArrayLike<number>): number {
  let count = 0;
  for (let index = 0; index < values.length; index++) if (Number.isFinite(values[index])) count++;
  return count;
}

/**
 * Every `step`-th finite value (step 1: all of them), in order, in a typed array: no list grown by
 * pushes, so a million-row column costs one copy. `finite` is countFinite(values) when the caller
 * has it already.
 */
export function finiteValues(values: ArrayLike<number>, step = 1, finite = countFinite(values)): Float64Array {
  const taken = new Float64Array(Math.ceil(finite / step));
  let seen = 0;
  let count = 0;
  for (let index = 0; index < values.length; index++) {
    if (!Number.isFinite(values[index])) continue;
    if (seen % step === 0) taken[count++] = values[index];
    seen++;
  }
  return taken;
}
