/**
 * Molecular formula in Hill order (Hill, J. Am. Chem. Soc. 22, 478 (1900)): with carbon, C
 * first, then H, then the other elements alphabetically; without carbon, all elements
 * alphabetically (H included). Counts of 1 are omitted: `CH4`, `C6H6`, `ClH`, `H2O`.
 */
export function hillFormula(symbols: readonly string[]): string {
  const counts = new Map<string, number>();
  for (const s of symbols) counts.set(s, (counts.get(s) ?? 0) + 1);
  const keys = [...counts.keys()].sort();
  const order = counts.has('C') ? ['C', ...(counts.has('H') ? ['H'] : []), ...keys.filter((k) => k !== 'C' && k !== 'H')] : keys;
  return order.map((k) => `${k}${counts.get(k)! > 1 ? counts.get(k) : ''}`).join('');
}
