import type { Db } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { SessionUser } from "../../http/route";
import { notFound, refused } from "../../http/errors";
import { recordAudit } from "../audit/audit.repository";
import { jobsRepository } from "./jobs.repository";
import { limitTablesRepository } from "../limit-tables/limit-tables.repository";
import { buildCheckSheet, toJobSummary } from "./check-sheet.service";
import type { JobSummary, SignerCertificate } from "../../../shared/jobs/jobs.schemas";
import { usersRepository } from "../users/users.repository";

/** Certificate numbers compared as a person reads them: spaces and letter case do not matter. */
const normalCertificate = (v: string) => v.replace(/\s+/g, "").toUpperCase();

export function jobsService({ db, clock }: { db: Db; clock: Clock }) {
  return {
    /** Opens a job on a limits table revision; the job keeps that revision even when the table is revised later. */
    async create(input: { limitTableId: string; engineSerial: string; workOrder?: string }, user: SessionUser): Promise<JobSummary> {
      const id = await db.transaction(async (tx) => {
        await limitTablesRepository.lockAgainstRevision(tx, input.limitTableId);
        const table = await limitTablesRepository.summary(tx, input.limitTableId);
        if (!table) throw notFound("limit table", input.limitTableId);
        // Work is measured against the current revision of the manufacturer's limits, never a superseded one.
        const newer = await limitTablesRepository.revisionOf(tx, input.limitTableId);
        if (newer) throw refused("table_superseded", "This limits table has been revised; open the job on its current revision.", { currentId: newer.id });
        const at = clock.now();
        const row = await jobsRepository.insert(tx, {
          limitTableId: input.limitTableId,
          engineSerial: input.engineSerial,
          engineModel: table.table.engineModel,
          workOrder: input.workOrder ?? null,
          openedBy: user.id,
          openedAt: at,
        });
        await recordAudit(tx, { actorId: user.id, action: "job.create", entityType: "job", entityId: row.id, after: { ...input, limitTableVersion: table.table.version }, at });
        return row.id;
      });
      return toJobSummary((await jobsRepository.summary(db, id))!);
    },

    /**
     * Inspector sign-off with their certificate number, which must be the one on their own user record (refused
     * `certificate_not_yours` otherwise, `certificate_not_on_record` when the record has none). Every place on the sheet must hold a reading (clearances follow
     * from their pairs); readings outside limits may be signed — the sheet records the finding. A signed sheet is locked.
     */
    /** The certificate number a signer signs with: the one on their user record (null when none is recorded). */
    async signerCertificate(user: SessionUser): Promise<SignerCertificate> {
      const row = await usersRepository.findById(db, user.id);
      return { name: user.name, certificateNumber: row?.certificateNumber ?? null };
    },

    async sign(jobId: string, input: { certificateNumber: string; note?: string }, user: SessionUser) {
      await db.transaction(async (tx) => {
        if (!(await jobsRepository.lock(tx, jobId))) throw notFound("job", jobId);
        const sheet = await buildCheckSheet(tx, jobId);
        if (sheet.locked) throw refused("sheet_signed", "This check sheet is already signed.");
        // The number signed with is the signer's own, as their record holds it.
        const own = (await usersRepository.findById(tx, user.id))?.certificateNumber ?? null;
        if (!own) throw refused("certificate_not_on_record", "Your user record holds no inspector certificate number; ask an admin to add it under People before signing.");
        if (normalCertificate(own) !== normalCertificate(input.certificateNumber)) {
          throw refused("certificate_not_yours", `Certificate ${input.certificateNumber} is not the one on your record; sign with your own certificate number.`);
        }
        if (sheet.summary.missing.length) {
          const list = sheet.summary.missing.slice(0, 5).map((m) => `${m.label} no. ${m.index}`).join(", ");
          throw refused("sheet_incomplete", `Every item needs a reading before signing; missing: ${list}${sheet.summary.missing.length > 5 ? ", …" : ""}.`, { missing: sheet.summary.missing });
        }
        const at = clock.now();
        const row = await jobsRepository.insertSignoff(tx, { jobId, inspectorId: user.id, certificateNumber: own, note: input.note ?? null, signedAt: at });
        await recordAudit(tx, { actorId: user.id, action: "job.sign", entityType: "job", entityId: jobId, after: { signoffId: row.id, certificateNumber: own, outside: sheet.summary.outside, flagged: sheet.summary.flagged }, at });
      });
      return buildCheckSheet(db, jobId);
    },
  };
}
