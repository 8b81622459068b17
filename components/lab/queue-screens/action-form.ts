"use client";

import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import type { z } from "zod";
import type { ActionResult } from "@/server/action";

export type FormErrors = { fields: Record<string, string>; message: string | null };
const noErrors: FormErrors = { fields: {}, message: null };

function zodFields(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) fields[issue.path.join(".") || "_"] ??= issue.message;
  return fields;
}

/**
 * Submits values through a server action: checks them first with the same zod schema the server
 * uses (so most mistakes show at once), then shows the server's field errors beside the fields.
 */
export function useActionForm<T>(options: { schema?: z.ZodType; onDone?: (data: T) => void }) {
  const [errors, setErrors] = useState<FormErrors>(noErrors);
  const [pending, startTransition] = useTransition();
  const router = useRouter();

  function submit(values: unknown, action: (values: unknown) => Promise<ActionResult<T>>) {
    if (options.schema) {
      const parsed = options.schema.safeParse(values);
      if (!parsed.success) {
        setErrors({ fields: zodFields(parsed.error), message: "Some fields need fixing; nothing was saved." });
        return;
      }
    }
    startTransition(async () => {
      const result = await action(values);
      if (result.ok) {
        setErrors(noErrors);
        options.onDone?.(result.data);
        router.refresh();
      } else {
        setErrors({ fields: result.fields ?? {}, message: result.message });
      }
    });
  }

  return { errors, pending, submit, reset: () => setErrors(noErrors) };
}

export const formText = (form: FormData, name: string) => String(form.get(name) ?? "");
/** An empty box is undefined (the schema says "enter …"), anything else a number or NaN. */
export const formNumber = (form: FormData, name: string) => {
  const text = formText(form, name).trim().replace(",", ".");
  return text === "" ? undefined : Number(text);
};
