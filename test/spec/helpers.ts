import { problemsOf as problemsThrownBy } from '../helpers.js';

/** The problems of the InputError thrown by fn (fails the test when nothing is thrown). */
export const problemsOf = (fn: () => unknown): readonly string[] => problemsThrownBy(fn, true);

/** A valid grid sweep file to derive bad files from by small edits. */
export const BASE_YAML = `name: t
axes:
  tp_c: { from: 1280, to: 1420, step: 20 }
  water_ppm: { values: [0, 50, 100, 200] }
design: { kind: grid }
`;
