"use client";

import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { applyCalibrationAction } from "@/app/lab/calibration/actions";
import { Button } from "@/components/ui/button";

export function ApplyCalibrationButton({ printerId, printerName, efficiency, disabled }: { printerId: string; printerName: string; efficiency: number; disabled: boolean }) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [notice, setNotice] = useState<string | null>(null);
  return (
    <div className="flex flex-col gap-1">
      <div>
        <Button
          size="sm"
          disabled={pending || disabled}
          onClick={() =>
            startTransition(async () => {
              const result = await applyCalibrationAction(printerId);
              setNotice(result.ok ? `${printerName} now uses efficiency ${result.data.efficiency} (was ${result.data.previous}), from ${result.data.runs} runs.` : result.message);
              router.refresh();
            })
          }
        >
          {pending ? "Applying…" : `Apply efficiency ${efficiency.toFixed(3)}`}
        </Button>
      </div>
      <p role="status" aria-live="polite" className="text-sm text-moss">
        {notice ?? ""}
      </p>
    </div>
  );
}
