import { useState } from "react";
import { Link, useParams } from "react-router-dom";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { AddCertificateSchema, type Certificate, type CertificateInput, type StandardDetail } from "../../../../shared/standards/standards.schemas";
import { useCan } from "../../auth/api/auth";
import { useAddCertificate, useStandard, useUploadCertificateFile } from "../api/standards";
import { PageHeader, Card, ErrorNote, Loading, Facts, EmptyState } from "../../../components/ui/layout";
import { Button } from "../../../components/ui/button";
import { cx } from "../../../components/ui/cx";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { applyFieldErrors, fileInputClass } from "../lib/form";
import { len } from "../lib/format";
import { CertificateFields } from "./certificate-fields";
import { InCalibrationBadge } from "./in-calibration-badge";
import { standardKindLabel } from "./standards-page";

export function StandardPage() {
  const { id = "" } = useParams();
  const standard = useStandard(id);
  const canWrite = useCan("standards.write");
  if (standard.isPending) return <Loading what="Loading the standard" />;
  if (standard.isError) return <ErrorNote>{errorMessage(standard.error)}</ErrorNote>;
  const s = standard.data;
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title={`${s.assetTag} — ${s.name}`}
        subtitle={<InCalibrationBadge inCalibration={s.inCalibration} dueAt={s.dueAt} />}
        actions={<Link className="text-sm underline" to="/standards">All reference standards</Link>}
      />
      <div className="grid gap-5 lg:grid-cols-2">
        <Card title="Details">
          <Facts
            items={[
              ["Kind", standardKindLabel(s.kind)],
              ["Unit", s.unit],
              ["Nominal", s.nominal == null ? null : len(s.nominal, s.unit)],
              ["Grade", s.grade],
              ["Location", s.location],
              ["Certificate due", s.dueAt],
            ]}
          />
        </Card>
        {canWrite && <AddCertificateCard standard={s} />}
      </div>
      <Card title="Certificates, newest first">
        {s.certificates.length === 0 ? <EmptyState>No certificate on record: this standard cannot be used for calibrations.</EmptyState> : (
          <ol className="flex flex-col gap-3">
            {s.certificates.map((c, i) => (
              <CertificateItem key={c.id} c={c} unit={s.unit} latest={i === 0} />
            ))}
          </ol>
        )}
      </Card>
    </div>
  );
}

function CertificateItem({ c, unit, latest }: { c: Certificate; unit: "in" | "mm"; latest: boolean }) {
  return (
    <li className={cx("rounded-md border p-3", latest ? "border-brass/60 bg-brass-light/30" : "border-paper-line")}>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <p className="font-semibold">Certificate {c.number}</p>
        {c.hasFile && c.fileUrl ? (
          <a className="text-sm font-semibold underline" href={c.fileUrl} target="_blank" rel="noreferrer">
            Download certificate {c.number}
          </a>
        ) : (
          <span className="text-sm text-ink-faint">No file attached</span>
        )}
      </div>
      <Facts
        items={[
          ["Issued by", c.labName],
          ["Accreditation body", c.accreditationBody],
          ["Issued – due", `${c.issuedAt} – ${c.dueAt}`],
          ["Expanded uncertainty", `${len(c.expandedUncertainty, unit, 6)} (k = ${c.coverageFactor})`],
          ["Certified value", c.certifiedValue == null ? null : len(c.certifiedValue, unit, 6)],
          ["Traces to", c.nationalInstitute],
          ["Scope", c.scope],
        ]}
      />
      {c.elementValues && c.elementValues.length > 0 && (
        <details className="mt-2 text-sm">
          <summary className="cursor-pointer font-semibold">Certified values of {c.elementValues.length} elements</summary>
          <table className="mt-1 w-full text-left">
            <thead className="text-xs uppercase text-ink-faint">
              <tr>
                <th className="py-1">Element</th>
                <th>Nominal</th>
                <th>Deviation</th>
              </tr>
            </thead>
            <tbody>
              {c.elementValues.map((e) => (
                <tr key={e.label} className="border-t border-paper-line">
                  <td className="py-1">{e.label}</td>
                  <td>{len(e.nominal, unit)}</td>
                  <td>{len(e.deviation, unit, 6)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </details>
      )}
    </li>
  );
}

function AddCertificateCard({ standard }: { standard: StandardDetail }) {
  const add = useAddCertificate(standard.id);
  const upload = useUploadCertificateFile();
  const [file, setFile] = useState<File | null>(null);
  const form = useForm<CertificateInput>({
    resolver: zodResolver(AddCertificateSchema),
    defaultValues: { number: "", lab: standard.certificate?.labName ?? "", issuedAt: "", dueAt: "", coverageFactor: 2, nationalInstitute: standard.certificate?.nationalInstitute ?? undefined },
  });
  return (
    <Card title="Add a certificate (after recalibration)">
      <form
        noValidate
        className="flex flex-col gap-3"
        onSubmit={form.handleSubmit((v) =>
          add.mutate(AddCertificateSchema.parse(v), {
            onSuccess: (cert) => {
              if (file) upload.mutate({ standardId: standard.id, certificateId: cert.id, file }, { onSuccess: () => setFile(null) });
              form.reset();
            },
            onError: (err) => err instanceof ApiError && applyFieldErrors(err.fieldErrors(), form.setError),
          }),
        )}
      >
        <CertificateFields register={form.register} errors={form.formState.errors} prefix="" unit={standard.unit} />
        <label className="flex flex-col gap-1 text-sm font-semibold text-ink-soft">
          Certificate file (PDF or image)
          <input type="file" className={fileInputClass} accept="application/pdf,image/*" onChange={(ev) => setFile(ev.target.files?.[0] ?? null)} />
        </label>
        {add.isError && <ErrorNote>{errorMessage(add.error)}</ErrorNote>}
        {upload.isError && <ErrorNote>The certificate was added, but its file was not: {errorMessage(upload.error)}</ErrorNote>}
        {add.isSuccess && <p role="status" className="text-sm text-go">Certificate {add.data.number} added.</p>}
        <Button type="submit" disabled={add.isPending}>
          Add certificate
        </Button>
      </form>
    </Card>
  );
}
