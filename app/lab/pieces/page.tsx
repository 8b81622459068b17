import type { Metadata } from "next";
import { PieceLibrary } from "@/components/lab/piece-library";
import { getDb } from "@/db";
import { libraryPieceUsage, listTestPieces } from "@/db/queries/test-pieces";
import { hasRole } from "@/lib/roles";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Piece library · Lab" };

export default async function LabPiecesPage() {
  const viewer = await requirePageRole("host", "/lab/pieces");
  const db = getDb();
  const usage = libraryPieceUsage(db);
  const pieces = listTestPieces(db, { includeInactive: true }).map((piece) => ({
    id: piece.id,
    name: piece.name,
    description: piece.description,
    filamentGrams: piece.filamentGrams,
    meshUploadId: piece.meshUploadId,
    active: piece.active,
    usedInPlans: usage.get(piece.id) ?? 0,
  }));
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-bold">Piece library</h1>
        <p className="max-w-3xl text-muted">
          The test pieces a plan is built from. Filament is per print, in PLA at reference scale; the plan editor converts it for other
          materials by density, and each plan can adjust it.
        </p>
      </div>
      <PieceLibrary pieces={pieces} canEdit={hasRole(viewer.role, "admin")} />
    </div>
  );
}
