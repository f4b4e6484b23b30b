/** Categorical labels as integer codes: code i = the i-th distinct label in sorted text order. */

export function labelOrder(labels: readonly string[]): string[] {
  return [...new Set(labels)].sort();
}

export function labelCodes(labels: readonly string[]): Int32Array {
  const map = new Map(labelOrder(labels).map((l, i) => [l, i]));
  return Int32Array.from(labels, (l) => map.get(l)!);
}
