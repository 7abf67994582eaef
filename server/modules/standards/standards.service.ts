import { standardsRepository, type CertificateRow, type StandardRow } from "./standards.repository";
import { labsRepository } from "../labs/labs.repository";
import { recordAudit } from "../audit/audit.repository";
import { AppError, notFound, refused } from "../../http/errors";
import { recordStoredFile } from "../files/files.repository";
import type { AddCertificate, Certificate, CreateStandard, Standard, StandardDetail, StandardListQuery } from "../../../shared/standards/standards.schemas";
import { fromDb, fromDbOrNull, toDb, toDbOrNull, unknownReference, type RegisterDeps } from "../tools/register.common";
import { shopToday } from "../labs/labs.service";
import type { DbOrTx } from "../../db/client";

export const certificateFileUrl = (c: Pick<CertificateRow, "standardId" | "id" | "fileKey">) =>
  c.fileKey ? `/api/standards/${c.standardId}/certificates/${c.id}/file` : null;

export function toCertificate(c: CertificateRow): Certificate {
  return {
    id: c.id,
    number: c.number,
    labId: c.labId,
    labName: c.labName,
    accreditationBody: c.accreditationBody,
    scope: c.scope,
    nationalInstitute: c.nationalInstitute,
    issuedAt: c.issuedAt,
    dueAt: c.dueAt,
    expandedUncertainty: fromDb(c.expandedUncertainty),
    coverageFactor: fromDb(c.coverageFactor),
    degreesOfFreedom: fromDbOrNull(c.degreesOfFreedom),
    certifiedValue: fromDbOrNull(c.certifiedValue),
    elementValues: c.elementValues ? c.elementValues.map((e) => ({ label: e.label, nominal: Number(e.nominal), deviation: e.deviation == null ? null : Number(e.deviation) })) : null,
    hasFile: !!c.fileKey,
    fileUrl: certificateFileUrl(c),
    createdAt: c.createdAt.toISOString(),
  };
}

/** True when the certificate covers the calendar date (issue date through due date). */
export const certificateCovers = (c: Pick<CertificateRow, "issuedAt" | "dueAt">, date: string) => c.issuedAt <= date && date <= c.dueAt;

/** The standard with the certificate in force today (else the latest), from its certificates sorted latest due first. */
export function toStandard(s: StandardRow, certs: CertificateRow[], today: string): Standard {
  const current = certs.find((c) => certificateCovers(c, today)) ?? certs[0] ?? null;
  return {
    id: s.id,
    assetTag: s.assetTag,
    name: s.name,
    kind: s.kind as Standard["kind"],
    unit: s.unit,
    nominal: fromDbOrNull(s.nominal),
    grade: s.grade,
    location: s.location,
    inCalibration: !!current && certificateCovers(current, today),
    dueAt: current?.dueAt ?? null,
    certificate: current ? toCertificate(current) : null,
    createdAt: s.createdAt.toISOString(),
  };
}

function certificateColumns(standardId: string, c: AddCertificate) {
  return {
    standardId,
    number: c.number,
    labId: c.labId ?? null,
    labName: c.lab,
    accreditationBody: c.accreditationBody ?? null,
    scope: c.scope ?? null,
    nationalInstitute: c.nationalInstitute ?? null,
    issuedAt: c.issuedAt,
    dueAt: c.dueAt,
    expandedUncertainty: toDb(c.expandedUncertainty),
    coverageFactor: toDb(c.coverageFactor),
    degreesOfFreedom: toDbOrNull(c.degreesOfFreedom),
    certifiedValue: toDbOrNull(c.certifiedValue),
    elementValues: c.elementValues?.length ? c.elementValues.map((e) => ({ label: e.label, nominal: toDb(e.nominal), deviation: toDbOrNull(e.deviation) })) : null,
  };
}

export async function getStandardRow(db: DbOrTx, id: string) {
  const s = await standardsRepository.findById(db, id);
  if (!s) throw notFound("standard", id);
  return s;
}

