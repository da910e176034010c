// Reads frequencies back out of text shown to people (`12.3 MHz`, `850 kHz`, `1.2e6 Hz`), in Hz.
const PREFIX = { T: 1e12, G: 1e9, M: 1e6, k: 1e3, '': 1, m: 1e-3, u: 1e-6, µ: 1e-6 };

/** @param {string} text @returns {number[]} magnitudes in Hz, in the order they appear */
export function hzValuesIn(text) {
  const out = [];
  // A minus written as U+2212 is common in typeset values; magnitudes are what is compared.
  const re = /([-−]?\d+(?:\.\d+)?(?:[eE][-+]?\d+)?)\s*([TGMkmuµ]?)Hz\b/g;
  for (const m of text.matchAll(re)) {
    const mantissa = Number(m[1].replace('−', '-'));
    const scale = PREFIX[m[2] ?? ''];
    if (Number.isFinite(mantissa) && scale !== undefined) out.push(Math.abs(mantissa * scale));
  }
  return out;
}
