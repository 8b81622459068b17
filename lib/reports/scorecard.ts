import { REPORT_CRITERIA, type CriterionId } from "./criteria";

export type ScoreRow = { pieceId: string | null; variantId: string; criterion: string; score: number; note: string };
export type ScoredVariant = { id: string; name: string; isReference: boolean };

export type ScorecardCell = { score: number; note: string; fromPieces: number } | null;
export type ScorecardLine = { criterion: CriterionId; label: string; cells: Record<string, ScorecardCell> };

/**
 * One line per criterion with one cell per variant. A run-wide score (no piece) is taken as it is;
 * without one, the cell is the mean of that variant's per-piece scores on the criterion. The
 * reference variant is 0 on every criterion by definition.
 */
export function buildScorecard(scores: readonly ScoreRow[], variants: readonly ScoredVariant[]): ScorecardLine[] {
  return REPORT_CRITERIA.map(({ id, label }) => {
    const cells: Record<string, ScorecardCell> = {};
    for (const variant of variants) {
      if (variant.isReference) {
        cells[variant.id] = { score: 0, note: "", fromPieces: 0 };
        continue;
      }
      const mine = scores.filter((row) => row.variantId === variant.id && row.criterion === id);
      const runWide = mine.find((row) => row.pieceId === null);
      if (runWide) {
        cells[variant.id] = { score: runWide.score, note: runWide.note, fromPieces: 0 };
        continue;
      }
      const perPiece = mine.filter((row) => row.pieceId !== null);
      cells[variant.id] =
        perPiece.length === 0
          ? null
          : {
              score: perPiece.reduce((sum, row) => sum + row.score, 0) / perPiece.length,
              note: perPiece.map((row) => row.note).filter(Boolean).join(" · "),
              fromPieces: perPiece.length,
            };
    }
    return { criterion: id, label, cells };
  });
}

/** Chart rows for recharts: one per criterion, one numeric key per non-reference variant (missing cells left out). */
export function scorecardChartData(lines: readonly ScorecardLine[], variants: readonly ScoredVariant[]) {
  const compared = variants.filter((variant) => !variant.isReference);
  return lines.map((line) => {
    const row: Record<string, string | number> = { criterion: line.label };
    for (const variant of compared) {
      const cell = line.cells[variant.id];
      if (cell) row[variant.id] = Math.round(cell.score * 100) / 100;
    }
    return row;
  });
}