export function standardsService(deps: RegisterDeps) {
  const { db, clock, defaultTimeZone } = deps;
  const today = async () => (await shopToday(db, defaultTimeZone, clock.now())).today;

  async function checkLab(tx: DbOrTx, labId: string | null | undefined) {
    if (labId && !(await labsRepository.findById(tx, labId))) throw unknownReference("lab", labId);
  }

  async function detail(id: string): Promise<StandardDetail> {
    const s = await getStandardRow(db, id);
    const certs = await standardsRepository.certificatesOf(db, [id]);
    return { ...toStandard(s, certs, await today()), certificates: certs.map(toCertificate) };
  }

  return {
    detail,
    async list(query: StandardListQuery) {
      const t = await today();
      const { items, total } = await standardsRepository.list(db, { ...query, today: t });
      const certs = await standardsRepository.certificatesOf(db, items.map((s) => s.id));
      return { items: items.map((s) => toStandard(s, certs.filter((c) => c.standardId === s.id), t)), total };
    },
    async create(input: CreateStandard, actorId: string | null): Promise<StandardDetail> {
      const id = await db.transaction(async (tx) => {
        if (await standardsRepository.findByTag(tx, input.assetTag)) throw new AppError("asset_tag_taken", 409, `Asset tag ${input.assetTag} is already in use.`);
        await checkLab(tx, input.certificate.labId);
        const s = await standardsRepository.insert(tx, {
          assetTag: input.assetTag,
          name: input.name,
          kind: input.kind,
          unit: input.unit,
          nominal: toDbOrNull(input.nominal),
          grade: input.grade ?? null,
          location: input.location ?? null,
        });
        const cert = await standardsRepository.insertCertificate(tx, certificateColumns(s.id, input.certificate));
        await recordAudit(tx, { actorId, action: "standard.create", entityType: "standard", entityId: s.id, after: { standard: s, certificate: cert }, at: clock.now() });
        return s.id;
      });
      return detail(id);
    },
    async addCertificate(standardId: string, input: AddCertificate, actorId: string | null): Promise<Certificate> {
      return db.transaction(async (tx) => {
        await getStandardRow(tx, standardId);
        await checkLab(tx, input.labId);
        const cert = await standardsRepository.insertCertificate(tx, certificateColumns(standardId, input));
        await recordAudit(tx, { actorId, action: "standard.certificate.add", entityType: "standard_certificate", entityId: cert.id, after: cert, at: clock.now() });
        return toCertificate(cert);
      });
    },
    async attachCertificateFile(standardId: string, certificateId: string, file: { buffer: Buffer; fileName: string; contentType: string }, actorId: string | null) {
      if (!deps.storage) throw new AppError("storage_unavailable", 503, "File storage is not available.");
      const cert = await standardsRepository.findCertificate(db, standardId, certificateId);
      if (!cert) throw notFound("certificate", certificateId);
      // A certificate's scanned file is attached once: the lab's document is evidence too.
      if (cert.fileKey) throw refused("certificate_file_attached", `Certificate ${cert.number} already has its file; add a new certificate for a new document.`);
      const key = await deps.storage.put("standard-certificates", file.buffer, file.contentType, file.fileName);
      return db.transaction(async (tx) => {
        const at = clock.now();
        await recordStoredFile(tx, { key, purpose: "standard_certificate", contentType: file.contentType, size: file.buffer.length, fileName: file.fileName, uploadedBy: actorId, uploadedAt: at, claimedBy: `standard_certificate:${certificateId}`, claimedAt: at });
        const after = await standardsRepository.setCertificateFile(tx, certificateId, key);
        if (!after) throw refused("certificate_file_attached", `Certificate ${cert.number} received its file a moment ago.`);
        await recordAudit(tx, { actorId, action: "standard.certificate.file", entityType: "standard_certificate", entityId: certificateId, before: { fileKey: cert.fileKey }, after: { fileKey: key, fileName: file.fileName }, at: clock.now() });
        return toCertificate(after);
      });
    },
    async certificateFile(standardId: string, certificateId: string) {
      const cert = await standardsRepository.findCertificate(db, standardId, certificateId);
      if (!cert?.fileKey) throw notFound("certificate file", certificateId);
      return { key: cert.fileKey, fileName: `certificate-${cert.number}` };
    },
  };
}
