"use client";

import { useState } from "react";
import { pairPhotos, type SlotPhoto } from "@/lib/reports/photos";
import { uploadThumbnailUrl, uploadUrl } from "@/lib/uploads/api";

type Photo = SlotPhoto & { widthPx: number | null; heightPx: number | null };
type Named = { id: string; name: string };

/** The same piece printed as two variants, side by side; same-light shots are paired first. */
export function PhotoComparison({
  pieces,
  variants,
  photos,
  defaultLeft,
  defaultRight,
}: {
  pieces: Named[];
  variants: Named[];
  photos: Photo[];
  defaultLeft: string;
  defaultRight: string;
}) {
  const [left, setLeft] = useState(defaultLeft);
  const [right, setRight] = useState(defaultRight);
  const withPhotos = pieces.filter((piece) => photos.some((photo) => photo.pieceId === piece.id));
  const nameOf = (id: string) => variants.find((variant) => variant.id === id)?.name ?? "";

  if (withPhotos.length === 0) return <p className="text-muted">No photos in this report yet.</p>;

  return (
    <div className="flex max-w-4xl flex-col gap-4">
      <div className="flex flex-wrap gap-4 text-sm">
        <VariantPicker label="Left" value={left} onChange={setLeft} variants={variants} />
        <VariantPicker label="Right" value={right} onChange={setRight} variants={variants} />
      </div>
      {withPhotos.map((piece) => {
        const pairs = pairPhotos(photos, piece.id, left, right);
        return (
          <section key={piece.id} className="flex flex-col gap-2" aria-label={piece.name}>
            <h3 className="font-semibold">{piece.name}</h3>
            {pairs.length === 0 ? (
              <p className="text-sm text-muted">No photos of this piece for these two variants.</p>
            ) : (
              pairs.map((pair, i) => (
                <div key={i} className="grid grid-cols-2 gap-3">
                  <Shot photo={pair.left} variantName={nameOf(left)} pieceName={piece.name} />
                  <Shot photo={pair.right} variantName={nameOf(right)} pieceName={piece.name} />
                  {pair.lightSetKey ? <p className="col-span-2 -mt-1 text-xs text-muted">Same light: {pair.lightSetKey}</p> : null}
                </div>
              ))
            )}
          </section>
        );
      })}
    </div>
  );
}

function VariantPicker({ label, value, onChange, variants }: { label: string; value: string; onChange: (id: string) => void; variants: Named[] }) {
  return (
    <label className="flex items-center gap-2">
      <span className="font-medium">{label}</span>
      <select value={value} onChange={(e) => onChange(e.target.value)} className="rounded-md border border-line px-2 py-1">
        {variants.map((variant) => (
          <option key={variant.id} value={variant.id}>
            {variant.name}
          </option>
        ))}
      </select>
    </label>
  );
}

function Shot({ photo, variantName, pieceName }: { photo: Photo | null; variantName: string; pieceName: string }) {
  if (!photo) return <div className="flex aspect-[4/3] items-center justify-center rounded-lg border border-dashed border-line text-xs text-muted">No photo</div>;
  return (
    <figure className="flex flex-col gap-1">
      <a href={uploadUrl(photo.uploadId)} target="_blank" rel="noopener">
        {/* eslint-disable-next-line @next/next/no-img-element -- our own upload route serves cleaned, sized images */}
        <img
          src={uploadThumbnailUrl(photo.uploadId)}
          alt={photo.caption || `${pieceName}, ${variantName}`}
          width={photo.widthPx ?? undefined}
          height={photo.heightPx ?? undefined}
          loading="lazy"
          className="h-auto w-full rounded-lg border border-line bg-slate-soft object-contain"
        />
      </a>
      <figcaption className="text-xs">
        <strong>{variantName}</strong>
        {photo.caption ? ` — ${photo.caption}` : ""}
      </figcaption>
    </figure>
  );
}
