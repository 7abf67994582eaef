import { useMemo, useState } from "react";
import { useNavigate, useSearchParams } from "react-router-dom";
import { CreateStudySchema, STUDY_LIMITS, type CreateStudyInput } from "../../../../shared/studies/studies.schemas";
import { KIND_LABELS } from "../../../../shared/families/families.schemas";
import { useCreateStudy, useMechanics } from "../api/studies";
import { useLimitTable, useLimitTables } from "../../limit-tables/api/limit-tables";
import { useAllFamilies } from "../../tools/api/families";
import { PageHeader, Card, ErrorNote, Loading } from "../../../components/ui/layout";
import { TextField, SelectField, TextAreaField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { Cautions } from "../../../components/ui/cautions";
import { ApiError, errorMessage } from "../../../lib/api-client";

const partLabel = (i: number) => `P-${String(i + 1).padStart(2, "0")}`;

/** Quality sets up a crossed study: the characteristic (its limits give the tolerance), the tool or family, parts, appraisers, trials. */
export function NewStudyPage() {
  const [sp] = useSearchParams();
  const navigate = useNavigate();
  const create = useCreateStudy();
  const tables = useLimitTables({ current: "true", pageSize: 200, page: 1, sort: "engineModel" });
  const families = useAllFamilies();
  const mechanics = useMechanics();

  const [limitTableId, setTableId] = useState(sp.get("limitTableId") ?? "");
  const [itemKey, setItemKey] = useState(sp.get("itemKey") ?? "");
  const [familyId, setFamilyId] = useState("");
  const [toolAssetTag, setToolTag] = useState("");
  const [parts, setParts] = useState<string[]>(() => Array.from({ length: 10 }, (_, i) => partLabel(i)));
  const [appraiserIds, setAppraisers] = useState<string[]>([]);
  const [trials, setTrials] = useState<number | undefined>(3);
  const [purpose, setPurpose] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const table = useLimitTable(limitTableId || undefined);
  const characteristics = useMemo(() => (table.data?.items ?? []).filter((i) => (i.kind === "journal" || i.kind === "bore") && i.min != null && i.max != null), [table.data]);
  const chosen = characteristics.find((i) => i.key === itemKey);
  const suitable = (families.data?.items ?? []).filter((f) => !chosen?.toolKinds?.length || chosen.toolKinds.includes(f.kind));

  const input = (): CreateStudyInput => ({
    limitTableId,
    itemKey,
    familyId: familyId || undefined,
    toolAssetTag: toolAssetTag.trim() || undefined,
    parts: parts.map((label) => ({ label })),
    appraiserIds,
    trials: trials as number,
    purpose,
  });

  const submit = () => {
    const parsed = CreateStudySchema.safeParse(input());
    if (!parsed.success) {
      const e: Record<string, string> = {};
      for (const issue of parsed.error.issues) e[issue.path.join(".")] ??= issue.message;
      return setErrors(e);
    }
    setErrors({});
    create.mutate(input(), {
      onSuccess: (s) => navigate(`/studies/${s.id}`),
      onError: (err) => err instanceof ApiError && setErrors(err.fieldErrors()),
    });
  };
  const err = (k: string) => errors[k];
  const partError = Object.entries(errors).find(([k]) => k.startsWith("parts"))?.[1];
  const appraiserError = Object.entries(errors).find(([k]) => k.startsWith("appraiserIds"))?.[1];

  return (
    <div className="flex max-w-4xl flex-col gap-4">
      <PageHeader title="Set up a gauge study" subtitle="Crossed design: every appraiser measures every part in every trial, in a random order drawn now and kept with the study." />
      <Card title="What is studied">
        <div className="grid gap-3 sm:grid-cols-2">
          <SelectField label="Limits table" value={limitTableId} error={err("limitTableId")} onChange={(e) => (setTableId(e.target.value), setItemKey(""))}>
            <option value="">Choose a table…</option>
            {tables.data?.items.map((t) => (
              <option key={t.id} value={t.id}>
                {t.engineModel} — {t.name} (v{t.version})
              </option>
            ))}
          </SelectField>
          <SelectField label="Characteristic (journal or bore size)" value={itemKey} error={err("itemKey")} onChange={(e) => setItemKey(e.target.value)} disabled={!limitTableId}>
            <option value="">Choose a characteristic…</option>
            {characteristics.map((i) => (
              <option key={i.key} value={i.key}>
                {i.label} — {i.min}–{i.max} {table.data?.unit}
              </option>
            ))}
          </SelectField>
          <SelectField label="Tool family under study" value={familyId} error={err("familyId")} onChange={(e) => setFamilyId(e.target.value)}>
            <option value="">Choose a family…</option>
            {suitable.map((f) => (
              <option key={f.id} value={f.id}>
                {f.name} ({KIND_LABELS[f.kind]})
              </option>
            ))}
          </SelectField>
          <TextField label="Or one particular tool (asset tag, optional)" value={toolAssetTag} error={err("toolAssetTag")} onChange={(e) => setToolTag(e.target.value.toUpperCase())} hint="Leave blank to study any tool of the family." />
        </div>
        {chosen && (
          <p className="mt-2 text-sm text-ink-soft">
            Tolerance {chosen.min} – {chosen.max} {table.data?.unit}: the gauge's variation is judged as a share of this width.
          </p>
        )}
      </Card>

      <Card title={`Parts (${parts.length})`}>
        <div className="mb-3 flex items-center gap-2">
          <label className="text-sm font-semibold text-ink-soft" htmlFor="part-count">
            Number of parts
          </label>
          <select
            id="part-count"
            className="rounded-md border border-paper-line px-2 py-1.5"
            value={parts.length}
            onChange={(e) => {
              const n = Number(e.target.value);
              setParts((ps) => Array.from({ length: n }, (_, i) => ps[i] ?? partLabel(i)));
            }}
          >
            {Array.from({ length: STUDY_LIMITS.maxParts - STUDY_LIMITS.minParts + 1 }, (_, i) => STUDY_LIMITS.minParts + i).map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
          <span className="text-xs text-ink-faint">Choose parts that span the range met in service, each labelled where the label does not touch the measured surface.</span>
        </div>
        <div className="grid grid-cols-2 gap-2 sm:grid-cols-5">
          {parts.map((p, i) => (
            <TextField key={i} label={`Part ${i + 1} label`} value={p} error={err(`parts.${i}.label`)} onChange={(e) => setParts((ps) => ps.map((x, k) => (k === i ? e.target.value : x)))} />
          ))}
        </div>
        {partError && !Object.keys(errors).some((k) => /^parts\.\d+\.label$/.test(k)) && <ErrorNote>{partError}</ErrorNote>}
      </Card>

      <Card title="Appraisers and trials">
        <fieldset>
          <legend className="text-sm font-semibold text-ink-soft">Appraisers (2 or 3 mechanics who measure these parts on the bench)</legend>
          {mechanics.isPending ? (
            <Loading what="Finding mechanics" />
          ) : (
            <div className="mt-1 grid gap-1 sm:grid-cols-3">
              {mechanics.data?.items.map((m) => (
                <label key={m.id} className="flex items-center gap-2 text-sm">
                  <input
                    type="checkbox"
                    checked={appraiserIds.includes(m.id)}
                    onChange={(e) => {
                      setAppraisers((ids) => (e.target.checked ? [...ids, m.id] : ids.filter((x) => x !== m.id)));
                      setErrors((es) => Object.fromEntries(Object.entries(es).filter(([k]) => !k.startsWith("appraiserIds"))));
                    }}
                  />
                  {m.name}
                </label>
              ))}
            </div>
          )}
          {appraiserError && <p role="alert" className="text-sm text-stop">{appraiserError}</p>}
        </fieldset>
        <fieldset className="mt-3">
          <legend className="text-sm font-semibold text-ink-soft">Trials (times each appraiser measures each part)</legend>
          <div className="mt-1 flex gap-4">
            {[2, 3].map((n) => (
              <label key={n} className="flex items-center gap-2 text-sm">
                <input type="radio" name="trials" checked={trials === n} onChange={() => setTrials(n)} />
                {n} trials
              </label>
            ))}
          </div>
          {err("trials") && <p role="alert" className="text-sm text-stop">{err("trials")}</p>}
        </fieldset>
        <TextAreaField wrapperClassName="mt-3" label="Purpose (optional)" value={purpose} onChange={(e) => setPurpose(e.target.value)} />
      </Card>

      {create.isError && <ErrorNote>{errorMessage(create.error)}</ErrorNote>}
      <div className="flex gap-2">
        <Button onClick={submit} disabled={create.isPending}>
          Set up the study
        </Button>
      </div>
      <Cautions compact />
    </div>
  );
}
