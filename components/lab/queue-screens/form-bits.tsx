import { Field, inputClass, numberInputClass } from "@/components/estimate/field";
import type { FormErrors } from "./action-form";

export { inputClass, numberInputClass };

export function TextInput({ id, name, label, errors, defaultValue, type = "text", hint, numeric, className, step }: {
  id: string;
  name: string;
  label: string;
  errors: FormErrors;
  defaultValue?: string | number;
  type?: string;
  hint?: string;
  numeric?: boolean;
  className?: string;
  step?: string;
}) {
  return (
    <Field id={id} label={label} hint={hint} error={errors.fields[name]} className={className}>
      {(control) => (
        <input {...control} name={name} type={type} step={step} defaultValue={defaultValue} inputMode={numeric ? "decimal" : undefined} className={numeric ? numberInputClass : inputClass} />
      )}
    </Field>
  );
}

export function FormMessage({ errors }: { errors: FormErrors }) {
  return errors.message ? (
    <p role="alert" className="text-sm font-medium text-rose">
      {errors.message}
    </p>
  ) : null;
}
