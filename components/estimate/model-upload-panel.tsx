"use client";

import { useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { ProgressBar } from "@/components/ui/progress-bar";
import { MATERIAL_IDS } from "@/lib/estimate/materials";
import { MODEL_UPLOAD_LIMIT_BYTES, MODEL_UPLOAD_LIMIT_MESSAGE, type ModelAnalysis } from "@/lib/validation/model-analysis";
import { Field, inputClass, numberInputClass } from "./field";
import { LayerChart } from "./layer-chart";
import { formatDuration, MeshHealth } from "./mesh-health";
import { uploadWithProgress, type UploadProgress } from "./upload-with-progress";

type ErrorBody = { error?: { message?: string; fields?: Record<string, string> } };

const number = (value: number, digits: number) => value.toLocaleString("en-US", { maximumFractionDigits: digits });

/** Measures an uploaded STL or 3MF: volume, area, closedness, slices, filament and print time. */
export function ModelUploadPanel() {
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const [result, setResult] = useState<ModelAnalysis | null>(null);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [banner, setBanner] = useState<string | null>(null);
  const abort = useRef<AbortController | null>(null);

  async function submit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const file = form.get("file");
    setErrors({});
    setBanner(null);
    if (!(file instanceof File) || file.size === 0) {
      setErrors({ file: file instanceof File && file.name ? "That file is empty." : "Choose an STL or 3MF file to analyse." });
      return;
    }
    if (file.size > MODEL_UPLOAD_LIMIT_BYTES) {
      setErrors({ file: MODEL_UPLOAD_LIMIT_MESSAGE });
      return;
    }
    abort.current?.abort();
    abort.current = new AbortController();
    setProgress({ phase: "uploading", fraction: 0 });
    try {
      const response = await uploadWithProgress("/api/models/analyze", form, setProgress, abort.current.signal);
      if (response.status === 200) {
        setResult(response.body as ModelAnalysis);
      } else {
        const body = response.body as ErrorBody | null;
        setErrors(body?.error?.fields ?? {});
        setBanner(body?.error?.message ?? `The server answered ${response.status}.`);
      }
    } catch (error) {
      if (!(error instanceof DOMException && error.name === "AbortError")) setBanner((error as Error).message);
    } finally {
      setProgress(null);
    }
  }

  const busy = progress !== null;
  return (
    <section id="model-upload" aria-labelledby="model-upload-heading" className="scroll-mt-6">
      <Card className="flex flex-col gap-5">
        <div>
          <h2 id="model-upload-heading" className="text-xl font-semibold">Measure a model file</h2>
          <p className="text-sm text-muted">
            Upload an STL or 3MF (at most 64 MB). Proofbay checks the mesh, slices it at your layer height and estimates filament
            and print time; use the grams above as a piece&apos;s filament.
          </p>
        </div>
        <form onSubmit={submit} className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4" noValidate>
          <Field id="model-file" label="Model file (STL or 3MF)" error={errors.file} className="sm:col-span-2 lg:col-span-4">
            {(control) => <input {...control} name="file" type="file" accept=".stl,.3mf,model/stl,model/3mf" className={inputClass} />}
          </Field>
          <Field id="model-layer" label="Layer height (mm)" error={errors.layerHeightMm}>
            {(control) => <input {...control} name="layerHeightMm" type="number" step="0.01" min="0.04" max="1" defaultValue="0.2" className={numberInputClass} />}
          </Field>
          <Field id="model-scale" label="Scale (%)" error={errors.scalePercent}>
            {(control) => <input {...control} name="scalePercent" type="number" step="1" min="1" max="1000" defaultValue="100" className={numberInputClass} />}
          </Field>
          <Field id="model-infill" label="Infill (%)" error={errors.infillPercent}>
            {(control) => <input {...control} name="infillPercent" type="number" step="1" min="0" max="100" defaultValue="15" className={numberInputClass} />}
          </Field>
          <Field id="model-material" label="Material" error={errors.material}>
            {(control) => (
              <select {...control} name="material" defaultValue="PLA" className={inputClass}>
                {MATERIAL_IDS.map((id) => (
                  <option key={id} value={id}>{id}</option>
                ))}
              </select>
            )}
          </Field>
          <div className="flex items-center gap-3 sm:col-span-2 lg:col-span-4">
            <Button type="submit" disabled={busy}>{busy ? "Working…" : "Measure"}</Button>
            {busy ? (
              <div className="flex min-w-0 flex-1 flex-col gap-1" aria-live="polite">
                <ProgressBar
                  percent={progress.phase === "uploading" ? progress.fraction * 100 : 100}
                  label={progress.phase === "uploading" ? "Upload progress" : "Measuring the mesh"}
                />
                <span className="text-xs text-muted">
                  {progress.phase === "uploading" ? `Uploading… ${Math.round(progress.fraction * 100)} %` : "Uploaded — measuring the mesh…"}
                </span>
              </div>
            ) : null}
          </div>
        </form>
        {banner ? <p role="alert" className="rounded-md bg-rose-soft p-3 text-sm text-rose">{banner}</p> : null}
        {result ? <ModelResult result={result} /> : null}
      </Card>
    </section>
  );
}

function ModelResult({ result }: { result: ModelAnalysis }) {
  const [x, y, z] = result.boundingBox.sizeMm;
  const facts: [string, string][] = [
    ["Format", `${result.format.toUpperCase()}, ${number(result.triangleCount, 0)} triangles`],
    ["Size", `${number(x, 1)} × ${number(y, 1)} × ${number(z, 1)} mm`],
    ["Volume", `${number(result.volumeMm3 / 1000, 2)} cm³`],
    ["Surface", `${number(result.surfaceAreaMm2 / 100, 1)} cm²`],
    ["Layers", `${result.layers.count} at ${result.layers.heightMm} mm`],
    ["Printed volume", `${number(result.extrusion.totalVolumeMm3 / 1000, 2)} cm³ (walls + infill)`],
    ["Filament", `${number(result.filament.grams, 1)} g · ${number(result.filament.metres, 2)} m of ${result.filament.diameterMm} mm`],
    ["Print time", `${formatDuration(result.printTime.seconds)} at ${number(result.printTime.averageFlowMm3PerS, 1)} mm³/s average`],
  ];
  return (
    <div className="flex flex-col gap-4" aria-live="polite">
      <h3 className="text-base font-semibold">{result.file.name}</h3>
      <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2">
        {facts.map(([label, value]) => (
          <div key={label} className="flex justify-between gap-3 border-b border-line py-1">
            <dt className="text-muted">{label}</dt>
            <dd className="text-right font-mono">{value}</dd>
          </div>
        ))}
      </dl>
      <MeshHealth analysis={result} />
      {result.printTime.layersAtMinimumTime > 0 ? (
        <p className="text-xs text-muted">
          {result.printTime.layersAtMinimumTime} small layers are held to the {result.printTime.minLayerTimeSeconds} s minimum layer time so
          they can cool.
        </p>
      ) : null}
      {result.layers.series.length > 1 ? <LayerChart series={result.layers.series} /> : null}
    </div>
  );
}
