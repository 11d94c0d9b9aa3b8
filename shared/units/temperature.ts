/** Temperature conversions. °C inside; °F at the edges. */

export const cToF = (c: number) => (c * 9) / 5 + 32;
export const fToC = (f: number) => ((f - 32) * 5) / 9;
