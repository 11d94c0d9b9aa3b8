/** Number formats for messages, shared by the analyses and the rule checks (which build on the analyses). */

/** "166.7 A", "1,250 A". */
export function amps(x: number): string {
  const a = Math.abs(x);
  return a >= 1000 ? `${Math.round(x).toLocaleString('en-US')} A` : a >= 100 ? `${x.toFixed(0)} A` : `${x.toFixed(1)} A`;
}
