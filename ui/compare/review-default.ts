/**
 * Which version the Review panel opens on: the first one besides the baseline that nobody has signed
 * off or declined yet (what a reader came to decide or discuss), else the first besides the baseline,
 * else the baseline itself.
 */
export function defaultReviewedPosition(columns: readonly { signoff: { decision: string } | null }[], baselinePosition: number): number {
  const others = columns.map((column, index) => ({ column, index })).filter(({ index }) => index !== baselinePosition);
  const undecided = others.find(({ column }) => column.signoff === null);
  return (undecided ?? others[0])?.index ?? baselinePosition;
}
