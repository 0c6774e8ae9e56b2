/**
 * Two spectra on one frequency axis for an overlay chart. Runs captured at different sample rates or record
 * lengths have different bins, so the axis is the union of both, and each spectrum is null where it has no point
 * (the chart joins its own points across those gaps). Pure: no I/O.
 */

export interface SpectrumPoints {
  frequencyHz: readonly number[];
  levels: readonly number[];
}

export interface AlignedSpectra {
  frequencyHz: number[];
  a: (number | null)[];
  b: (number | null)[];
}

function check(s: SpectrumPoints, name: string): void {
  if (s.frequencyHz.length !== s.levels.length) {
    throw new RangeError(`spectrum ${name} needs one level per frequency; got ${s.frequencyHz.length} frequencies and ${s.levels.length} levels`);
  }
  for (let i = 1; i < s.frequencyHz.length; i++) {
    if (!(s.frequencyHz[i] > s.frequencyHz[i - 1])) {
      throw new RangeError(`spectrum ${name} frequencies must rise strictly; got ${s.frequencyHz[i - 1]} then ${s.frequencyHz[i]} Hz at index ${i}`);
    }
  }
}

/**
 * Merges two spectra onto the union of their frequencies.
 *
 * @param a - first spectrum, frequencies in Hz rising strictly.
 * @param b - second spectrum, same rule.
 * @returns the merged axis (Hz) and each spectrum's level there, null where it has no point; a frequency both
 *   share appears once with both levels.
 * @throws RangeError when a spectrum's arrays differ in length or its frequencies do not rise.
 */
export function alignSpectra(a: SpectrumPoints, b: SpectrumPoints): AlignedSpectra {
  check(a, "A");
  check(b, "B");
  const out: AlignedSpectra = { frequencyHz: [], a: [], b: [] };
  let i = 0;
  let j = 0;
  while (i < a.frequencyHz.length || j < b.frequencyHz.length) {
    const fa = i < a.frequencyHz.length ? a.frequencyHz[i] : Infinity;
    const fb = j < b.frequencyHz.length ? b.frequencyHz[j] : Infinity;
    if (fa === fb) {
      out.frequencyHz.push(fa);
      out.a.push(a.levels[i++]);
      out.b.push(b.levels[j++]);
    } else if (fa < fb) {
      out.frequencyHz.push(fa);
      out.a.push(a.levels[i++]);
      out.b.push(null);
    } else {
      out.frequencyHz.push(fb);
      out.a.push(null);
      out.b.push(b.levels[j++]);
    }
  }
  return out;
}
