export type SlotPhoto = {
  id: string;
  pieceId: string;
  variantId: string;
  uploadId: string;
  caption: string;
  position: number;
  lightSetKey: string | null;
};

export type PhotoPair<P extends SlotPhoto> = { lightSetKey: string | null; left: P | null; right: P | null };

function byPosition<P extends SlotPhoto>(a: P, b: P): number {
  return a.position - b.position || a.id.localeCompare(b.id);
}

/**
 * Lines up the photos of one piece printed as two variants. Photos that share a light-set key
 * (taken in the same light) sit side by side first, in the order of the left variant's slot;
 * the rest follow pairwise by position, so nothing is left out.
 */
export function pairPhotos<P extends SlotPhoto>(photos: readonly P[], pieceId: string, leftVariantId: string, rightVariantId: string): PhotoPair<P>[] {
  const left = photos.filter((p) => p.pieceId === pieceId && p.variantId === leftVariantId).sort(byPosition);
  const right = photos.filter((p) => p.pieceId === pieceId && p.variantId === rightVariantId).sort(byPosition);
  const usedRight = new Set<string>();
  const pairs: PhotoPair<P>[] = [];
  const unmatchedLeft: P[] = [];
  for (const photo of left) {
    const match = photo.lightSetKey ? right.find((r) => !usedRight.has(r.id) && r.lightSetKey === photo.lightSetKey) : undefined;
    if (match) {
      usedRight.add(match.id);
      pairs.push({ lightSetKey: photo.lightSetKey, left: photo, right: match });
    } else {
      unmatchedLeft.push(photo);
    }
  }
  const unmatchedRight = right.filter((r) => !usedRight.has(r.id));
  for (let i = 0; i < Math.max(unmatchedLeft.length, unmatchedRight.length); i++) {
    pairs.push({ lightSetKey: null, left: unmatchedLeft[i] ?? null, right: unmatchedRight[i] ?? null });
  }
  return pairs;
}

/** Renumbers positions 0…n−1 within each piece × variant slot, keeping the given order. */
export function normalisePositions<P extends Omit<SlotPhoto, "id" | "position">>(photos: readonly P[]): (P & { position: number })[] {
  const next = new Map<string, number>();
  return photos.map((photo) => {
    const slot = `${photo.pieceId}|${photo.variantId}`;
    const position = next.get(slot) ?? 0;
    next.set(slot, position + 1);
    return { ...photo, position };
  });
}
