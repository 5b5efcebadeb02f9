/** Smallest and largest value seen in training data: the box a prediction should stay inside. */
export interface ObservedRange {
  minimum: number;
  maximum: number;
}

/** The range of a column of values. Cost: O(n). */
export function observedRange(values: ArrayLike<number>, start = 0, end = values.length): ObservedRange {
  let minimum = Infinity;
  let maximum = -Infinity;
  for (let index = start; index < end; index++) {
    const value = values[index];
    if (value < minimum) minimum = value;
    if (value > maximum) maximum = value;
  }
  return { minimum, maximum };
}
