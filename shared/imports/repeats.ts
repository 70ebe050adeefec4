// Counting instants a file has more than once. The rows of a logger file are in time order almost
// always, so while each instant is later than the one before nothing needs comparing; the instants are
// kept (8 bytes a row) and sorted once at the end only when the file went back in time somewhere.

/** Counts, of the instants added, those an earlier one already had. */
export interface InstantTally {
  add(ms: number): void;
  /** How many added instants repeat an earlier one (0 for a file always moving forward). */
  repeated(): number;
}

/** A tally for one file's good rows. */
export function createInstantTally(): InstantTally {
  let store = new Float64Array(1024);
  let size = 0;
  let ordered = true;
  let last = -Infinity;
  return {
    add(ms) {
      if (ms <= last) ordered = false;
      else last = ms;
      if (size === store.length) {
        const grown = new Float64Array(store.length * 2);
        grown.set(store);
        store = grown;
      }
      store[size++] = ms;
    },
    repeated() {
      if (ordered) return 0;
      const sorted = store.slice(0, size).sort();
      let n = 0;
      for (let i = 1; i < size; i++) if (sorted[i] === sorted[i - 1]) n++;
      return n;
    },
  };
}
