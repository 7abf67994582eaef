import type { Placeholder, SQL } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { z } from "zod";
import type { Db, DbOrTx, Tx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { SessionUser } from "../../http/route";
import { AppError, notFound, refused } from "../../http/errors";
import { recordAudit } from "../audit/audit.repository";
import { getSettings } from "../settings/settings.service";
import { limitTablesRepository } from "../limit-tables/limit-tables.repository";
import { statusContext, statusesFor } from "../tools/tool-status.service";
import { studiesRepository, type StudyRow } from "./studies.repository";
import { dec, num } from "../../../shared/common/decimal";
import { convertLength } from "../../../shared/common/units";
import { withinToolRange } from "../../../shared/inspection/check-sheet";
import { KIND_LABELS } from "../../../shared/families/families.schemas";
import { anovaGrr, averageRangeGrr, studyCharts, type StudyGrid } from "../../../shared/studies/gauge-study-analysis";
import { promptsFor, runOrder } from "../../../shared/studies/run-order";
import type {
  Characteristic,
  CreateStudy,
  LatestStudy,
  MyStudy,
  RecordStudyValueResult,
  StudyAnalysis,
  StudyDetail,
  StudyGaps,
  StudyListQuery,
  StudySession,
  StudySummary,
} from "../../../shared/studies/studies.schemas";

/** A 400 shaped like the zod issues every other bad input gets. */
function badInput(path: (string | number)[], message: string): never {
  throw new z.ZodError([{ code: "custom", path, message, input: undefined }]);
}

// Kinds that read a size on their own, and transfer gauges whose size is read on a micrometer.
const READ_KINDS = new Set(["outside_micrometer", "inside_micrometer", "dial_indicator", "caliper", "other"]);
const TRANSFER_KINDS = new Set(["telescoping_gauge", "small_hole_gauge"]);

export const studyReference = (n: number) => `GRR-${String(n).padStart(4, "0")}`;

function characteristicOf(s: StudyRow): Characteristic {
  return {
    limitTableId: s.limitTableId,
    tableName: s.tableName,
    engineModel: s.engineModel,
    tableVersion: s.tableVersion,
    itemKey: s.itemKey,
    label: s.itemLabel,
    kind: s.itemKind as "journal" | "bore",
    unit: s.tableUnit,
    min: Number(s.itemMin),
    max: Number(s.itemMax),
    tolerance: num(dec(s.itemMax!).minus(dec(s.itemMin!))),
  };
}

type Appraiser = { studyId: string; seq: number; userId: string; name: string };

function toSummary(s: StudyRow, appraisers: Appraiser[]): StudySummary {
  const needed = s.parts * s.appraisers * s.trials;
  return {
    id: s.id,
    reference: studyReference(s.number),
    characteristic: characteristicOf(s),
    family: { id: s.familyId, name: s.familyName, kind: s.familyKind },
    tool: s.toolAssetTag ? { assetTag: s.toolAssetTag, description: s.toolDescription ?? "" } : null,
    parts: s.parts,
    appraisers: appraisers.filter((a) => a.studyId === s.id).map((a) => ({ id: a.userId, name: a.name })),
    trials: s.trials,
    alpha: s.alpha,
    purpose: s.purpose,
    isDemo: s.isDemo,
    createdAt: s.createdAt.toISOString(),
    createdBy: s.createdBy && s.creatorName ? { id: s.createdBy, name: s.creatorName } : null,
    valuesTaken: s.valuesTaken,
    valuesNeeded: needed,
    state: s.completedAt ? "complete" : "in_progress",
    completedAt: s.completedAt?.toISOString() ?? null,
    verdict: s.verdict,
    percentGrr: s.percentGrr,
    ndc: s.ndc,
  };
}

type ValueRow = Awaited<ReturnType<typeof studiesRepository.values>>[number];

/** Both methods and the chart data, from the current value of every place, in the characteristic's unit. */
export function analyseStudy(s: StudyRow, values: ValueRow[]): StudyAnalysis | null {
  const current = values.filter((v) => !v.supersededById);
  if (current.length !== s.parts * s.appraisers * s.trials) return null;
  const grid: StudyGrid = Array.from({ length: s.parts }, () => Array.from({ length: s.appraisers }, () => Array<number>(s.trials).fill(NaN)));
  for (const v of current) grid[v.part - 1][v.appraiserSeq - 1][v.trial - 1] = num(convertLength(v.value, v.unit, s.tableUnit));
  const tolerance = characteristicOf(s).tolerance;
  return {
    unit: s.tableUnit,
    tolerance,
    anova: anovaGrr(grid, { alpha: s.alpha, tolerance }),
    averageRange: averageRangeGrr(grid, { tolerance }),
    charts: studyCharts(grid),
  };
}

export function studiesService(deps: { db: Db; clock: Clock; config: { SHOP_TIME_ZONE: string } }) {
  const { db, clock } = deps;

  async function summaries(rows: StudyRow[]) {
    const appraisers = await studiesRepository.appraisersOf(db, rows.map((r) => r.id));
    return rows.map((r) => toSummary(r, appraisers));
  }

  async function loadStudy(dbx: DbOrTx, id: string) {
    const s = await studiesRepository.find(dbx, id, true);
    if (!s) throw notFound("study", id);
    return s;
  }

  async function appraiserSeqOf(dbx: DbOrTx, s: StudyRow, user: SessionUser) {
    const appraisers = await studiesRepository.appraisersOf(dbx, [s.id]);
    const me = appraisers.find((a) => a.userId === user.id);
    if (!me) throw new AppError("not_an_appraiser", 403, `You are not an appraiser of ${studyReference(s.number)}; only its appraisers take it.`);
    return me.seq;
  }

  /**
   * The tools a value was taken with: the study's tool (or one of its family), and for a transfer gauge the
   * micrometer that read it; each usable for acceptance at this instant, as for any reading.
   */
  async function checkTools(tx: Tx, s: StudyRow, tags: string[], value: number, at: Date) {
    const wanted = [...new Set(tags.map((t) => t.trim().toUpperCase()))];
    if (wanted.length !== tags.length) badInput(["toolAssetTags"], "A tool is named twice.");
    const found = await studiesRepository.toolsByTags(tx, wanted);
    const hits = wanted.map((tag) => {
      const hit = found.find((f) => f.tool.assetTag.toUpperCase() === tag);
      if (!hit) throw notFound("tool", tag);
      return hit;
    });
    const studied = hits.find((h) => (s.toolId ? h.tool.id === s.toolId : h.tool.familyId === s.familyId));
    if (!studied) {
      throw refused(
        "tool_not_in_study",
        s.toolId ? `${studyReference(s.number)} studies ${s.toolAssetTag}; measure with that tool.` : `${studyReference(s.number)} studies the family ${s.familyName}; measure with one of its tools.`,
      );
    }
    const transfer = TRANSFER_KINDS.has(studied.kind);
    const reader = hits.find((h) => h !== studied);
    if (transfer && (!reader || !READ_KINDS.has(reader.kind))) {
      throw refused("micrometer_not_named", "A telescoping or small-hole gauge is read on a micrometer; name the micrometer too.");
    }
    if (!transfer && reader) badInput(["toolAssetTags"], `${studied.tool.assetTag} reads the size itself; name only the tool measured with.`);
    const readTool = transfer ? reader! : studied;

    const ctx = await statusContext(tx, deps.config.SHOP_TIME_ZONE);
    const statuses = await statusesFor(tx, hits.map((h) => h.tool.id), at, ctx);
    const unusable: { assetTag: string; status: string; reasons: string[] }[] = [];
    for (const h of hits) {
      const st = statuses.get(h.tool.id)!;
      let usable = st.usableForAcceptance;
      const reasons = [...st.reasons];
      // A limited tool reads only inside the part of its range it was calibrated for.
      const lim = st.lastCalibration?.limitedRange;
      if (usable && st.status === "limited" && lim && h === readTool) {
        const v = num(convertLength(value, s.tableUnit, h.tool.unit));
        if (!withinToolRange([v], convertLength(lim.min, lim.unit, h.tool.unit), convertLength(lim.max, lim.unit, h.tool.unit))) {
          usable = false;
          reasons.unshift(`Value outside the calibrated part of the range (${lim.min}–${lim.max} ${lim.unit}).`);
        }
      }
      if (usable && !h.tool.acceptanceUse) {
        usable = false;
        reasons.push("This tool is not for acceptance readings.");
      }
      if (!usable) unusable.push({ assetTag: h.tool.assetTag, status: st.status, reasons });
    }
    if (unusable.length) {
      const first = unusable[0];
      throw refused("tool_not_usable", `${first.assetTag} may not be used now: ${first.reasons[0] ?? first.status}`, { tools: unusable });
    }
    return {
      unit: readTool.tool.unit,
      rows: hits.map((h, i) => {
        const st = statuses.get(h.tool.id)!;
        return { toolId: h.tool.id, position: i + 1, statusAtReading: st.status, dueAtReading: st.dueAt, takenAt: at };
      }),
    };
  }

  /** Writes a result row when the study is complete after this change (its first completion, or a correction of a complete study). */
  async function resultIfComplete(tx: Tx, studyId: string, at: Date) {
    const s = (await studiesRepository.find(tx, studyId))!;
    const values = await studiesRepository.values(tx, studyId);
    const analysis = analyseStudy(s, values);
    if (!analysis) return false;
    const v = analysis.anova.verdict;
    await studiesRepository.insertResult(tx, { studyId, computedAt: at, verdict: v.verdict, percentGrr: v.percentGrr, ndc: analysis.anova.ndc, pooled: analysis.anova.pooled, analysis });
    return true;
  }

  async function sessionFor(dbx: DbOrTx, s: StudyRow, seq: number): Promise<StudySession> {
    const [values, parts] = await Promise.all([studiesRepository.values(dbx, s.id), studiesRepository.parts(dbx, s.id)]);
    const mine = values.filter((v) => v.appraiserSeq === seq);
    const taken = new Set(mine.filter((v) => !v.supersedesId).map((v) => `${v.part}/${v.trial}`));
    const next = promptsFor(s.runOrder, seq - 1).find((p) => !taken.has(`${p.part}/${p.trial}`));
    const label = (part: number) => parts.find((p) => p.seq === part)?.label ?? `Part ${part}`;
    const lastRow = mine.filter((v) => !v.supersededById).sort((a, b) => b.seq - a.seq)[0];
    const lastTools = lastRow ? await studiesRepository.toolsOfValues(dbx, [lastRow.id]) : [];
    const tags = lastTools.map((t) => t.assetTag);
    return {
      id: s.id,
      reference: studyReference(s.number),
      characteristic: characteristicOf(s),
      family: { id: s.familyId, name: s.familyName, kind: s.familyKind },
      tool: s.toolAssetTag ? { assetTag: s.toolAssetTag, description: s.toolDescription ?? "" } : null,
      isDemo: s.isDemo,
      taken: taken.size,
      needed: s.parts * s.trials,
      prompt: next ? { position: next.position, trial: next.trial, part: next.part, partLabel: label(next.part) } : null,
      last: lastRow ? { id: lastRow.id, value: Number(lastRow.value), unit: lastRow.unit, partLabel: label(lastRow.part), trial: lastRow.trial, toolAssetTags: tags } : null,
      lastToolAssetTags: tags,
    };
  }

  async function get(id: string): Promise<StudyDetail> {
    const s = await loadStudy(db, id);
    const [[summary], parts, values, appraisers] = await Promise.all([summaries([s]), studiesRepository.parts(db, id), studiesRepository.values(db, id), studiesRepository.appraisersOf(db, [id])]);
    const tools = await studiesRepository.toolsOfValues(db, values.map((v) => v.id));
    const label = (part: number) => parts.find((p) => p.seq === part)?.label ?? `Part ${part}`;
    const nameOf = (seq: number) => appraisers.find((a) => a.seq === seq)!;
    return {
      ...summary,
      partLabels: parts.map((p) => p.label),
      runOrder: s.runOrder,
      values: values.map((v) => ({
        id: v.id,
        appraiser: { id: nameOf(v.appraiserSeq).userId, name: nameOf(v.appraiserSeq).name },
        part: v.part,
        partLabel: label(v.part),
        trial: v.trial,
        position: v.position,
        value: Number(v.value),
        unit: v.unit,
        tools: tools.filter((t) => t.valueId === v.id).map((t) => ({ assetTag: t.assetTag, description: t.description, statusAtReading: t.statusAtReading as never, dueAtReading: t.dueAtReading })),
        takenAt: v.takenAt.toISOString(),
        supersedesId: v.supersedesId,
        supersedeReason: v.supersedeReason,
        supersededById: v.supersededById,
      })),
      progress: appraisers.map((a) => ({
        appraiser: { id: a.userId, name: a.name },
        taken: values.filter((v) => v.appraiserSeq === a.seq && !v.supersedesId).length,
        needed: s.parts * s.trials,
      })),
      // The result as reported (its newest row), so the page always matches the verdict other pages show.
      analysis: (s.analysis as StudyAnalysis | null) ?? null,
    };
  }

  return {
    async list(q: Required<Pick<StudyListQuery, "page" | "pageSize" | "sort">> & StudyListQuery) {
      const { items, total } = await studiesRepository.list(db, q as Parameters<typeof studiesRepository.list>[1]);
      return { items: await summaries(items), total };
    },

    get,

    /** POST /api/studies — the characteristic, the tool or family, the parts, the appraisers (mechanics) and the trials; the run order is drawn and kept. */
    async create(input: CreateStudy, actor: SessionUser): Promise<StudyDetail> {
      const at = clock.now();
      const id = await db.transaction(async (tx) => {
        const table = await limitTablesRepository.summary(tx, input.limitTableId);
        if (!table) throw notFound("limit table", input.limitTableId);
        if (table.supersededById) throw refused("table_superseded", "This limits table has been revised; set the study up on the current revision.", { currentId: table.supersededById });
        const items = await limitTablesRepository.items(tx, input.limitTableId);
        const item = items.find((i) => i.key === input.itemKey);
        if (!item) badInput(["itemKey"], `This table has no item "${input.itemKey}".`);
        if (item.kind !== "journal" && item.kind !== "bore") {
          badInput(["itemKey"], `${item.label} is a ${item.kind} item; a gauge study measures a journal or a bore size directly.`);
        }
        if (item.min == null || item.max == null) badInput(["itemKey"], `${item.label} needs both limits to give the tolerance.`);
        if (!dec(item.max).gt(dec(item.min))) badInput(["itemKey"], `${item.label} has no tolerance (its limits are equal).`);

        let familyId = input.familyId;
        let toolId: string | null = null;
        if (input.toolAssetTag) {
          const [hit] = await studiesRepository.toolsByTags(tx, [input.toolAssetTag]);
          if (!hit) throw notFound("tool", input.toolAssetTag);
          if (familyId && hit.tool.familyId !== familyId) badInput(["toolAssetTag"], `${hit.tool.assetTag} belongs to another family (${hit.familyName}).`);
          familyId = hit.tool.familyId;
          toolId = hit.tool.id;
        }
        const family = await studiesRepository.family(tx, familyId!);
        if (!family) throw notFound("family", familyId);
        if (!READ_KINDS.has(family.kind) && !TRANSFER_KINDS.has(family.kind)) {
          throw refused("tool_kind_unsuitable", `${KIND_LABELS[family.kind]} tools do not read a size; a gauge study needs a measuring tool.`);
        }
        if (item.toolKinds?.length && !item.toolKinds.includes(family.kind)) {
          throw refused("tool_kind_unsuitable", `${item.label} is measured with: ${item.toolKinds.map((k) => KIND_LABELS[k as keyof typeof KIND_LABELS] ?? k).join(", ")}.`);
        }

        // Appraisers are the people who measure these parts on the bench: mechanics, signed-in and active.
        const people = await studiesRepository.usersByIds(tx, input.appraiserIds);
        input.appraiserIds.forEach((uid, i) => {
          const p = people.find((x) => x.id === uid);
          if (!p) badInput(["appraiserIds", i], "No such person.");
          if (p.role !== "mechanic") badInput(["appraiserIds", i], `${p.name} is not a mechanic (${p.role}); appraisers are mechanics who measure these parts on the bench.`);
          if (!p.active) badInput(["appraiserIds", i], `${p.name} is no longer active.`);
        });

        const settings = await getSettings(tx, deps.config.SHOP_TIME_ZONE);
        const root = await studiesRepository.tableRoot(tx, input.limitTableId);
        const seed = randomUUID();
        const order = runOrder(seed, input.parts.length, input.appraiserIds.length, input.trials);
        const row = await studiesRepository.insertStudy(
          tx,
          {
            limitTableId: input.limitTableId,
            tableRootId: root!,
            itemKey: item.key,
            familyId: family.id,
            toolId,
            parts: input.parts.length,
            appraisers: input.appraiserIds.length,
            trials: input.trials,
            alpha: settings.studyPoolingAlpha,
            seed,
            runOrder: order,
            purpose: input.purpose ?? null,
            isDemo: input.isDemo,
            createdBy: actor.id,
            createdAt: at,
          },
          input.parts.map((p) => p.label),
          input.appraiserIds,
        );
        await recordAudit(tx, { actorId: actor.id, action: "study.create", entityType: "study", entityId: row.id, after: { ...input, seed, alpha: settings.studyPoolingAlpha }, at });
        return row.id;
      });
      return get(id);
    },

    /** GET /api/studies/mine — studies waiting for this mechanic. */
    async mine(user: SessionUser): Promise<MyStudy[]> {
      const rows = await studiesRepository.openFor(db, user.id);
      const out: MyStudy[] = [];
      for (const s of rows) {
        const seq = await appraiserSeqOf(db, s, user);
        const session = await sessionFor(db, s, seq);
        out.push({ id: s.id, reference: session.reference, characteristicLabel: s.itemLabel, engineModel: s.engineModel, familyName: s.familyName, isDemo: s.isDemo, taken: session.taken, needed: session.needed });
      }
      return out;
    },

    /** GET /api/studies/:id/session — the appraiser's next prompt, blind. */
    async session(id: string, user: SessionUser) {
      const s = await loadStudy(db, id);
      return sessionFor(db, s, await appraiserSeqOf(db, s, user));
    },

    /** POST /api/studies/:id/values — the value for the prompt the appraiser was shown; refused out of order. */
    async record(id: string, input: { part: number; trial: number; value: number; toolAssetTags: string[] }, user: SessionUser): Promise<RecordStudyValueResult> {
      const at = clock.now();
      return db.transaction(async (tx) => {
        if (!(await studiesRepository.lock(tx, id))) throw notFound("study", id);
        const s = (await studiesRepository.find(tx, id))!;
        const seq = await appraiserSeqOf(tx, s, user);
        if (input.part > s.parts) badInput(["part"], `This study has ${s.parts} parts; there is no part ${input.part}.`);
        if (input.trial > s.trials) badInput(["trial"], `This study has ${s.trials} trials; there is no trial ${input.trial}.`);
        const session = await sessionFor(tx, s, seq);
        if (!session.prompt) throw refused("study_finished", "You have measured every part of this study; correct a value with a reason if one was wrong.");
        if (session.prompt.part !== input.part || session.prompt.trial !== input.trial) {
          throw refused("out_of_run_order", `The next in your order is ${session.prompt.partLabel}, trial ${session.prompt.trial}; measure that one.`, { expected: session.prompt });
        }
        const tools = await checkTools(tx, s, input.toolAssetTags, input.value, at);
        const row = await studiesRepository.insertValue(
          tx,
          { studyId: id, appraiserSeq: seq, part: input.part, trial: input.trial, position: session.prompt.position, value: String(input.value), unit: tools.unit, takenBy: user.id, takenAt: at },
          tools.rows,
        );
        await recordAudit(tx, { actorId: user.id, action: "study.value", entityType: "study", entityId: id, after: { valueId: row.id, part: input.part, trial: input.trial, value: row.value, unit: row.unit, tools: input.toolAssetTags }, at });
        const complete = await resultIfComplete(tx, id, at);
        return { id: row.id, taken: session.taken + 1, needed: session.needed, studyComplete: complete };
      });
    },

    /** POST /api/study-values/:id/supersede — the appraiser corrects their own value; the old one stays on record. */
    async supersede(valueId: string, input: { value: number; toolAssetTags: string[]; reason: string }, user: SessionUser): Promise<RecordStudyValueResult> {
      const at = clock.now();
      const first = await studiesRepository.findValue(db, valueId);
      if (!first) throw notFound("study value", valueId);
      return db.transaction(async (tx) => {
        await studiesRepository.lock(tx, first.studyId);
        const old = (await studiesRepository.findValue(tx, valueId))!;
        if (old.takenBy !== user.id) throw new AppError("not_your_value", 403, "Only the appraiser who took a value may correct it.");
        const newer = await studiesRepository.successorOf(tx, valueId);
        if (newer) throw refused("value_superseded", "This value has already been corrected; correct the current one.", { currentId: newer.id });
        const s = (await studiesRepository.find(tx, old.studyId))!;
        const seq = await appraiserSeqOf(tx, s, user);
        const tools = await checkTools(tx, s, input.toolAssetTags, input.value, at);
        const row = await studiesRepository.insertValue(
          tx,
          { studyId: s.id, appraiserSeq: seq, part: old.part, trial: old.trial, position: old.position, value: String(input.value), unit: tools.unit, takenBy: user.id, takenAt: at, supersedesId: old.id, supersedeReason: input.reason },
          tools.rows,
        );
        await recordAudit(tx, { actorId: user.id, action: "study.value.supersede", entityType: "study", entityId: s.id, before: { valueId: old.id, value: old.value }, after: { valueId: row.id, value: row.value, reason: input.reason }, at });
        const complete = await resultIfComplete(tx, s.id, at);
        const session = await sessionFor(tx, s, seq);
        return { id: row.id, taken: session.taken, needed: session.needed, studyComplete: complete };
      });
    },

    /** Latest finished study (and any in progress) per characteristic and family: by family for a tool's page, by table for its items. */
    async latest(filter: { familyId?: string; limitTableId?: string }): Promise<LatestStudy[]> {
      const [latest, open] = await Promise.all([studiesRepository.latest(db, filter), studiesRepository.inProgress(db, filter)]);
      const key = (r: { tableRootId: string; itemKey: string; familyId: string }) => `${r.tableRootId}/${r.itemKey}/${r.familyId}`;
      const pairs = new Map<string, { tableRootId: string; itemKey: string; familyId: string }>();
      for (const r of [...latest, ...open]) pairs.set(key(r), r);
      const [names, families] = await Promise.all([studiesRepository.characteristicNames(db, [...pairs.values()]), studiesRepository.familyNames(db, [...new Set([...pairs.values()].map((p) => p.familyId))])]);
      return [...pairs.values()].map((p) => {
        const l = latest.find((x) => key(x) === key(p));
        const o = open.find((x) => key(x) === key(p));
        const n = names.get(`${p.tableRootId}/${p.itemKey}`);
        return {
          characteristic: { limitTableId: n?.limitTableId ?? p.tableRootId, itemKey: p.itemKey, label: n?.label ?? p.itemKey, engineModel: n?.engineModel ?? "" },
          family: { id: p.familyId, name: families.get(p.familyId) ?? "" },
          latest: l ? { id: l.id, reference: studyReference(l.number), completedAt: l.completedAt.toISOString(), verdict: l.verdict, percentGrr: l.percentGrr, ndc: l.ndc, isDemo: l.isDemo } : null,
          inProgress: o ? { id: o.id, reference: studyReference(o.number) } : null,
        };
      });
    },

    /** GET /api/studies/gaps — characteristics of current tables with no finished study, or whose studied families all failed. */
    async gaps(limit = 50): Promise<StudyGaps> {
      const rows = await studiesRepository.gaps(db, limit);
      const first = rows[0];
      return {
        total: first ? Number(first.total) : 0,
        noStudy: first ? Number(first.no_study) : 0,
        notAcceptable: first ? Number(first.not_acceptable) : 0,
        items: rows.map((r) => ({
          limitTableId: String(r.limit_table_id),
          tableName: String(r.table_name),
          engineModel: String(r.engine_model),
          itemKey: String(r.key),
          label: String(r.label),
          isDemo: Boolean(r.is_demo),
          reason: r.reason as "no_study" | "not_acceptable",
          latest: r.failed_id
            ? { id: String(r.failed_id), reference: studyReference(Number(r.failed_number)), familyName: String(r.failed_family), verdict: r.failed_verdict as "not_acceptable", percentGrr: r.failed_percent == null ? null : Number(r.failed_percent) }
            : null,
        })),
      };
    },
  };
}

/**
 * The flag a reading carries when it is taken on a characteristic with a tool family whose latest finished study of
 * that characteristic is not acceptable, as an SQL condition: the readings service asks it inside its transaction,
 * in the statement that checks the reading's place (one round trip fewer on every reading).
 */
export function studyFlagCondition(r: { limitTableId: string | SQL; itemKey: string | Placeholder; toolFamilyIds: string[] | SQL }): SQL {
  return studiesRepository.notAcceptableLatest({ limitTableId: r.limitTableId, itemKey: r.itemKey, familyIds: Array.isArray(r.toolFamilyIds) ? [...new Set(r.toolFamilyIds)] : r.toolFamilyIds });
}
