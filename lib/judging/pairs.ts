/** A report photo as blind pairs see it: which piece and variant it shows, and its light set. */
export type PairPhoto = { id: string; pieceId: string; variantId: string; lightSetKey: string | null };

export type BlindPair = { pairKey: string; pieceId: string; photoAId: string; photoBId: string };

/** The two photo ids in canonical (sorted) order, joined: the same pair whichever side it was shown on. */
export function pairKeyOf(photoX: string, photoY: string): { pairKey: string; photoAId: string; photoBId: string } {
  if (photoX === photoY) throw new RangeError("a pair needs two different photos");
  const [photoAId, photoBId] = photoX < photoY ? [photoX, photoY] : [photoY, photoX];
  return { pairKey: `${photoAId}:${photoBId}`, photoAId, photoBId };
}

/**
 * Every pair a judge may be shown: two photos of the same piece from two different variants.
 * Photos that carry a light-set key are paired only with photos of the same light set (same
 * lighting, so only the print differs); a piece whose photos allow no such pair falls back to
 * every cross-variant pair of that piece rather than dropping out.
 */
export function candidatePairs(photos: readonly PairPhoto[]): BlindPair[] {
  const byPiece = new Map<string, PairPhoto[]>();
  for (const photo of photos) byPiece.set(photo.pieceId, [...(byPiece.get(photo.pieceId) ?? []), photo]);
  const pairs: BlindPair[] = [];
  for (const [pieceId, list] of byPiece) {
    const sorted = [...list].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
    const crossVariant: BlindPair[] = [];
    const sameLight: BlindPair[] = [];
    for (let i = 0; i < sorted.length; i++) {
      for (let j = i + 1; j < sorted.length; j++) {
        const a = sorted[i] as PairPhoto;
        const b = sorted[j] as PairPhoto;
        if (a.variantId === b.variantId) continue;
        const pair = { pieceId, ...pairKeyOf(a.id, b.id) };
        crossVariant.push(pair);
        if (a.lightSetKey === b.lightSetKey) sameLight.push(pair);
      }
    }
    pairs.push(...(sameLight.length > 0 ? sameLight : crossVariant));
  }
  return pairs;
}

/**
 * The next pair for one judge: one they have not judged, among those with the fewest votes so
 * far (so every pair, and so every variant, gathers comparisons evenly), chosen at random; and a
 * random side for each photo. Undefined when the judge has seen them all.
 */
export function chooseNextPair(
  pairs: readonly BlindPair[],
  judgedByMe: ReadonlySet<string>,
  votesPerPair: ReadonlyMap<string, number>,
  random: () => number,
): { pair: BlindPair; leftPhotoId: string; rightPhotoId: string } | undefined {
  const open = pairs.filter((pair) => !judgedByMe.has(pair.pairKey));
  if (open.length === 0) return undefined;
  const fewest = Math.min(...open.map((pair) => votesPerPair.get(pair.pairKey) ?? 0));
  const least = open.filter((pair) => (votesPerPair.get(pair.pairKey) ?? 0) === fewest);
  const pair = least[Math.floor(random() * least.length)] ?? (least[0] as BlindPair);
  const swap = random() < 0.5;
  return { pair, leftPhotoId: swap ? pair.photoBId : pair.photoAId, rightPhotoId: swap ? pair.photoAId : pair.photoBId };
}
