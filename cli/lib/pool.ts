/**
 * Runs `work` over `items` with at most `limit` at a time and returns the results in the
 * items' order. `shouldStop` lets a run end early (items not started are left out as undefined).
 */
export async function mapPool<T, R>(items: readonly T[], limit: number, work: (item: T, index: number) => Promise<R>, shouldStop: () => boolean = () => false): Promise<(R | undefined)[]> {
  const results: (R | undefined)[] = new Array(items.length).fill(undefined);
  let next = 0;
  const worker = async () => {
    while (next < items.length && !shouldStop()) {
      const index = next++;
      results[index] = await work(items[index], index);
    }
  };
  await Promise.all(Array.from({ length: Math.max(1, Math.min(limit, items.length)) }, worker));
  return results;
}
