import { get, type FieldErrors, type UseFormRegister } from "react-hook-form";
import { TextField, SelectField } from "../../../components/ui/field";
import { useAllLabs } from "../api/labs";
import { asNumber, decimalInput } from "../lib/form";

/**
 * The fields of a standard's certificate (number, issuing lab, dates, U and k,
 * traceability), used by "new standard" (under `certificate.`) and "add certificate" (at the root).
 */
export function CertificateFields({ register, errors, prefix, unit }: { register: UseFormRegister<any>; errors: FieldErrors; prefix: "" | "certificate."; unit: string }) {
  const labs = useAllLabs();
  const err = (name: string) => (get(errors, `${prefix}${name}`) as { message?: string } | undefined)?.message;
  const reg = (name: string, opts?: object) => register(`${prefix}${name}`, opts);
  return (
    <div className="grid gap-3 sm:grid-cols-2">
      <TextField label="Certificate number" error={err("number")} {...reg("number")} />
      <TextField label="Issuing lab (as printed)" error={err("lab")} {...reg("lab")} />
      <SelectField label="Lab in the list (optional)" error={err("labId")} {...reg("labId", { setValueAs: (v: string) => v || null })}>
        <option value="">— not in the list —</option>
        {(labs.data?.items ?? []).map((l) => (
          <option key={l.id} value={l.id}>
            {l.name}
          </option>
        ))}
      </SelectField>
      <TextField label="Accreditation body" error={err("accreditationBody")} {...reg("accreditationBody")} />
      <TextField label="Issued" type="date" error={err("issuedAt")} {...reg("issuedAt")} />
      <TextField label="Due" type="date" error={err("dueAt")} {...reg("dueAt")} />
      <TextField label={`Expanded uncertainty U (${unit})`} {...decimalInput} error={err("expandedUncertainty")} {...reg("expandedUncertainty", asNumber)} />
      <TextField label="Coverage factor k" {...decimalInput} error={err("coverageFactor")} {...reg("coverageFactor", asNumber)} />
      <TextField label={`Certified value (${unit}, optional)`} {...decimalInput} error={err("certifiedValue")} {...reg("certifiedValue", asNumber)} />
      <TextField label="National measurement institute" hint="The institute the certificate traces to." error={err("nationalInstitute")} {...reg("nationalInstitute")} />
      <TextField label="Scope (optional)" wrapperClassName="sm:col-span-2" error={err("scope")} {...reg("scope")} />
    </div>
  );
}
