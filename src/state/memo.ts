/**
 * Memoise a function on the identity of its arguments (last call only). Store data is immutable,
 * so "same reference" means "same value" and derived data is recomputed only after a real change.
 * @param fn a pure function
 */
export function memoLast<A extends unknown[], R>(fn: (...args: A) => R): (...args: A) => R {
  let lastArgs: A | null = null;
  let lastResult: R;
  return (...args: A): R => {
    if (lastArgs && lastArgs.length === args.length && lastArgs.every((v, i) => Object.is(v, args[i]))) return lastResult;
    lastResult = fn(...args);
    lastArgs = args;
    return lastResult;
  };
}
